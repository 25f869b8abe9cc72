import { formatMoney, plural } from "@/lib/format";
import type { Metadata } from "next";
import type { ReactNode } from "react";
import { requirePage } from "@/lib/auth/guard";
import {
  LOSS_KINDS,
  LOSS_LABELS,
  defaultPeriod,
  lossReport,
  offcutReport,
  stockValueReport,
  supplierQualityReport,
  yieldReport,
  type YieldRow,
} from "@/db/queries/reports";
import { Badge, Card, Notice, PageHeader } from "@/components/ui/card";
import { Button, buttonClass } from "@/components/ui/button";
import { Field, Input } from "@/components/ui/field";
import { ReportChart } from "@/components/reports/report-chart";
import { BASIS_LABEL } from "@/lib/reports/yield";
import { StorageCaution } from "@/components/safety/storage-caution";

export const metadata: Metadata = { title: "Reports" };

const COLOURS = {
  kerf: "#1f6c75",
  wire: "#d2571f",
  moss: "#3b7a4a",
  ember: "#a8322a",
  ochre: "#a8740f",
  slate: "#6b7b7f",
};
const LOSS_COLOURS: Record<(typeof LOSS_KINDS)[number], string> = {
  trim: COLOURS.kerf,
  kerf: COLOURS.slate,
  defect: COLOURS.ember,
  unusable: COLOURS.ochre,
  reject: COLOURS.wire,
};
const m3 = (v: number) => v.toLocaleString("en", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
const money = (v: number) => formatMoney(v, { whole: true });
const isDate = (v: string | undefined) => Boolean(v && /^\d{4}-\d{2}-\d{2}$/.test(v) && !Number.isNaN(Date.parse(v)));

export default async function ReportsPage({ searchParams }: { searchParams: Promise<{ from?: string; to?: string }> }) {
  await requirePage("/reports");
  const sp = await searchParams;
  const d = defaultPeriod();
  let period = { from: isDate(sp.from) ? sp.from! : d.from, to: isDate(sp.to) ? sp.to! : d.to };
  const swapped = period.from > period.to;
  if (swapped) period = { from: period.to, to: period.from };
  const [yieldR, losses, offcuts, suppliers, stock] = await Promise.all([
    yieldReport(period),
    lossReport(period),
    offcutReport(period),
    supplierQualityReport(period),
    stockValueReport(period),
  ]);
  const qs = `from=${period.from}&to=${period.to}`;
  const csv = (name: string) => (
    <a className={buttonClass("quiet")} href={`/api/reports/${name}?${qs}&format=csv`} download>
      Export CSV
    </a>
  );

  return (
    <>
      <PageHeader
        title="Reports"
        lead="Where the foam went and what it cost: yield, losses, offcuts, supplier quality and stock value. Every chart has its numbers beside it."
      />
      <form
        className="no-print mb-6 flex flex-wrap items-end gap-3 rounded-card border border-bead bg-paper-raised p-4 shadow-card"
        method="get"
        aria-label="Period"
      >
        <Field label="From" name="from">
          <Input type="date" name="from" defaultValue={period.from} />
        </Field>
        <Field label="To" name="to">
          <Input type="date" name="to" defaultValue={period.to} />
        </Field>
        <Button type="submit">Show period</Button>
        {swapped && <p className="text-sm text-wire">From was after to: the dates were swapped.</p>}
      </form>

      <div className="space-y-6">
        <Section
          id="yield"
          title="Material yield"
          csv={csv("yield")}
          lead={
            <>
              Part volume ÷ (stock issued − usable offcuts kept), for blocks cut {period.from} to {period.to}.{" "}
              {yieldR.total.basis && <Basis basis={yieldR.total.basis} />}
            </>
          }
        >
          <div className="grid gap-5 xl:grid-cols-[3fr_2fr]">
            <ReportChart
              type="line"
              label="Weekly yield"
              xKey="week"
              unit="%"
              data={yieldR.weekly.map((w) => ({ week: w.key.slice(5), yield: w.yieldPct }))}
              series={[{ key: "yield", label: "Yield", colour: COLOURS.kerf }]}
            />
            <YieldTable rows={yieldR.weekly} first="Week of" total={yieldR.total} />
          </div>
          <div className="mt-5 grid gap-5 lg:grid-cols-2">
            <div>
              <h3 className="mb-2 text-sm font-semibold">By grade</h3>
              <YieldTable rows={yieldR.byGrade} first="Grade" />
            </div>
            <div>
              <h3 className="mb-2 text-sm font-semibold">By job</h3>
              <YieldTable rows={yieldR.byJob} first="Job" />
            </div>
          </div>
        </Section>

        <Section
          id="losses"
          title="Losses by kind"
          csv={csv("losses")}
          lead="What did not become parts or usable offcuts, from the cutter's records."
        >
          <div className="grid gap-5 xl:grid-cols-[3fr_2fr]">
            <ReportChart
              type="bar"
              label="Losses by kind and grade"
              xKey="grade"
              unit="m³"
              data={losses.byGrade.map((g) => ({ grade: g.label, ...g.losses }))}
              series={LOSS_KINDS.map((k) => ({
                key: k,
                label: LOSS_LABELS[k],
                colour: LOSS_COLOURS[k],
                stack: "loss",
              }))}
            />
            <Table
              head={["Kind", "m³", "of issued"]}
              rows={LOSS_KINDS.map((k) => [
                LOSS_LABELS[k],
                m3(losses.total.losses[k]),
                losses.total.issuedM3 > 0
                  ? `${((losses.total.losses[k] / losses.total.issuedM3) * 100).toFixed(1)} %`
                  : "–",
              ])}
              foot={[
                "All losses",
                m3(losses.total.totalM3),
                losses.total.lossPct === null ? "–" : `${losses.total.lossPct} %`,
              ]}
            />
          </div>
        </Section>

        <Section
          id="offcuts"
          title="Offcuts"
          csv={csv("offcuts")}
          lead={
            <>
              Offcuts in stock by age, and what became of those cut off in the period
              {offcuts.usedPct !== null && (
                <>
                  : <strong>{offcuts.usedPct} %</strong> were used
                </>
              )}
              .
            </>
          }
        >
          <div className="grid gap-5 lg:grid-cols-2">
            <ReportChart
              type="bar"
              label="Offcuts in stock by age"
              xKey="age"
              unit="m³"
              data={offcuts.byAge.map((a) => ({ age: a.label, m3: a.m3 }))}
              series={[{ key: "m3", label: "In stock", colour: COLOURS.ochre }]}
            />
            <div className="space-y-4">
              <Table
                head={["Age in stock", "Offcuts", "m³", "Value"]}
                rows={offcuts.byAge.map((a) => [a.label, String(a.count), m3(a.m3), money(a.value)])}
              />
              <Table
                head={["Cut off in the period", "Offcuts", "m³"]}
                rows={offcuts.fate.map((f) => [f.label, String(f.count), m3(f.m3)])}
              />
            </div>
          </div>
        </Section>

        <Section
          id="suppliers"
          title="Supplier quality"
          csv={csv("suppliers")}
          lead="Blocks delivered in the period: defect zones found per m³, measured density below the grade's minimum and blocks on hold; claims opened in the period and what the supplier answered."
        >
          <div className="grid gap-5 lg:grid-cols-2">
            <ReportChart
              type="bar"
              label="Defects per m³ by supplier"
              xKey="supplier"
              unit="per m³"
              data={suppliers.bySupplier.map((s) => ({ supplier: s.supplier.split(" ")[0]!, defects: s.defectsPerM3 }))}
              series={[{ key: "defects", label: "Defects per m³", colour: COLOURS.ember }]}
            />
            <Table
              head={["Supplier", "Blocks", "m³", "Defects", "per m³", "Under density", "On hold"]}
              rows={suppliers.bySupplier.map((s) => [
                s.supplier,
                String(s.blocks),
                m3(s.m3),
                String(s.defects),
                s.defectsPerM3?.toFixed(3) ?? "–",
                `${s.belowMinDensity} of ${s.weighed}`,
                String(s.onHold),
              ])}
            />
          </div>
          <div className="mt-4">
            <h3 className="mb-2 text-base font-semibold">Claims to suppliers</h3>
            {suppliers.claims.length === 0 ? (
              <p className="text-[15px] text-ink-soft">No claims opened in the period.</p>
            ) : (
              <Table
                head={[
                  "Supplier",
                  "Claims",
                  "Blocks",
                  "Open",
                  "Accepted",
                  "Rejected",
                  "Accepted share",
                  "Credit asked",
                  "Credit received",
                ]}
                rows={suppliers.claims.map((c) => [
                  c.supplier,
                  String(c.claims),
                  String(c.blocks),
                  String(c.open),
                  String(c.accepted),
                  String(c.rejected),
                  c.acceptedPct === null ? "–" : `${c.acceptedPct} %`,
                  money(c.creditAsked),
                  money(c.creditReceived),
                ])}
              />
            )}
          </div>
          <details className="mt-4">
            <summary className="cursor-pointer py-3 text-sm font-medium text-kerf">
              By lot ({suppliers.byLot.length})
            </summary>
            <div className="mt-2">
              <Table
                left={2}
                head={["Supplier", "Lot", "Blocks", "m³", "Defects", "per m³", "Under density"]}
                rows={suppliers.byLot.map((s) => [
                  s.supplier,
                  s.lot ?? "–",
                  String(s.blocks),
                  m3(s.m3),
                  String(s.defects),
                  s.defectsPerM3?.toFixed(3) ?? "–",
                  `${s.belowMinDensity} of ${s.weighed}`,
                ])}
              />
            </div>
          </details>
          {suppliers.lowDensity.length > 0 && (
            <div className="mt-4">
              <Notice tone="caution" title="Below the grade's minimum density">
                {plural(suppliers.lowDensity.length, "block")} weighed under their grade&apos;s minimum:{" "}
                {suppliers.lowDensity
                  .slice(0, 6)
                  .map(
                    (b) =>
                      `${b.code} (${b.grade}, ${b.supplier.split(" ")[0]}, lot ${b.lot}) ${b.density} < ${b.minDensity} kg/m³`,
                  )
                  .join("; ")}
                {suppliers.lowDensity.length > 6 && `; and ${suppliers.lowDensity.length - 6} more (in the CSV by lot)`}
                .
              </Notice>
            </div>
          )}
        </Section>

        <Section
          id="stock-value"
          title="Stock value"
          csv={csv("stock-value")}
          lead={
            <>
              On hand at the end of {period.to}, from the stock ledger: {m3(stock.total.m3)} m³,{" "}
              {stock.total.boardFeet.toLocaleString("en")} BF, {money(stock.total.value)}. Locations are where the
              blocks are now.
            </>
          }
        >
          <div className="grid gap-5 xl:grid-cols-[2fr_3fr]">
            <ReportChart
              type="bar"
              label="Stock value by grade"
              xKey="grade"
              unit="$"
              data={stock.byGrade.map((g) => ({ grade: g.grade, value: g.value }))}
              series={[{ key: "value", label: "Value", colour: COLOURS.moss }]}
            />
            <Table
              left={2}
              head={["Grade", "Location", "Blocks", "m³", "Value"]}
              rows={stock.rows.map((r) => [r.grade, r.location, String(r.blocks), m3(r.m3), money(r.value)])}
              foot={[
                "All grades",
                "All locations",
                String(stock.total.blocks),
                m3(stock.total.m3),
                money(stock.total.value),
              ]}
            />
          </div>
          <div className="mt-4">
            <StorageCaution compact />
          </div>
        </Section>
      </div>
    </>
  );
}

function Section({
  id,
  title,
  lead,
  csv,
  children,
}: {
  id: string;
  title: string;
  lead: ReactNode;
  csv: ReactNode;
  children: ReactNode;
}) {
  return (
    <Card title={<span id={id}>{title}</span>} action={csv}>
      <p className="-mt-1 mb-4 text-sm text-ink-soft">{lead}</p>
      {children}
    </Card>
  );
}

function Basis({ basis }: { basis: keyof typeof BASIS_LABEL }) {
  return <Badge tone={basis === "profile" ? "moss" : basis === "box" ? "wire" : "plain"}>{BASIS_LABEL[basis]}</Badge>;
}

function YieldTable({
  rows,
  first,
  total,
}: {
  rows: (YieldRow & { customer?: string | null })[];
  first: string;
  total?: YieldRow;
}) {
  return (
    <Table
      head={[first, "Parts m³", "Net m³", "Yield", "Volume"]}
      rows={rows.map((r) => [
        r.label.replace(/^Week of /, ""),
        m3(r.partM3),
        m3(r.issuedM3 - r.offcutM3),
        r.yieldPct === null ? "–" : `${r.yieldPct} %`,
        r.basis ?? "–",
      ])}
      foot={
        total
          ? [
              "All",
              m3(total.partM3),
              m3(total.issuedM3 - total.offcutM3),
              total.yieldPct === null ? "–" : `${total.yieldPct} %`,
              total.basis ?? "–",
            ]
          : undefined
      }
    />
  );
}

/** A plain figures table: the first `left` columns are text, the rest right-aligned numbers. */
function Table({ head, rows, foot, left = 1 }: { head: string[]; rows: string[][]; foot?: string[]; left?: number }) {
  if (!rows.length) return <p className="text-sm text-ink-faint">Nothing in this period.</p>;
  return (
    // Large figures can widen the table past the screen: the keyboard scrolls it (WCAG 2.1.1).
    // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrolling box must be reachable by keyboard
    <section className="overflow-x-auto" aria-label={`Figures: ${head.join(", ")}`} tabIndex={0}>
      <table>
        <thead className="border-b border-bead">
          <tr>
            {head.map((h, i) => (
              <th key={h} className={`py-1.5 pr-3 ${i >= left ? "text-right" : ""}`}>
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i} className="border-b border-bead/60 last:border-0">
              {r.map((c, j) => (
                <td key={j} className={`py-1.5 pr-3 ${j >= left ? "whitespace-nowrap text-right tabular-nums" : ""}`}>
                  {c}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
        {foot && (
          <tfoot>
            <tr className="border-t border-bead font-medium">
              {foot.map((c, j) => (
                <td key={j} className={`py-1.5 pr-3 ${j >= left ? "whitespace-nowrap text-right tabular-nums" : ""}`}>
                  {c}
                </td>
              ))}
            </tr>
          </tfoot>
        )}
      </table>
    </section>
  );
}
