import { api, parseWith } from "@/lib/auth/guard";
import { listBlocks } from "@/db/queries/blocks";
import { blockQuerySchema } from "@/lib/validations/stock";
import { csvResponse, toCsv } from "@/lib/csv";
import { STATUS_LABELS, isoDate } from "@/lib/stock";
import { m3ToBoardFeet } from "@/lib/units";

/** The stock list as CSV, with the same filters and sort as the page (every page of it, up to 100,000 rows). */
export const GET = api("GET /api/blocks/export", async ({ req }) => {
  const q = parseWith(blockQuerySchema, { ...Object.fromEntries(req.nextUrl.searchParams), page: 1, pageSize: 200 });
  const rows: Record<string, unknown>[] = [];
  for (let page = 1; page <= 500; page++) {
    const { items } = await listBlocks({ ...q, page });
    for (const b of items) {
      rows.push({
        code: b.code,
        grade: b.gradeCode,
        material: b.material,
        lot: b.lot,
        status: STATUS_LABELS[b.shown],
        length_mm: b.size[0],
        width_mm: b.size[1],
        height_mm: b.size[2],
        volume_m3: Number(b.volumeM3.toFixed(6)),
        board_feet: Number(m3ToBoardFeet(b.volumeM3).toFixed(2)),
        weight_kg: b.weightKg,
        density_kg_m3: b.densityKgM3 === null ? null : Number(b.densityKgM3.toFixed(2)),
        cost: b.cost,
        location: b.location,
        moulded_on: b.mouldedOn,
        cut_not_before: b.cutNotBefore,
        fifo: b.fifo,
        offcut_of: b.isOffcut ? b.parentId : null,
        defects: b.defectCount,
        supplier: b.supplier,
        received_on: b.receivedOn,
      });
    }
    if (items.length < 200) break;
  }
  const columns = [
    "code",
    "grade",
    "material",
    "lot",
    "status",
    "length_mm",
    "width_mm",
    "height_mm",
    "volume_m3",
    "board_feet",
    "weight_kg",
    "density_kg_m3",
    "cost",
    "location",
    "moulded_on",
    "cut_not_before",
    "fifo",
    "offcut_of",
    "defects",
    "supplier",
    "received_on",
  ];
  return csvResponse(toCsv(rows, columns), `blockyard-stock-${isoDate()}.csv`);
});
