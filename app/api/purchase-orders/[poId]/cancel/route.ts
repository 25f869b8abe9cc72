import { api, readJson } from "@/lib/auth/guard";
import { cancelPurchaseOrder, getPurchaseOrder } from "@/db/queries/purchase-orders";
import { cancelPoSchema } from "@/lib/validations/purchasing";
import { idParam } from "@/lib/params";

export const POST = api<{ poId: string }>("POST /api/purchase-orders/[poId]/cancel", async ({ req, params, user }) => {
  const id = idParam(params.poId, "That purchase order");
  const { reason } = await readJson(req, cancelPoSchema);
  await cancelPurchaseOrder(id, reason, user.id);
  return { order: await getPurchaseOrder(id) };
});
