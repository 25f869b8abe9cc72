/** One error type for everything a request can refuse; route handlers turn it into `{ error, fields? }`. */
export class HttpError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fields?: Record<string, string>,
    public readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

/** What a field or CSV cell holding a NUL character is told (Postgres cannot store one in text). */
export const NUL_REFUSED = "Holds a NUL character (code 0), which cannot be stored: remove it.";

export const unauthorized = () => new HttpError(401, "Sign in to continue.");
export const forbidden = () => new HttpError(403, "Your role does not allow this.");
export const notFound = (what = "That record") => new HttpError(404, `${what} was not found.`);

/** True for failures that mean the database cannot be reached (so the answer is 503, not 500). */
export function isDatabaseDown(e: unknown): boolean {
  const err = e as { code?: string; message?: string; name?: string } | undefined;
  if (!err) return false;
  if (
    err.code &&
    ["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "57P01", "57P03", "08006", "08001", "08003"].includes(err.code)
  ) {
    return true;
  }
  return /Knex: Timeout acquiring a connection|Connection terminated|connect ECONNREFUSED/i.test(err.message ?? "");
}
