import { api } from "@/lib/auth/guard";
import { getPhoto } from "@/db/queries/photos";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { photoSize, servePhoto } from "@/lib/storage/serve-photo";

type P = { photoId: string };

/**
 * `GET /api/photos/7?size=thumb` streams a defect photo (or its 320 px WebP thumbnail) to a
 * signed-in person. Photos never change under an id, so the browser may keep them privately.
 */
export const GET = api<P>("GET /api/photos/[photoId]", async ({ req, params }) => {
  const id = idParam(params.photoId, "That photo");
  const size = photoSize(req);
  const photo = await getPhoto(id);
  if (!photo) throw notFound("That photo");
  return servePhoto(photo, size, `defect-${photo.defectId}`);
});
