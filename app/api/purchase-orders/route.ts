import { NextResponse } from "next/server";
import { z } from "zod";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { createPurchaseOrder, listPurchaseOrders } from "@/db/queries/purchase-orders";
import { purchaseOrderSchema } from "@/lib/validations/purchasing";
import { PO_STATUSES } from "@/lib/purchasing/orders";

const query = z.object({
  status: z
    .enum([...PO_STATUSES, "open"] as const, {
      error: "status is one of draft, sent, part_received, closed, cancelled or open.",
    })
    .optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export const GET = api("GET /api/purchase-orders", async ({ req }) => {
  const q = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  return listPurchaseOrders(q);
});

export const POST = api("POST /api/purchase-orders", async ({ req, user }) => {
  const input = await readJson(req, purchaseOrderSchema);
  return NextResponse.json({ order: await createPurchaseOrder(input, user.id) }, { status: 201 });
});
