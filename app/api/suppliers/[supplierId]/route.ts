import { api, readJson } from "@/lib/auth/guard";
import { getSupplier, updateSupplier } from "@/db/queries/suppliers";
import { supplierSchema } from "@/lib/validations/stock";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { supplierId: string };

export const GET = api<P>("GET /api/suppliers/[supplierId]", async ({ params }) => {
  const supplier = await getSupplier(idParam(params.supplierId, "That supplier"));
  if (!supplier) throw notFound("That supplier");
  return { supplier };
});

export const PUT = api<P>("PUT /api/suppliers/[supplierId]", async ({ req, params, user }) => {
  const id = idParam(params.supplierId, "That supplier");
  const input = await readJson(req, supplierSchema);
  return { supplier: await updateSupplier(id, input, user.id) };
});
