import { api, readJson } from "@/lib/auth/guard";
import { closePurchaseOrder, getPurchaseOrder } from "@/db/queries/purchase-orders";
import { closePoSchema } from "@/lib/validations/purchasing";
import { idParam } from "@/lib/params";

/** Closes a partly received order short: the rest is not coming. */
export const POST = api<{ poId: string }>("POST /api/purchase-orders/[poId]/close", async ({ req, params, user }) => {
  const id = idParam(params.poId, "That purchase order");
  const { reason } = await readJson(req, closePoSchema);
  await closePurchaseOrder(id, reason, user.id);
  return { order: await getPurchaseOrder(id) };
});
