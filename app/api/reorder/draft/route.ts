import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { draftFromReorder } from "@/db/queries/purchase-orders";
import { draftFromReorderSchema } from "@/lib/validations/purchasing";

/** Drafts orders for the ticked grades: one per supplier. */
export const POST = api("POST /api/reorder/draft", async ({ req, user }) => {
  const input = await readJson(req, draftFromReorderSchema);
  return NextResponse.json(
    { orders: await draftFromReorder(input.gradeIds, input.expectedOn, user.id) },
    { status: 201 },
  );
});
