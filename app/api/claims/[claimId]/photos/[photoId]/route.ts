import { api } from "@/lib/auth/guard";
import { getClaimPhoto } from "@/db/queries/claims";
import { HttpError, notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { getObject } from "@/lib/storage";
import { isStorageDown, requireStorage } from "@/lib/storage/defect-photos";

type P = { claimId: string; photoId: string };

/** `GET /api/claims/3/photos/7?size=thumb` streams a claim's photo (or its 320 px WebP thumbnail). */
export const GET = api<P>("GET /api/claims/[claimId]/photos/[photoId]", async ({ req, params }) => {
  const claimId = idParam(params.claimId, "That claim");
  const id = idParam(params.photoId, "That photo");
  const size = req.nextUrl.searchParams.get("size") ?? "full";
  if (size !== "full" && size !== "thumb")
    throw new HttpError(400, "size must be thumb or full.", { size: "Use size=thumb or size=full." });
  const photo = await getClaimPhoto(claimId, id);
  if (!photo) throw notFound("That photo");
  requireStorage();
  let obj: Awaited<ReturnType<typeof getObject>>;
  try {
    obj = await getObject(size === "thumb" ? photo.thumbKey : photo.objectKey);
  } catch (e) {
    if (isStorageDown(e))
      throw new HttpError(503, "Photo storage cannot be reached; try again in a moment.", undefined, {
        "Retry-After": "5",
      });
    throw e;
  }
  if (!obj) throw new HttpError(404, "That photo's file is missing from storage.");
  const type = size === "thumb" ? "image/webp" : photo.contentType;
  const ext = type === "image/jpeg" ? "jpg" : type.slice("image/".length);
  const headers: Record<string, string> = {
    "Content-Type": type,
    "X-Content-Type-Options": "nosniff",
    "Cache-Control": "private, max-age=604800, immutable",
    "Content-Disposition": `inline; filename="claim-${claimId}-photo-${photo.id}${size === "thumb" ? "-thumb" : ""}.${ext}"`,
  };
  if (obj.contentLength !== undefined) headers["Content-Length"] = String(obj.contentLength);
  return new Response(obj.body, { status: 200, headers });
});
