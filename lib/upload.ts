import "server-only";
import { HttpError } from "@/lib/errors";

/** Reads a raw CSV upload (text/csv body), refusing other types and anything over `maxBytes`. */
export async function readCsvBody(req: Request, maxBytes = 20 * 1024 * 1024): Promise<Uint8Array> {
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (
    !["text/csv", "text/plain", "application/csv", "application/vnd.ms-excel", "application/octet-stream"].includes(
      type,
    )
  ) {
    throw new HttpError(415, "Send the file as text/csv.");
  }
  const declared = Number(req.headers.get("content-length") ?? 0);
  if (declared > maxBytes)
    throw new HttpError(413, `The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`);
  const buf = new Uint8Array(await req.arrayBuffer());
  if (buf.byteLength > maxBytes)
    throw new HttpError(413, `The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`);
  return buf;
}
