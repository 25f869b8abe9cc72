import { z } from "zod";

/** Environment, read and validated once. Server-only values; never import from client components. */
const schema = z.object({
  DATABASE_URL: z.string().min(1, "DATABASE_URL is not set (the start and test scripts set it)"),
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  /** Force the session cookie's Secure flag; by default it follows the request (https or X-Forwarded-Proto). */
  COOKIE_SECURE: z
    .enum(["true", "false"])
    .optional()
    .transform((v) => (v === undefined ? undefined : v === "true")),
  /** Trust X-Forwarded-For for the client address (set when behind a proxy you control). */
  TRUST_PROXY: z
    .enum(["true", "false", "1", "0"])
    .optional()
    .transform((v) => v === "true" || v === "1"),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = schema.safeParse(process.env);
    if (!parsed.success) {
      const lines = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
      throw new Error(`Invalid environment:\n${lines.join("\n")}`);
    }
    cached = parsed.data;
  }
  return cached;
}

export const APP_VERSION = process.env.npm_package_version ?? "0.1.0";
