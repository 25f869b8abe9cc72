import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { getPurchaseOrder, receiveAgainstOrder } from "@/db/queries/purchase-orders";
import { receivePoSchema } from "@/lib/validations/purchasing";
import { idParam } from "@/lib/params";

/** Receives a delivery against the order's lines (±10 % terms; see receiveAgainstOrder). */
export const POST = api<{ poId: string }>("POST /api/purchase-orders/[poId]/receive", async ({ req, params, user }) => {
  const id = idParam(params.poId, "That purchase order");
  const input = await readJson(req, receivePoSchema);
  const result = await receiveAgainstOrder(id, input, user.id);
  return NextResponse.json({ ...result, order: await getPurchaseOrder(id) }, { status: 201 });
});
