import { z } from "zod";

/**
 * Object storage settings, read from the environment and checked once. Any S3-compatible service
 * works; `npm start` and `npm test` fill these in for a local fake (scripts/s3.ts).
 */
const schema = z
  .object({
    S3_ENDPOINT: z.url({ error: "S3_ENDPOINT must be a URL such as http://127.0.0.1:54340" }).optional(),
    S3_REGION: z.string().min(1).default("us-east-1"),
    S3_BUCKET: z
      .string({ error: "S3_BUCKET is not set (the start and test scripts set it)" })
      .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, "S3_BUCKET must be a valid bucket name"),
    S3_ACCESS_KEY_ID: z.string().min(1).optional(),
    S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  })
  .refine((e) => !!e.S3_ACCESS_KEY_ID === !!e.S3_SECRET_ACCESS_KEY, {
    path: ["S3_SECRET_ACCESS_KEY"],
    message: "set both S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY, or neither (to use the SDK's own credential chain)",
  });

export type StorageConfig = z.infer<typeof schema>;

/** Thrown when photo storage is missing or misconfigured; the API answers 503 and logs the detail. */
export class StorageNotConfigured extends Error {
  constructor(detail: string) {
    super(`Photo storage is not configured: ${detail}`);
    this.name = "StorageNotConfigured";
  }
}

let cached: StorageConfig | undefined;

export function storageConfig(): StorageConfig {
  if (!cached) {
    const blank = (v: string | undefined) => (v === "" ? undefined : v);
    const parsed = schema.safeParse({
      S3_ENDPOINT: blank(process.env.S3_ENDPOINT),
      S3_REGION: blank(process.env.S3_REGION),
      S3_BUCKET: blank(process.env.S3_BUCKET),
      S3_ACCESS_KEY_ID: blank(process.env.S3_ACCESS_KEY_ID),
      S3_SECRET_ACCESS_KEY: blank(process.env.S3_SECRET_ACCESS_KEY),
    });
    if (!parsed.success)
      throw new StorageNotConfigured(parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; "));
    cached = parsed.data;
  }
  return cached;
}
