import { api } from "@/lib/auth/guard";
import { getDelivery } from "@/db/queries/deliveries";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { deliveryId: string };

export const GET = api<P>("GET /api/deliveries/[deliveryId]", async ({ params }) => {
  const delivery = await getDelivery(idParam(params.deliveryId, "That delivery"));
  if (!delivery) throw notFound("That delivery");
  return { delivery };
});
