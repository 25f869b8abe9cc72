import { NextResponse } from "next/server";
import { api, parseWith, readJson } from "@/lib/auth/guard";
import { addJobPart, addJobParts, addLibraryParts } from "@/db/queries/jobs";
import { fromLibrarySchema, partSchema, partsSchema } from "@/lib/validations/jobs";
import { idParam } from "@/lib/params";
import { z } from "zod";

type P = { jobId: string };

/**
 * `POST /api/jobs/3/parts` with one part entered by hand
 * `{ name, quantity, size?: [x, y, z], profile?: { kind: "polygon" | "naca", … }, gradeId?, rotate? }` → 201 `{ part }`,
 * or library parts `{ items: [{ libraryPartId, quantity }] }` → 201 `{ parts }`,
 * or several parts at once `{ parts: [part, …] }` (a drawing's profiles) → 201 `{ parts }`, all or none.
 */
export const POST = api<P>("POST /api/jobs/[jobId]/parts", async ({ req, params, user }) => {
  const jobId = idParam(params.jobId, "That job");
  const body = await readJson(
    req,
    z.record(z.string(), z.unknown(), { error: "Send a part, { parts }, or { items } from the library." }),
  );
  if ("items" in body) {
    const { items } = parseWith(fromLibrarySchema, body);
    return NextResponse.json({ parts: await addLibraryParts(jobId, items, user.id) }, { status: 201 });
  }
  if ("parts" in body) {
    const { parts } = parseWith(partsSchema, body);
    return NextResponse.json({ parts: await addJobParts(jobId, parts, user.id) }, { status: 201 });
  }
  const part = parseWith(partSchema, body);
  return NextResponse.json({ part: await addJobPart(jobId, part, user.id) }, { status: 201 });
});
