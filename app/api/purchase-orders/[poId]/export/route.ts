import { api } from "@/lib/auth/guard";
import { getPurchaseOrder } from "@/db/queries/purchase-orders";
import { csvResponse } from "@/lib/csv";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { poFileName, purchaseOrderCsv } from "@/lib/purchasing/orders";

export const GET = api<{ poId: string }>("GET /api/purchase-orders/[poId]/export", async ({ params }) => {
  const po = await getPurchaseOrder(idParam(params.poId, "That purchase order"));
  if (!po) throw notFound("That purchase order");
  return csvResponse(purchaseOrderCsv(po), poFileName(po));
});
