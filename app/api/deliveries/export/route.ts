import { api } from "@/lib/auth/guard";
import { listDeliveries } from "@/db/queries/deliveries";
import { csvResponse, toCsv } from "@/lib/csv";
import { isoDate } from "@/lib/stock";

export const GET = api("GET /api/deliveries/export", async () => {
  const rows: Record<string, unknown>[] = [];
  for (let page = 1; page <= 200; page++) {
    const { items } = await listDeliveries({ page, pageSize: 200 });
    for (const d of items) {
      rows.push({
        id: d.id,
        supplier: d.supplier,
        received_on: d.receivedOn,
        po_ref: d.poRef,
        lot: d.lot,
        blocks: d.blocks,
        volume_m3: Number(d.volumeM3.toFixed(6)),
        cost: d.cost,
        received_by: d.receivedBy,
        notes: d.notes,
      });
    }
    if (items.length < 200) break;
  }
  return csvResponse(
    toCsv(rows, [
      "id",
      "supplier",
      "received_on",
      "po_ref",
      "lot",
      "blocks",
      "volume_m3",
      "cost",
      "received_by",
      "notes",
    ]),
    `blockyard-deliveries-${isoDate()}.csv`,
  );
});
