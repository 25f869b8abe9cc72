/**
 * Photo objects in an S3-compatible bucket, so several app servers share them.
 * Free of `server-only` so the seed scripts and tests can use it; app code imports `@/lib/storage`.
 *
 *   await putObject("defects/12/4f…e1.jpg", bytes, "image/jpeg");
 *   const obj = await getObject("defects/12/4f…e1.jpg"); // → { body: ReadableStream, contentLength } | null
 */
import {
  DeleteObjectsCommand,
  GetObjectCommand,
  ListObjectsV2Command,
  NoSuchKey,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { storageConfig } from "./config";

const globalForS3 = globalThis as unknown as { blockyardS3?: S3Client };

export function s3(): S3Client {
  if (!globalForS3.blockyardS3) {
    const c = storageConfig();
    globalForS3.blockyardS3 = new S3Client({
      endpoint: c.S3_ENDPOINT,
      region: c.S3_REGION,
      forcePathStyle: true, // bucket in the path: works with every S3-compatible service and the local fake
      credentials: c.S3_ACCESS_KEY_ID
        ? { accessKeyId: c.S3_ACCESS_KEY_ID, secretAccessKey: c.S3_SECRET_ACCESS_KEY! }
        : undefined,
      maxAttempts: 2,
    });
  }
  return globalForS3.blockyardS3;
}

const bucket = () => storageConfig().S3_BUCKET;

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await s3().send(
    new PutObjectCommand({
      Bucket: bucket(),
      Key: key,
      Body: body,
      ContentType: contentType,
      ContentLength: body.byteLength,
    }),
  );
}

export interface StoredObject {
  body: ReadableStream<Uint8Array>;
  contentLength: number | undefined;
}

/** The object's bytes as a stream, or null when the bucket has no such key. */
export async function getObject(key: string): Promise<StoredObject | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    if (!out.Body) return null;
    return { body: out.Body.transformToWebStream() as ReadableStream<Uint8Array>, contentLength: out.ContentLength };
  } catch (e) {
    if (e instanceof NoSuchKey || (e as { name?: string }).name === "NoSuchKey") return null;
    throw e;
  }
}

/** Deletes keys (missing ones are fine); used to undo a half-finished upload. */
export async function deleteObjects(keys: string[]): Promise<void> {
  for (let i = 0; i < keys.length; i += 1000) {
    const chunk = keys.slice(i, i + 1000);
    if (chunk.length)
      await s3().send(
        new DeleteObjectsCommand({ Bucket: bucket(), Delete: { Objects: chunk.map((Key) => ({ Key })), Quiet: true } }),
      );
  }
}

/** Every key under a prefix (tests and seeds; not for request paths). */
export async function listKeys(prefix = ""): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const out = await s3().send(
      new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token }),
    );
    for (const o of out.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = out.IsTruncated ? out.NextContinuationToken : undefined;
  } while (token);
  return keys;
}
