import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { addClaimPhotos, claimPhotoKeys, getClaim } from "@/db/queries/claims";
import { HttpError, notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { MAX_UPLOAD_BYTES, storePhotos } from "@/lib/storage/defect-photos";

type P = { claimId: string };

/**
 * `POST /api/claims/3/photos` (multipart/form-data, files under "photos") → 201 `{ items }`: checked,
 * re-encoded and stored exactly as defect photos are.
 */
export const POST = api<P>("POST /api/claims/[claimId]/photos", async ({ req, params, user }) => {
  const id = idParam(params.claimId, "That claim");
  if (!(await getClaim(id))) throw notFound("That claim");
  if (!(req.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    throw new HttpError(415, 'Send the photos as multipart/form-data, in a field named "photos".');
  }
  const length = Number(req.headers.get("content-length") ?? 0);
  if (length > MAX_UPLOAD_BYTES) {
    throw new HttpError(
      413,
      `This upload is ${Math.ceil(length / 1024 / 1024)} MB; send at most ${Math.floor(MAX_UPLOAD_BYTES / 1024 / 1024)} MB at a time.`,
      { photos: "Too much at once: send fewer photos per upload." },
    );
  }
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw new HttpError(400, "The upload could not be read as a form; try again.");
  }
  const files = form.getAll("photos").filter((v): v is File => typeof v !== "string");
  const items = await storePhotos(
    files,
    (ext) => claimPhotoKeys(id, ext),
    (rows) => addClaimPhotos(id, rows, user.id),
  );
  return NextResponse.json({ items }, { status: 201 });
});
