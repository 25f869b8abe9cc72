import { api, readJson } from "@/lib/auth/guard";
import { getPurchaseOrder, listOrderDeliveries, updatePurchaseOrder } from "@/db/queries/purchase-orders";
import { purchaseOrderSchema } from "@/lib/validations/purchasing";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { poId: string };

export const GET = api<P>("GET /api/purchase-orders/[poId]", async ({ params }) => {
  const id = idParam(params.poId, "That purchase order");
  const order = await getPurchaseOrder(id);
  if (!order) throw notFound("That purchase order");
  return { order, deliveries: await listOrderDeliveries(id) };
});

/** Rewrites a draft (409 once it has been sent). */
export const PUT = api<P>("PUT /api/purchase-orders/[poId]", async ({ req, params, user }) => {
  const id = idParam(params.poId, "That purchase order");
  const input = await readJson(req, purchaseOrderSchema);
  return { order: await updatePurchaseOrder(id, input, user.id) };
});
