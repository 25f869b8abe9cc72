import { NextResponse } from "next/server";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { createLibraryPart, listLibraryParts } from "@/db/queries/library";
import { libraryPartSchema, libraryQuerySchema } from "@/lib/validations/jobs";

/** `GET /api/library?q=…&kit=…&includeRetired=1` → `{ items }` (kit, then name); `q` searches name, kit and grade code. */
export const GET = api("GET /api/library", async ({ req }) => {
  const q = parseWith(libraryQuerySchema, Object.fromEntries(req.nextUrl.searchParams));
  return { items: await listLibraryParts({ kit: q.kit, q: q.q, includeRetired: q.includeRetired === "1" }) };
});

/** `POST /api/library` `{ kit?, name, size? | profile?, gradeId?, rotate?, defaultQuantity?, notes? }` → 201 `{ part }` */
export const POST = api("POST /api/library", async ({ req, user }) => {
  const input = await readJson(req, libraryPartSchema);
  return NextResponse.json({ part: await createLibraryPart(input, user.id) }, { status: 201 });
});
