import { api, parseWith } from "@/lib/auth/guard";
import {
  REPORTS,
  defaultPeriod,
  lossReport,
  offcutReport,
  stockValueReport,
  supplierQualityReport,
  yieldReport,
  LOSS_KINDS,
  type ReportName,
} from "@/db/queries/reports";
import { csvResponse, toCsv } from "@/lib/csv";
import { notFound } from "@/lib/errors";
import { periodSchema } from "@/lib/validations/purchasing";

/**
 * One route for the manager's reports: /api/reports/{yield|losses|offcuts|suppliers|stock-value}
 * ?from=YYYY-MM-DD&to=YYYY-MM-DD[&format=csv]. JSON by default; CSV columns in the README.
 */
export const GET = api<{ report: string }>("GET /api/reports/[report]", async ({ req, params }) => {
  if (!(REPORTS as readonly string[]).includes(params.report)) throw notFound("That report");
  const report = params.report as ReportName;
  const q = parseWith(periodSchema, Object.fromEntries(req.nextUrl.searchParams));
  const fallback = defaultPeriod();
  const period = { from: q.from ?? (q.to && q.to < fallback.from ? q.to : fallback.from), to: q.to ?? fallback.to };
  const name = `blockyard-${report}-${period.from}-to-${period.to}.csv`;
  switch (report) {
    case "yield": {
      const r = await yieldReport(period);
      if (q.format === "json") return r;
      const rows = [
        ...r.weekly.map((x) => ({ breakdown: "week", ...x })),
        ...r.byGrade.map((x) => ({ breakdown: "grade", ...x })),
        ...r.byJob.map((x) => ({ breakdown: "job", ...x })),
        { breakdown: "total", ...r.total },
      ].map((x) => ({
        breakdown: x.breakdown,
        key: x.key,
        label: x.label,
        part_m3: x.partM3,
        issued_m3: x.issuedM3,
        offcut_m3: x.offcutM3,
        net_m3: Number((x.issuedM3 - x.offcutM3).toFixed(4)),
        yield_pct: x.yieldPct,
        volume_basis: x.basis,
      }));
      return csvResponse(
        toCsv(rows, [
          "breakdown",
          "key",
          "label",
          "part_m3",
          "issued_m3",
          "offcut_m3",
          "net_m3",
          "yield_pct",
          "volume_basis",
        ]),
        name,
      );
    }
    case "losses": {
      const r = await lossReport(period);
      if (q.format === "json") return r;
      const rows: Record<string, unknown>[] = [...r.byGrade, r.total].map((x) => ({
        grade: x.label,
        issued_m3: x.issuedM3,
        ...Object.fromEntries(LOSS_KINDS.map((k) => [`${k}_m3`, x.losses[k]])),
        total_loss_m3: x.totalM3,
        loss_pct: x.lossPct,
      }));
      return csvResponse(
        toCsv(rows, ["grade", "issued_m3", ...LOSS_KINDS.map((k) => `${k}_m3`), "total_loss_m3", "loss_pct"]),
        name,
      );
    }
    case "offcuts": {
      const r = await offcutReport(period);
      if (q.format === "json") return r;
      const rows = [
        ...r.byAge.map((x) => ({
          breakdown: "age_in_stock",
          key: x.key,
          label: x.label,
          count: x.count,
          m3: x.m3,
          value: x.value,
        })),
        ...r.fate.map((x) => ({
          breakdown: "cut_off_in_period",
          key: x.key,
          label: x.label,
          count: x.count,
          m3: x.m3,
          value: null,
        })),
      ];
      return csvResponse(toCsv(rows, ["breakdown", "key", "label", "count", "m3", "value"]), name);
    }
    case "suppliers": {
      const r = await supplierQualityReport(period);
      if (q.format === "json") return r;
      const rows: Record<string, unknown>[] = [
        ...r.bySupplier.map((x) => ({ breakdown: "supplier", ...x })),
        ...r.byLot.map((x) => ({ breakdown: "lot", ...x })),
      ].map((x) => ({
        breakdown: x.breakdown,
        supplier: x.supplier,
        lot: x.lot,
        blocks: x.blocks,
        m3: x.m3,
        defects: x.defects,
        defects_per_m3: x.defectsPerM3,
        weighed: x.weighed,
        below_min_density: x.belowMinDensity,
        on_hold: x.onHold,
      }));
      for (const c of r.claims)
        rows.push({
          breakdown: "claims",
          supplier: c.supplier,
          blocks: c.blocks,
          claims: c.claims,
          claims_open: c.open,
          claims_accepted: c.accepted,
          claims_rejected: c.rejected,
          claims_accepted_pct: c.acceptedPct,
          credit_asked: c.creditAsked,
          credit_received: c.creditReceived,
        });
      return csvResponse(
        toCsv(rows, [
          "breakdown",
          "supplier",
          "lot",
          "blocks",
          "m3",
          "defects",
          "defects_per_m3",
          "weighed",
          "below_min_density",
          "on_hold",
          "claims",
          "claims_open",
          "claims_accepted",
          "claims_rejected",
          "claims_accepted_pct",
          "credit_asked",
          "credit_received",
        ]),
        name,
      );
    }
    case "stock-value": {
      const r = await stockValueReport(period);
      if (q.format === "json") return r;
      const rows = [...r.rows, r.total].map((x) => ({
        grade: x.grade,
        location: x.location,
        blocks: x.blocks,
        m3: x.m3,
        board_feet: x.boardFeet,
        value: x.value,
      }));
      return csvResponse(toCsv(rows, ["grade", "location", "blocks", "m3", "board_feet", "value"]), name);
    }
  }
});
