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

/**
 * A form upload (multipart/form-data or urlencoded), refused before reading when it is another type
 * (415) or declares more than `maxBytes` (413), and when unreadable (400). Each file's own size is
 * the caller's to check against its field's limit.
 */
export async function readFormUpload(req: Request, maxBytes: number, hint: string): Promise<FormData> {
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type !== "multipart/form-data" && type !== "application/x-www-form-urlencoded")
    throw new HttpError(415, `Send the form as multipart/form-data: ${hint}.`);
  const declared = Number(req.headers.get("content-length") ?? 0);
  if (declared > maxBytes)
    throw new HttpError(413, `The upload is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`, {
      file: `At most ${Math.round(maxBytes / 1024 / 1024)} MB.`,
    });
  try {
    return await req.formData();
  } catch {
    throw new HttpError(400, "The upload could not be read as a form; try again.");
  }
}
