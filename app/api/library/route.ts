import { NextResponse } from "next/server";
import { z } from "zod";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { createLibraryPart, createLibraryParts, listLibraryParts } from "@/db/queries/library";
import { libraryPartSchema, libraryPartsSchema, libraryQuerySchema } from "@/lib/validations/jobs";

/** `GET /api/library?q=…&kit=…&includeRetired=1` → `{ items }` (kit, then name); `q` searches name, kit and grade code. */
export const GET = api("GET /api/library", async ({ req }) => {
  const q = parseWith(libraryQuerySchema, Object.fromEntries(req.nextUrl.searchParams));
  return { items: await listLibraryParts({ kit: q.kit, q: q.q, includeRetired: q.includeRetired === "1" }) };
});

/**
 * `POST /api/library` `{ kit?, name, size? | profile?, gradeId?, rotate?, defaultQuantity?, notes? }` → 201 `{ part }`,
 * or `{ parts: [part, …] }` (a drawing's profiles, a word's letters) → 201 `{ parts }`, all or none.
 */
export const POST = api("POST /api/library", async ({ req, user }) => {
  const body = await readJson(req, z.record(z.string(), z.unknown(), { error: "Send a part, or { parts }." }));
  if ("parts" in body) {
    const { parts } = parseWith(libraryPartsSchema, body);
    return NextResponse.json({ parts: await createLibraryParts(parts, user.id) }, { status: 201 });
  }
  const input = parseWith(libraryPartSchema, body);
  return NextResponse.json({ part: await createLibraryPart(input, user.id) }, { status: 201 });
});
