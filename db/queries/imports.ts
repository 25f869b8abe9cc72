import "server-only";
import { db } from "@/db";
import { receiveDelivery } from "./deliveries";
import { applyCount, countBlocks, countProblem, type CountChange } from "./stock-counts";
import { cellReader, parseCsv, problemSummary, type CsvProblem } from "@/lib/csv";
import { MIN_SIZE_MM } from "@/lib/units";
import { receivedCodeProblem } from "@/lib/block-code";
import type { DeliveryInput } from "@/lib/validations/stock";
import type { Vec3 } from "@/lib/nesting";

export const DELIVERY_COLUMNS = {
  required: ["supplier", "received_on", "lot", "grade", "length_mm", "width_mm", "height_mm", "cost", "location"],
  optional: [
    "code",
    "po_ref",
    "weight_kg",
    "moulded_on",
    "nominal_length_mm",
    "nominal_width_mm",
    "nominal_height_mm",
    "notes",
  ],
  maxRows: 20_000,
};

export const STOCK_COUNT_COLUMNS = {
  required: ["code", "location"],
  optional: ["present", "length_mm", "width_mm", "height_mm", "note"],
  maxRows: 50_000,
};

export interface ImportReport {
  /** Set when the file was refused (422): a one-line summary, as every 4xx answer carries. */
  error?: string;
  committed: boolean;
  rows: number;
  problems: CsvProblem[];
  problemCount: number;
  warnings: CsvProblem[];
  summary: Record<string, number>;
}

const MAX_REPORTED = 500;

function report(
  committed: boolean,
  rows: number,
  problems: CsvProblem[],
  warnings: CsvProblem[],
  summary: Record<string, number>,
): ImportReport {
  problems.sort((a, b) => a.row - b.row);
  return {
    ...(problems.length ? { error: problemSummary(problems) } : {}),
    committed,
    rows,
    problems: problems.slice(0, MAX_REPORTED),
    problemCount: problems.length,
    warnings: warnings.slice(0, MAX_REPORTED),
    summary,
  };
}

/**
 * Deliveries CSV: one row per block; rows with the same supplier, date, PO and lot form one
 * delivery. Preview (commit = false) changes nothing; commit imports every row or none.
 */
export async function importDeliveries(
  bytes: Uint8Array,
  fileName: string | null,
  actorId: string,
  commit: boolean,
): Promise<ImportReport> {
  const { rows, rowNumbers, problems } = parseCsv(bytes, DELIVERY_COLUMNS);
  const warnings: CsvProblem[] = [];
  if (problems.some((p) => p.row === 1) || !rows.length) {
    if (!rows.length && !problems.length) problems.push({ row: 2, message: "The file has a header but no rows." });
    return report(false, rows.length, problems, warnings, {});
  }
  const grades = new Map<string, { id: number; min: number | null }>(
    (await db()("grades").select("id", "code", "min_density_kg_m3")).map((g) => [
      g.code.toLowerCase(),
      { id: g.id, min: g.min_density_kg_m3 },
    ]),
  );
  const suppliers = new Map<string, number>(
    (await db()("suppliers").select("id", "name")).map((s: { id: number; name: string }) => [
      s.name.toLowerCase(),
      s.id,
    ]),
  );
  const codesInFile = new Map<string, number>();
  const groups = new Map<string, DeliveryInput>();
  let volume = 0;
  let cost = 0;

  rows.forEach((r, i) => {
    const row = rowNumbers[i]!;
    const before = problems.length;
    const c = cellReader(problems, row, r);
    const supplierName = c.text("supplier", { required: true, max: 120 });
    const supplierId = supplierName ? suppliers.get(supplierName.toLowerCase()) : undefined;
    if (supplierName && !supplierId)
      problems.push({
        row,
        column: "supplier",
        message: `Unknown supplier “${supplierName.slice(0, 60)}”. Add it on the Suppliers page first.`,
      });
    const gradeCode = c.text("grade", { required: true, max: 40 });
    const grade = gradeCode ? grades.get(gradeCode.toLowerCase()) : undefined;
    if (gradeCode && !grade)
      problems.push({ row, column: "grade", message: `Unknown grade “${gradeCode.slice(0, 40)}”.` });
    const receivedOn = c.date("received_on", { required: true });
    const lot = c.text("lot", { required: true, max: 60 });
    const poRef = c.text("po_ref", { max: 60 });
    const size = [
      c.number("length_mm", { required: true, positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("width_mm", { required: true, positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("height_mm", { required: true, positive: true, min: MIN_SIZE_MM, max: 30_000 }),
    ];
    const nominalCells = [
      c.number("nominal_length_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("nominal_width_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("nominal_height_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
    ];
    const weight = c.number("weight_kg", { positive: true, min: 0.001, max: 10_000 });
    const price = c.number("cost", { required: true, min: 0, max: 10_000_000, money: true });
    const location = c.text("location", { required: true, max: 60 });
    const mouldedOn = c.date("moulded_on");
    const notes = c.text("notes", { max: 500 });
    // The code's own check names a wrong character or the length, so no second length message here.
    const typed = c.text("code", { max: Number.POSITIVE_INFINITY });
    const codeProblem = typed ? receivedCodeProblem(typed) : null;
    if (codeProblem) problems.push({ row, column: "code", message: codeProblem });
    const code = codeProblem ? null : (typed?.toUpperCase() ?? null);
    if (code) {
      if (codesInFile.has(code))
        problems.push({ row, column: "code", message: `Code ${code} is also on row ${codesInFile.get(code)}.` });
      else codesInFile.set(code, row);
    }
    if (nominalCells.some((v) => v !== null) && nominalCells.some((v) => v === null)) {
      problems.push({ row, column: "nominal_length_mm", message: "Give all three nominal sizes, or none." });
    }
    if (problems.length > before) return;
    const s = size as Vec3;
    const v = (s[0] * s[1] * s[2]) / 1e9;
    if (weight && grade!.min !== null && weight / v < grade!.min) {
      warnings.push({
        row,
        column: "weight_kg",
        message: `Density ${(weight / v).toFixed(1)} kg/m³ is below the grade's minimum ${grade!.min} kg/m³.`,
      });
    }
    volume += v;
    cost += price!;
    const key = [supplierId, receivedOn, poRef ?? "", lot].join("|");
    let group = groups.get(key);
    if (!group) {
      group = { supplierId: supplierId!, receivedOn: receivedOn!, poRef, lot: lot!, notes: null, blocks: [] };
      groups.set(key, group);
    }
    group.blocks.push({
      code,
      gradeId: grade!.id,
      size: s,
      nominalSize: nominalCells.every((x) => x !== null) ? (nominalCells as Vec3) : null,
      weightKg: weight,
      cost: price!,
      location: location!,
      mouldedOn,
    });
    if (notes) group.notes = notes;
  });

  if (codesInFile.size) {
    const taken = (await db()("blocks")
      .whereRaw("upper(code) = ANY(?)", [[...codesInFile.keys()]])
      .pluck("code")) as string[];
    for (const t of taken)
      problems.push({
        row: codesInFile.get(t.toUpperCase())!,
        column: "code",
        message: `Code ${t} is already in stock.`,
      });
  }
  const summary = { deliveries: groups.size, blocks: problems.length ? 0 : rows.length, volumeM3: volume, cost };
  if (problems.length || !commit) return report(false, rows.length, problems, warnings, summary);

  await db().transaction(async (trx) => {
    const [imp] = await trx("csv_imports")
      .insert({ kind: "deliveries", file_name: fileName, rows: rows.length, imported_by: actorId })
      .returning("id");
    for (const g of groups.values()) await receiveDelivery(trx, g, actorId, `import:${imp!.id}`);
  });
  return report(true, rows.length, problems, warnings, summary);
}

/**
 * Stock count CSV: each row confirms a block's location (and optionally its measured size);
 * `present = no` writes the block off. All rows or none.
 */
export async function importStockCount(
  bytes: Uint8Array,
  fileName: string | null,
  actorId: string,
  commit: boolean,
): Promise<ImportReport> {
  const { rows, rowNumbers, problems } = parseCsv(bytes, STOCK_COUNT_COLUMNS);
  const warnings: CsvProblem[] = [];
  if (problems.some((p) => p.row === 1) || !rows.length) {
    if (!rows.length && !problems.length) problems.push({ row: 2, message: "The file has a header but no rows." });
    return report(false, rows.length, problems, warnings, {});
  }
  const codes = rows.map((r) => (r.code ?? "").toUpperCase()).filter(Boolean);
  const blocks = await countBlocks(db(), codes);
  const changes: CountChange[] = [];
  const seen = new Map<string, number>();
  rows.forEach((r, i) => {
    const row = rowNumbers[i]!;
    const before = problems.length;
    const c = cellReader(problems, row, r);
    const code = c.text("code", { required: true, max: 40 })?.toUpperCase();
    const location = c.text("location", { required: true, max: 60 });
    const present = c.bool("present", true);
    const dims = [
      c.number("length_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("width_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
      c.number("height_mm", { positive: true, min: MIN_SIZE_MM, max: 30_000 }),
    ];
    const note = c.text("note", { max: 300 });
    if (dims.some((d) => d !== null) && dims.some((d) => d === null))
      problems.push({ row, column: "length_mm", message: "Give all three measured sizes, or none." });
    if (!code) return;
    if (seen.has(code))
      problems.push({ row, column: "code", message: `Block ${code} is also on row ${seen.get(code)}.` });
    seen.set(code, row);
    const block = blocks.get(code);
    const problem = countProblem(code, block, present);
    if (problem) problems.push({ row, column: block?.status === "earmarked" ? "present" : "code", message: problem });
    if (problems.length > before || !block) return;
    changes.push({
      block,
      location: location!,
      present,
      size: dims.every((d) => d !== null) ? (dims as Vec3) : null,
      note,
    });
  });
  const summary = {
    confirmed: changes.filter((c) => c.present).length,
    moved: changes.filter((c) => c.present && c.location !== c.block.location).length,
    remeasured: changes.filter((c) => c.present && c.size).length,
    missing: changes.filter((c) => !c.present).length,
  };
  if (problems.length || !commit) return report(false, rows.length, problems, warnings, summary);

  await db().transaction(async (trx) => {
    const [imp] = await trx("csv_imports")
      .insert({ kind: "stock_count", file_name: fileName, rows: rows.length, imported_by: actorId })
      .returning("id");
    await applyCount(trx, changes, `count:${imp!.id}`, actorId);
  });
  return report(true, rows.length, problems, warnings, summary);
}
