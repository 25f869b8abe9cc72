import "server-only";
import { HttpError } from "@/lib/errors";
import { getObject } from "@/lib/storage";
import { isStorageDown, requireStorage } from "@/lib/storage/defect-photos";

/** `?size=` of a photo request: the stored original, or its 320 px WebP thumbnail. */
export function photoSize(req: { nextUrl: URL }): "full" | "thumb" {
  const size = req.nextUrl.searchParams.get("size") ?? "full";
  if (size !== "full" && size !== "thumb")
    throw new HttpError(400, "size must be thumb or full.", { size: "Use size=thumb or size=full." });
  return size;
}

/**
 * Streams a stored photo (defect or claim): the object, or its thumbnail, with its type, a file
 * name `${name}-photo-${id}[-thumb].ext`, nosniff, and a private week-long cache (photos never
 * change under an id). 503 when storage is down; 404 when the file is gone.
 */
export async function servePhoto(
  photo: { id: number; objectKey: string; thumbKey: string; contentType: string },
  size: "full" | "thumb",
  name: string,
): Promise<Response> {
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
    "Content-Disposition": `inline; filename="${name}-photo-${photo.id}${size === "thumb" ? "-thumb" : ""}.${ext}"`,
  };
  if (obj.contentLength !== undefined) headers["Content-Length"] = String(obj.contentLength);
  return new Response(obj.body, { status: 200, headers });
}
