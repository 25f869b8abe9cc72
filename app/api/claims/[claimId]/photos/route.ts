import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { addClaimPhotos, claimPhotoKeys, getClaim } from "@/db/queries/claims";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { readPhotoUpload, storePhotos } from "@/lib/storage/defect-photos";

type P = { claimId: string };

/**
 * `POST /api/claims/3/photos` (multipart/form-data, files under "photos") → 201 `{ items }`: checked,
 * re-encoded and stored exactly as defect photos are.
 */
export const POST = api<P>("POST /api/claims/[claimId]/photos", async ({ req, params, user }) => {
  const id = idParam(params.claimId, "That claim");
  if (!(await getClaim(id))) throw notFound("That claim");
  const files = await readPhotoUpload(req);
  const items = await storePhotos(
    files,
    (ext) => claimPhotoKeys(id, ext),
    (rows) => addClaimPhotos(id, rows, user.id),
  );
  return NextResponse.json({ items }, { status: 201 });
});
