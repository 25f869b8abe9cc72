"use client";

import { formatDate, formatMoney, plural } from "@/lib/format";
import { WEEKDAY_NAMES, describeWorkingDays, type Weekday } from "@/lib/purchasing/calendar";
import { numberOrNull as num } from "@/lib/forms";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { Fragment, useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { m3ToBoardFeet } from "@/lib/units";
import { ResultNotice } from "@/components/ui/result-notice";
// The server's types for what the page hands over (type-only imports: erased from the client bundle).
import type { ReorderInput, ReorderRow } from "@/db/queries/reorder";
import type { Source } from "@/lib/purchasing/reorder";
import type { ReorderSettings } from "@/lib/validations/purchasing";

type Src = Source;
type In = ReorderInput<number>;
export type ReorderView = ReorderRow;
type Settings = ReorderSettings;

const SOURCE: Record<Src, string> = {
  ledger: "from the ledger",
  supplier: "supplier's figure",
  deliveries: "supplier's deliveries",
  settings: "shop setting",
  jobs: "open jobs",
  override: "set by the buyer",
  none: "unknown",
};
const f = (v: number, d = 2) => v.toLocaleString("en", { minimumFractionDigits: d, maximumFractionDigits: d });
const money = formatMoney;

function Src({ s }: { s: Src }) {
  return <Badge tone={s === "override" ? "wire" : "plain"}>{SOURCE[s]}</Badge>;
}

/** The reorder list: grades at or under their point first, every input beside the result, overrides per grade. */
export function ReorderBoard({
  rows,
  settings,
  suppliers,
  canEdit,
}: {
  rows: ReorderView[];
  settings: Settings;
  suppliers: { id: number; name: string }[];
  canEdit: boolean;
}) {
  const router = useRouter();
  const due = rows.filter((r) => r.result.due);
  const [picked, setPicked] = useState<Set<number>>(
    new Set(due.filter((r) => r.supplier && r.blockSize).map((r) => r.gradeId)),
  );
  const [open, setOpen] = useState<number | null>(null);
  const [msg, setMsg] = useState<{
    tone: "success" | "danger" | "info";
    text: string;
    links?: { href: string; label: string }[];
  } | null>(null);
  const [busy, setBusy] = useState(false);

  const draft = async () => {
    setBusy(true);
    try {
      const r = await send<{ orders: { id: number; number: string; supplier: string }[] }>(
        "/api/reorder/draft",
        "POST",
        { gradeIds: [...picked] },
      );
      setMsg({
        tone: "success",
        text: `Drafted ${r.orders.length} order${r.orders.length === 1 ? "" : "s"}. Check prices and quantities, then send.`,
        links: r.orders.map((o) => ({ href: `/purchasing/orders/${o.id}`, label: `${o.number} · ${o.supplier}` })),
      });
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError)
        setMsg({ tone: "danger", text: [e.message, ...Object.values(e.fields ?? {})].join(" ") });
    } finally {
      setBusy(false);
    }
  };
  const alert = async () => {
    setBusy(true);
    try {
      const r = await send<{ grades: string[]; sentTo: string[] }>("/api/reorder/alert", "POST");
      setMsg({
        tone: "info",
        text: r.grades.length
          ? `Alert for ${r.grades.join(", ")} e-mailed to ${r.sentTo.length} buyer${r.sentTo.length === 1 ? "" : "s"}.`
          : "No grade is at or under its reorder point: nothing was sent.",
      });
    } catch (e) {
      if (e instanceof ApiError) setMsg({ tone: "danger", text: e.message });
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="space-y-5">
      {msg && (
        <ResultNotice tone={msg.tone}>
          {msg.text}
          {msg.links && (
            <span className="ml-2 inline-flex flex-wrap gap-3">
              {msg.links.map((l) => (
                <Link key={l.href} href={l.href}>
                  {l.label}
                </Link>
              ))}
            </span>
          )}
        </ResultNotice>
      )}
      <Card
        title={`At or under the reorder point (${due.length})`}
        action={
          canEdit && (
            <div className="flex flex-wrap gap-2">
              <Button tone="secondary" onClick={alert} disabled={busy}>
                E-mail the alert now
              </Button>
              <Button onClick={draft} disabled={busy || picked.size === 0}>
                Draft orders for {picked.size} grade{picked.size === 1 ? "" : "s"}
              </Button>
            </div>
          )
        }
      >
        <Table
          rows={due}
          picked={picked}
          setPicked={canEdit ? setPicked : null}
          open={open}
          setOpen={setOpen}
          suppliers={suppliers}
          canEdit={canEdit}
          empty="Every grade is above its reorder point."
        />
      </Card>
      <Card title="All other grades">
        <Table
          rows={rows.filter((r) => !r.result.due)}
          picked={picked}
          setPicked={canEdit ? setPicked : null}
          open={open}
          setOpen={setOpen}
          suppliers={suppliers}
          canEdit={canEdit}
          empty="None."
        />
      </Card>
      {canEdit && <SettingsForm settings={settings} />}
    </div>
  );
}

function Table({
  rows,
  picked,
  setPicked,
  open,
  setOpen,
  suppliers,
  canEdit,
  empty,
}: {
  rows: ReorderView[];
  picked: Set<number>;
  setPicked: ((s: Set<number>) => void) | null;
  open: number | null;
  setOpen: (id: number | null) => void;
  suppliers: { id: number; name: string }[];
  canEdit: boolean;
  empty: string;
}) {
  if (!rows.length) return <p className="text-sm text-ink-faint">{empty}</p>;
  return (
    <div className="-mx-5 overflow-x-auto">
      <table className="min-w-[44rem]">
        <thead className="border-b border-bead">
          <tr>
            {setPicked && (
              <th className="w-10 px-3 py-2">
                <span className="sr-only">Order</span>
              </th>
            )}
            <th className="px-3 py-2">Grade</th>
            <th className="px-3 py-2 text-right">On hand</th>
            <th className="px-3 py-2 text-right">On order</th>
            <th className="px-3 py-2 text-right">Reorder point</th>
            <th className="px-3 py-2">Stock against point</th>
            <th className="px-3 py-2 text-right">Suggest</th>
            <th className="px-3 py-2" />
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => {
            const ratio = r.result.reorderPoint > 0 ? Math.min(1.5, r.result.position / r.result.reorderPoint) : 1.5;
            return (
              <Fragment key={r.gradeId}>
                <tr className="border-b border-bead/60" data-testid={`reorder-${r.gradeCode}`}>
                  {setPicked && (
                    <td className="px-1 py-0">
                      {/* The whole 44 px cell takes the tap, not only the 20 px box. */}
                      <label className="flex min-h-11 min-w-11 cursor-pointer items-center justify-center">
                        <input
                          type="checkbox"
                          aria-label={`Order ${r.gradeCode}`}
                          className="size-5 accent-kerf"
                          checked={picked.has(r.gradeId)}
                          disabled={!r.supplier || !r.blockSize}
                          onChange={(e) => {
                            const s = new Set(picked);
                            if (e.target.checked) s.add(r.gradeId);
                            else s.delete(r.gradeId);
                            setPicked(s);
                          }}
                        />
                      </label>
                    </td>
                  )}
                  <td className="px-3 py-2">
                    <span
                      className="mr-2 inline-block size-3 rounded-sm align-middle"
                      style={{ background: r.colour }}
                    />
                    <span className="font-medium">{r.gradeCode}</span>{" "}
                    {r.neverHotWire && <Badge tone="ember">never hot-wire</Badge>}
                    <p className="text-xs text-ink-faint">
                      {r.supplier ? r.supplier.name : "no usual supplier"}
                      {r.supplierSource === "override" && " (chosen)"}
                    </p>
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{f(r.onHand)} m³</td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                    {f(r.onOrder)} m³
                    {r.inDraft > 0 && <p className="text-xs text-ink-faint">{f(r.inDraft)} in drafts</p>}
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums">{f(r.result.reorderPoint)} m³</td>
                  <td className="px-3 py-2">
                    {r.result.reorderPoint <= 0 ? (
                      <span className="text-xs text-ink-faint">no use lately, no open jobs</span>
                    ) : (
                      <div
                        role="img"
                        className="relative h-3 w-32 rounded bg-paper-sunk"
                        aria-label={`${Math.round((r.result.position / (r.result.reorderPoint || 1)) * 100)} % of the reorder point`}
                      >
                        <div
                          className={`absolute inset-y-0 left-0 rounded ${r.result.due ? "bg-wire" : "bg-moss"}`}
                          style={{ width: `${(ratio / 1.5) * 100}%` }}
                        />
                        <div
                          className="absolute inset-y-[-3px] w-0.5 bg-ink"
                          style={{ left: `${(1 / 1.5) * 100}%` }}
                          title="reorder point"
                        />
                      </div>
                    )}
                    {r.result.reorderPoint > 0 && (
                      // The bar's colour says it too, but not to everyone: the word does.
                      <p className={`mt-1 text-xs ${r.result.due ? "font-semibold text-wire" : "text-ink-soft"}`}>
                        {r.result.due ? "Reorder now" : "Enough"}
                      </p>
                    )}
                  </td>
                  <td className="px-3 py-2 text-right tabular-nums">
                    {r.result.due
                      ? r.result.suggestedBlocks !== null
                        ? `${plural(r.result.suggestedBlocks, "block")}`
                        : `${f(r.result.suggestedM3)} m³`
                      : "–"}
                    {r.result.due && r.result.suggestedBlocks !== null && (
                      <p className="text-xs text-ink-faint">{f(r.result.suggestedM3)} m³</p>
                    )}
                  </td>
                  <td className="px-3 py-2 text-right">
                    <Button
                      tone="quiet"
                      onClick={() => setOpen(open === r.gradeId ? null : r.gradeId)}
                      aria-expanded={open === r.gradeId}
                    >
                      {open === r.gradeId ? "Hide" : "Why?"}
                    </Button>
                  </td>
                </tr>
                {open === r.gradeId && (
                  <tr className="border-b border-bead/60 bg-paper">
                    <td colSpan={setPicked ? 8 : 7} className="px-3 py-4">
                      <Why r={r} suppliers={suppliers} canEdit={canEdit} />
                    </td>
                  </tr>
                )}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** Every input and every step, so the buyer sees why; the overrides beside them. */
function Why({
  r,
  suppliers,
  canEdit,
}: {
  r: ReorderView;
  suppliers: { id: number; name: string }[];
  canEdit: boolean;
}) {
  const x = r.result;
  const L = r.leadTimeDays.value;
  const d = r.dailyDemand.value;
  const sd = r.demandSd.value;
  const sL = r.leadTimeSd.value;
  const c = r.committed;
  const cal = describeWorkingDays(r.workingDays);
  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <div className="space-y-3 text-sm" data-testid={`why-${r.gradeCode}`}>
        <dl className="grid grid-cols-[auto_1fr_auto] items-center gap-x-3 gap-y-1.5">
          <dt>Daily use, d</dt>
          <dd className="tabular-nums">{f(d, 3)} m³ per working day</dd>
          <dd>
            <Src s={r.dailyDemand.source} />
          </dd>
          <dt>Its spread, σd</dt>
          <dd className="tabular-nums">{f(sd, 3)} m³ per working day</dd>
          <dd>
            <Src s={r.demandSd.source} />
          </dd>
          <dt>Lead time, L</dt>
          <dd className="tabular-nums">
            {plural(L, "working day")} (ends {formatDate(r.leadTimeEnds)})
          </dd>
          <dd>
            <Src s={r.leadTimeDays.source} />
          </dd>
          <dt>Its spread, σL</dt>
          <dd className="tabular-nums">{f(sL, 2)} working days</dd>
          <dd>
            <Src s={r.leadTimeSd.source} />
          </dd>
          <dt>Service level</dt>
          <dd className="tabular-nums">
            {f(r.serviceLevel.value * 100, 1)} % → z = {f(x.z, 3)}
          </dd>
          <dd>
            <Src s={r.serviceLevel.source} />
          </dd>
          <dt>Booked work due by {formatDate(c.dueBy)}</dt>
          <dd className="tabular-nums">
            {f(c.value, 3)} m³ of foam ({plural(c.pieces, "part")} in {plural(c.jobs, "open job")})
          </dd>
          <dd>
            <Src s={c.source} />
          </dd>
          <dt>Order cost, S</dt>
          <dd className="tabular-nums">{money(r.orderCost.value)} per order</dd>
          <dd>
            <Src s={r.orderCost.source} />
          </dd>
          <dt>Holding cost, H</dt>
          <dd className="tabular-nums">{money(r.holdingCost.value)} per m³ a year</dd>
          <dd>
            <Src s={r.holdingCost.source} />
          </dd>
        </dl>
        <div className="rounded-md border border-bead bg-paper-raised p-3 font-mono text-xs leading-6">
          <p>
            Forecast d·L = {f(d, 3)} × {L} = {f(x.forecast, 3)} m³
          </p>
          <p>
            Booked = Σ parts owed × (x + k)(y + k)(z + k), kerf k = {c.kerfMm} mm: {f(c.value, 3)} m³
          </p>
          <p data-testid="lead-time-demand">
            Lead-time demand = max(d·L, booked) = max({f(x.forecast, 3)}, {f(c.value, 3)}) = {f(x.leadTimeDemand, 3)} m³
            ({x.demandRule === "committed" ? "booked work" : "forecast"})
          </p>
          <p>
            SS = z·√(L·σd² + d²·σL²) = {f(x.z, 3)} × √({L} × {f(sd, 3)}² + {f(d, 3)}² × {f(sL, 2)}²) ={" "}
            {f(x.safetyStock, 3)} m³
          </p>
          {r.reorderPointOverride !== null ? (
            <p>ROP = {f(x.reorderPoint, 3)} m³ (set by the buyer)</p>
          ) : (
            <p>
              ROP = lead-time demand + SS = {f(x.leadTimeDemand, 3)} + {f(x.safetyStock, 3)} = {f(x.reorderPoint, 3)} m³
            </p>
          )}
          <p>
            D = d × working days a year = {f(d, 3)} × {f(r.workingDays.length * (365 / 7), 1)} = {f(x.annualDemand, 1)}{" "}
            m³ a year
          </p>
          {r.orderQtyOverride !== null ? (
            <p>Q = {f(x.eoq, 3)} m³ (set by the buyer)</p>
          ) : (
            <p>
              EOQ = √(2DS/H) = √(2 × {f(x.annualDemand, 1)} × {f(r.orderCost.value)} / {f(r.holdingCost.value)}) ={" "}
              {f(x.eoq, 3)} m³
            </p>
          )}
          <p>
            Stock = on hand {f(r.onHand, 3)} + on order {f(r.onOrder, 3)} = {f(x.position, 3)} m³ {x.due ? "≤" : ">"}{" "}
            ROP
          </p>
          {r.blockSize && (
            <p>
              Block {r.blockSize.join(" × ")} mm = {f(r.blockVolume, 3)} m³ ({Math.round(m3ToBoardFeet(r.blockVolume))}{" "}
              BF)
            </p>
          )}
        </div>
        <p className="text-xs text-ink-faint" data-testid="reorder-rule">
          The rule: over the lead time the shop needs the larger of its forecast (d·L) and the work already booked for
          that window, never the two added, because the forecast is average use and booked jobs are part of it. Booked
          work is the parts of open jobs due by the day the lead time ends (jobs without a due date count as due now),
          each part measured as its bounding box with a kerf added to each dimension: the foam it takes from a block
          whatever its profile. Everything is counted in working days of the shop calendar ({cal}): daily use over the{" "}
          {plural(r.historyWorkingDays, "working day")} of the last {plural(r.historyDays, "day")} (stock cut up less
          offcuts kept), lead times as suppliers quote them.{" "}
          {r.leadTimeSd.source === "deliveries" && r.lateness
            ? `σL is the spread of the supplier's last ${plural(r.lateness.orders, "delivery", "deliveries")} against the promised date (on average ${f(r.lateness.meanDays, 1)} working days late).`
            : r.lateness
              ? `σL is the supplier's own figure until three orders with a promised date have come (${r.lateness.orders} so far, on average ${f(r.lateness.meanDays, 1)} working days late).`
              : "σL is the supplier's own figure until three orders with a promised date have come."}
          {r.lastPrice !== null && (
            <>
              {" "}
              Last paid: {r.lastPrice} per {r.priceUnit === "bf" ? "board foot" : "m³"}.
            </>
          )}
          {r.note && <> Note: {r.note}</>}
        </p>
      </div>
      {canEdit && <OverrideForm r={r} suppliers={suppliers} />}
    </div>
  );
}

function OverrideForm({ r, suppliers }: { r: ReorderView; suppliers: { id: number; name: string }[] }) {
  const router = useRouter();
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const ov = (i: In) => (i.source === "override" ? String(i.value) : "");
  return (
    <form
      className="grid grid-cols-2 gap-3"
      aria-label={`Overrides for ${r.gradeCode}`}
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const sl = num(fd.get("serviceLevel"));
        const body = {
          supplierId: num(fd.get("supplierId")),
          leadTimeDays: num(fd.get("leadTimeDays")),
          serviceLevel: sl === null ? null : sl / 100,
          dailyDemandM3: num(fd.get("dailyDemandM3")),
          demandSdM3: num(fd.get("demandSdM3")),
          orderCost: num(fd.get("orderCost")),
          holdingCost: num(fd.get("holdingCost")),
          reorderPointM3: num(fd.get("reorderPointM3")),
          orderQtyM3: num(fd.get("orderQtyM3")),
          note: fd.get("note"),
        };
        setFields({});
        try {
          await send(`/api/reorder/${r.gradeId}`, "PUT", body);
          setMsg({ tone: "success", text: `${r.gradeCode} recalculated.` });
          router.refresh();
        } catch (err) {
          if (err instanceof ApiError) {
            setFields(err.fields ?? {});
            setMsg({ tone: "danger", text: err.message });
          }
        }
      }}
    >
      <p className="col-span-2 text-sm font-semibold">
        Override for {r.gradeCode} <span className="font-normal text-ink-faint">(leave blank to work it out)</span>
      </p>
      {msg && (
        <div className="col-span-2">
          <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>
        </div>
      )}
      <div className="col-span-2">
        <Field label="Supplier" name={`supplierId-${r.gradeId}`} error={fields.supplierId}>
          <Select
            id={`supplierId-${r.gradeId}`}
            name="supplierId"
            defaultValue={r.supplierSource === "override" ? r.supplier?.id : ""}
          >
            <option value="">
              Usual: newest delivery{r.supplierSource !== "override" && r.supplier ? ` (${r.supplier.name})` : ""}
            </option>
            {suppliers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      {(
        [
          ["leadTimeDays", "Lead time (working days)", ov(r.leadTimeDays), String(r.leadTimeDays.value)],
          [
            "serviceLevel",
            "Service level (%)",
            r.serviceLevel.source === "override" ? String(r.serviceLevel.value * 100) : "",
            String(r.serviceLevel.value * 100),
          ],
          ["dailyDemandM3", "Use per working day (m³)", ov(r.dailyDemand), f(r.dailyDemand.value, 3)],
          ["demandSdM3", "σ of daily use (m³)", ov(r.demandSd), f(r.demandSd.value, 3)],
          ["orderCost", "Order cost S ($)", ov(r.orderCost), String(r.orderCost.value)],
          ["holdingCost", "Holding cost H ($/m³·yr)", ov(r.holdingCost), String(r.holdingCost.value)],
          [
            "reorderPointM3",
            "Fixed reorder point (m³)",
            r.reorderPointOverride === null ? "" : String(r.reorderPointOverride),
            "computed",
          ],
          [
            "orderQtyM3",
            "Fixed order quantity (m³)",
            r.orderQtyOverride === null ? "" : String(r.orderQtyOverride),
            "EOQ",
          ],
        ] as const
      ).map(([name, label, value, placeholder]) => {
        const key = name === "serviceLevel" ? "serviceLevel" : name;
        return (
          <Field key={name} label={label} name={`${name}-${r.gradeId}`} error={fields[key]}>
            <Input
              id={`${name}-${r.gradeId}`}
              name={name}
              inputMode="decimal"
              defaultValue={value}
              placeholder={placeholder}
              error={fields[key]}
            />
          </Field>
        );
      })}
      <div className="col-span-2">
        <Field label="Note" name={`note-${r.gradeId}`}>
          <Input id={`note-${r.gradeId}`} name="note" defaultValue={r.note ?? ""} />
        </Field>
      </div>
      <div className="col-span-2">
        <Button type="submit">Save and recalculate</Button>
      </div>
    </form>
  );
}

function SettingsForm({ settings }: { settings: Settings }) {
  const router = useRouter();
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  return (
    <Card title="Shop reorder settings">
      <form
        className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5 lg:items-end"
        onSubmit={async (e) => {
          e.preventDefault();
          const fd = new FormData(e.currentTarget);
          const body = {
            serviceLevel: Number(fd.get("serviceLevel")) / 100,
            historyDays: Number(fd.get("historyDays")),
            orderCost: Number(fd.get("orderCost")),
            holdingCost: Number(fd.get("holdingCost")),
            workingDays: fd.getAll("workingDays").map(Number),
          };
          setFields({});
          try {
            await send("/api/reorder/settings", "PUT", body);
            setMsg({ tone: "success", text: "Settings saved; every grade recalculated." });
            router.refresh();
          } catch (err) {
            if (err instanceof ApiError) {
              setFields(err.fields ?? {});
              setMsg({ tone: "danger", text: err.message });
            }
          }
        }}
      >
        {msg && (
          <div className="sm:col-span-2 lg:col-span-5">
            <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>
          </div>
        )}
        <Field label="Service level (%)" name="serviceLevel" error={fields.serviceLevel}>
          <Input
            name="serviceLevel"
            inputMode="decimal"
            defaultValue={settings.serviceLevel * 100}
            error={fields.serviceLevel}
          />
        </Field>
        <Field label="History (days)" name="historyDays" error={fields.historyDays}>
          <Input
            name="historyDays"
            inputMode="numeric"
            defaultValue={settings.historyDays}
            error={fields.historyDays}
          />
        </Field>
        <Field label="Order cost S ($)" name="orderCost" error={fields.orderCost}>
          <Input name="orderCost" inputMode="decimal" defaultValue={settings.orderCost} error={fields.orderCost} />
        </Field>
        <Field label="Holding cost H ($/m³·yr)" name="holdingCost" error={fields.holdingCost}>
          <Input
            name="holdingCost"
            inputMode="decimal"
            defaultValue={settings.holdingCost}
            error={fields.holdingCost}
          />
        </Field>
        <Button type="submit">Save settings</Button>
        <fieldset
          className="sm:col-span-2 lg:col-span-5"
          aria-describedby={fields.workingDays ? "workingDays-error" : "workingDays-hint"}
        >
          <legend className="text-sm font-medium text-ink-soft">Working days (the shop calendar)</legend>
          <div className="mt-1 flex flex-wrap gap-x-4">
            {([1, 2, 3, 4, 5, 6, 7] as Weekday[]).map((d) => (
              <label key={d} className="flex min-h-11 min-w-11 items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  name="workingDays"
                  value={d}
                  defaultChecked={settings.workingDays.includes(d)}
                  className="size-5 accent-kerf"
                />
                {WEEKDAY_NAMES[d]}
              </label>
            ))}
          </div>
          {fields.workingDays ? (
            <p id="workingDays-error" className="text-sm text-ember">
              {fields.workingDays}
            </p>
          ) : (
            <p id="workingDays-hint" className="text-xs text-ink-faint">
              Lead times are counted in these days, as suppliers quote them, and daily use is per working day.
            </p>
          )}
        </fieldset>
      </form>
    </Card>
  );
}
