"use client";

import { plural } from "@/lib/format";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { formatVolume } from "@/lib/units";
import type { PoLine } from "@/lib/purchasing/orders";

/** An order line as the form shows it: the server's PoLine fields it needs and its number on the order. */
type LineView = Pick<
  PoLine,
  "id" | "gradeCode" | "size" | "quantity" | "volumeM3" | "receivedM3" | "receivedBlocks"
> & {
  no: number;
};
interface Row {
  lineId: string;
  code: string;
  x: string;
  y: string;
  z: string;
  weightKg: string;
  location: string;
  mouldedOn: string;
}

/**
 * Receiving against an order: one row per block, sizes start from the ordered block; each line's
 * running total is shown against the ±10 % terms before anything is saved.
 */
export function ReceiveForm({
  poId,
  lines,
  locations,
  today,
}: {
  poId: number;
  lines: LineView[];
  locations: string[];
  today: string;
}) {
  const router = useRouter();
  const open = lines.filter((l) => l.receivedM3 < l.volumeM3 * 0.9);
  const start = (l: LineView): Row => ({
    lineId: String(l.id),
    code: "",
    x: String(l.size[0]),
    y: String(l.size[1]),
    z: String(l.size[2]),
    weightKg: "",
    location: locations[0] ?? "",
    mouldedOn: "",
  });
  const [rows, setRows] = useState<Row[]>(
    (open.length ? open : lines).flatMap((l) =>
      Array.from({ length: Math.max(1, l.quantity - l.receivedBlocks) }, () => start(l)),
    ),
  );
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger" | "caution"; text: string } | null>(null);
  const [acceptOver, setAcceptOver] = useState(false);
  const set = (i: number, patch: Partial<Row>) => setRows(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const n = (v: string) => (v.trim() === "" ? null : Number(v));

  const tally = lines.map((l) => {
    const now = rows
      .filter((r) => r.lineId === String(l.id))
      .reduce((s, r) => s + (Number(r.x) * Number(r.y) * Number(r.z)) / 1e9 || s, 0);
    const pct = l.volumeM3 > 0 ? ((l.receivedM3 + now) / l.volumeM3) * 100 : 0;
    return { l, now, pct, over: pct > 110.0000001 };
  });

  return (
    <form
      className="space-y-5"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const body = {
          receivedOn: fd.get("receivedOn"),
          lot: fd.get("lot"),
          notes: fd.get("notes"),
          acceptOver,
          overReason: fd.get("overReason") ?? null,
          blocks: rows.map((r) => ({
            lineId: n(r.lineId),
            code: r.code || null,
            size: [n(r.x), n(r.y), n(r.z)],
            weightKg: n(r.weightKg),
            location: r.location,
            mouldedOn: r.mouldedOn || null,
          })),
        };
        setFields({});
        try {
          const r = await send<{ codes: string[]; status: string; warnings: { index: number; message: string }[] }>(
            `/api/purchase-orders/${poId}/receive`,
            "POST",
            body,
          );
          setMsg({
            tone: r.warnings.length ? "caution" : "success",
            text: `Received ${plural(r.codes.length, "block")} (${r.codes.join(", ")}). The order is now ${r.status === "closed" ? "closed" : "partly received"}.${r.warnings.length ? ` ${r.warnings.map((w) => `Row ${w.index + 1}: ${w.message}`).join(" ")}` : ""}`,
          });
          router.refresh();
          if (!r.warnings.length) router.push(`/purchasing/orders/${poId}`);
        } catch (err) {
          if (err instanceof ApiError) {
            setFields(err.fields ?? {});
            setMsg({
              tone: "danger",
              text: [
                err.message,
                ...Object.entries(err.fields ?? {})
                  .filter(([k]) => k.startsWith("lines."))
                  .map(([, v]) => v),
              ].join(" "),
            });
          }
        }
      }}
    >
      {msg && <Notice tone={msg.tone === "caution" ? "caution" : msg.tone}>{msg.text}</Notice>}
      <Card title="Delivery">
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Received on" name="receivedOn" error={fields.receivedOn}>
            <Input type="date" name="receivedOn" defaultValue={today} error={fields.receivedOn} />
          </Field>
          <Field label="Lot" name="lot" error={fields.lot}>
            <Input name="lot" error={fields.lot} />
          </Field>
          <Field label="Notes" name="notes">
            <Input name="notes" />
          </Field>
        </div>
      </Card>
      <Card title="Against the order (±10 % accepted)">
        <ul className="space-y-2 text-sm" data-testid="tally">
          {tally.map((t) => (
            <li key={t.l.id} className="flex flex-wrap items-center gap-3">
              <span className="w-56">
                Line {t.l.no}: {t.l.quantity} × {t.l.gradeCode}
              </span>
              <span className="relative h-3 w-40 rounded bg-paper-sunk">
                <span
                  className={`absolute inset-y-0 left-0 rounded ${t.over ? "bg-ember" : t.pct >= 90 ? "bg-moss" : "bg-kerf"}`}
                  style={{ width: `${Math.min(100, (t.pct / 120) * 100)}%` }}
                />
                <span className="absolute inset-y-[-3px] w-0.5 bg-ink" style={{ left: `${(90 / 120) * 100}%` }} />
                <span className="absolute inset-y-[-3px] w-0.5 bg-ink" style={{ left: `${(110 / 120) * 100}%` }} />
              </span>
              <span className={`tabular-nums ${t.over ? "font-semibold text-ember" : ""}`}>
                {Math.round(t.pct)} % of {formatVolume(t.l.volumeM3, { digits: 2 })}
                {t.over ? " — over the terms" : t.pct >= 90 ? " — filled" : ""}
              </span>
              {fields[`lines.${t.l.id}`] && <span className="w-full text-ember">{fields[`lines.${t.l.id}`]}</span>}
            </li>
          ))}
        </ul>
        {tally.some((t) => t.over) && (
          <div className="mt-3 space-y-2 rounded-md border border-wire bg-wire-light p-3">
            <label className="flex min-h-11 items-center gap-2 text-sm">
              <input
                type="checkbox"
                className="size-5 accent-wire"
                checked={acceptOver}
                onChange={(e) => setAcceptOver(e.target.checked)}
              />{" "}
              Accept over the terms (the order will be flagged)
            </label>
            {acceptOver && (
              <Field label="Why take the extra?" name="overReason" error={fields.overReason}>
                <Input name="overReason" error={fields.overReason} />
              </Field>
            )}
          </div>
        )}
      </Card>
      <Card
        title={`Blocks (${rows.length})`}
        action={
          <Button tone="quiet" onClick={() => setRows([...rows, { ...rows[rows.length - 1]!, code: "" }])}>
            Copy the last row
          </Button>
        }
      >
        {fields.blocks && <p className="mb-2 text-sm text-ember">{fields.blocks}</p>}
        <div className="space-y-3">
          {rows.map((r, i) => {
            const err = (k: string) => fields[`blocks.${i}.${k}`];
            return (
              <fieldset
                key={i}
                className="grid grid-cols-2 gap-2 rounded-md border border-bead p-3 sm:grid-cols-4 lg:grid-cols-9"
                aria-label={`Block ${i + 1}`}
              >
                <div className="col-span-2">
                  <Field label={`Block ${i + 1}: line`} name={`line-${i}`} error={err("lineId")}>
                    <Select
                      id={`line-${i}`}
                      error={err("lineId")}
                      value={r.lineId}
                      onChange={(e) => set(i, { lineId: e.target.value })}
                    >
                      {lines.map((l) => (
                        <option key={l.id} value={l.id}>
                          Line {l.no}: {l.gradeCode}
                        </option>
                      ))}
                    </Select>
                  </Field>
                </div>
                <Field label="Code" name={`code-${i}`} error={err("code")} hint="blank: next code">
                  <Input
                    id={`code-${i}`}
                    value={r.code}
                    onChange={(e) => set(i, { code: e.target.value })}
                    error={err("code")}
                  />
                </Field>
                {(["x", "y", "z"] as const).map((a, k) => (
                  <Field
                    key={a}
                    label={["Length mm", "Width mm", "Height mm"][k]!}
                    name={`${a}-${i}`}
                    error={err(`size.${k}`)}
                  >
                    <Input
                      id={`${a}-${i}`}
                      inputMode="decimal"
                      value={r[a]}
                      onChange={(e) => set(i, { [a]: e.target.value })}
                      error={err(`size.${k}`)}
                    />
                  </Field>
                ))}
                <Field label="Weight kg" name={`w-${i}`} error={err("weightKg")}>
                  <Input
                    id={`w-${i}`}
                    inputMode="decimal"
                    value={r.weightKg}
                    onChange={(e) => set(i, { weightKg: e.target.value })}
                    error={err("weightKg")}
                  />
                </Field>
                <Field label="Location" name={`loc-${i}`} error={err("location")}>
                  <Input
                    id={`loc-${i}`}
                    list="locations"
                    value={r.location}
                    onChange={(e) => set(i, { location: e.target.value })}
                    error={err("location")}
                  />
                </Field>
                <div className="flex items-end">
                  {rows.length > 1 && (
                    <Button tone="quiet" onClick={() => setRows(rows.filter((_, j) => j !== i))}>
                      Remove
                    </Button>
                  )}
                </div>
              </fieldset>
            );
          })}
        </div>
        <datalist id="locations">
          {locations.map((l) => (
            <option key={l} value={l} />
          ))}
        </datalist>
      </Card>
      <Button type="submit">Receive {plural(rows.length, "block")} into stock</Button>
    </form>
  );
}
