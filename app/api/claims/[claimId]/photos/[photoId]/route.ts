import { api } from "@/lib/auth/guard";
import { getClaimPhoto } from "@/db/queries/claims";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { photoSize, servePhoto } from "@/lib/storage/serve-photo";

type P = { claimId: string; photoId: string };

/** `GET /api/claims/3/photos/7?size=thumb` streams a claim's photo (or its 320 px WebP thumbnail). */
export const GET = api<P>("GET /api/claims/[claimId]/photos/[photoId]", async ({ req, params }) => {
  const claimId = idParam(params.claimId, "That claim");
  const id = idParam(params.photoId, "That photo");
  const size = photoSize(req);
  const photo = await getClaimPhoto(claimId, id);
  if (!photo) throw notFound("That photo");
  return servePhoto(photo, size, `claim-${claimId}`);
});
