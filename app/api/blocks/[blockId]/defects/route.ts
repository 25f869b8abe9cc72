import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createDefect, listDefects } from "@/db/queries/defects";
import { getBlock } from "@/db/queries/blocks";
import { defectSchema } from "@/lib/validations/stock";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { blockId: string };

export const GET = api<P>("GET /api/blocks/[blockId]/defects", async ({ params }) => {
  const id = idParam(params.blockId, "That block");
  if (!(await getBlock(id))) throw notFound("That block");
  return { items: await listDefects(id) };
});

export const POST = api<P>("POST /api/blocks/[blockId]/defects", async ({ req, params, user }) => {
  const id = idParam(params.blockId, "That block");
  const input = await readJson(req, defectSchema);
  const defectId = await createDefect(id, input, user.id);
  return NextResponse.json({ id: defectId, items: await listDefects(id) }, { status: 201 });
});
