import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createSupplier, listSuppliers } from "@/db/queries/suppliers";
import { supplierSchema } from "@/lib/validations/stock";

export const GET = api("GET /api/suppliers", async () => ({ items: await listSuppliers() }));

export const POST = api("POST /api/suppliers", async ({ req, user }) => {
  const input = await readJson(req, supplierSchema);
  return NextResponse.json({ supplier: await createSupplier(input, user.id) }, { status: 201 });
});
