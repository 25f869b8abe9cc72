import { NextResponse } from "next/server";
import { z } from "zod";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { createDelivery, listDeliveries } from "@/db/queries/deliveries";
import { deliverySchema } from "@/lib/validations/stock";

const query = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  supplier: z.coerce.number().int().positive().optional(),
});

export const GET = api("GET /api/deliveries", async ({ req }) => {
  const q = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  return listDeliveries({ page: q.page, pageSize: q.pageSize, supplierId: q.supplier });
});

export const POST = api("POST /api/deliveries", async ({ req, user }) => {
  const input = await readJson(req, deliverySchema);
  return NextResponse.json(await createDelivery(input, user.id), { status: 201 });
});
