import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { getDefect } from "@/db/queries/defects";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { readPhotoUpload, saveDefectPhotos } from "@/lib/storage/defect-photos";

type P = { defectId: string };

/** `POST /api/defects/12/photos` (multipart/form-data, files under "photos") → 201 `{ items }` */
export const POST = api<P>("POST /api/defects/[defectId]/photos", async ({ req, params, user }) => {
  const id = idParam(params.defectId, "That defect zone");
  if (!(await getDefect(id))) throw notFound("That defect zone");
  const files = await readPhotoUpload(req);
  const items = await saveDefectPhotos(id, files, user.id);
  return NextResponse.json({ items }, { status: 201 });
});
