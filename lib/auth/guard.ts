import "server-only";
import { redirect } from "next/navigation";
import { NextResponse, type NextRequest } from "next/server";
import type { z } from "zod";
import { getCurrentSession, type CurrentUser } from "./session";
import { API_POLICY, allows, type Access, type RouteKey } from "./policy";
import { HttpError, forbidden, isDatabaseDown, unauthorized } from "@/lib/errors";
import type { Role } from "@/lib/roles";

/** For pages and server actions: the signed-in user holding one of `roles` (admin always passes). */
export async function requireRole(...roles: Role[]): Promise<CurrentUser> {
  const { user } = await getCurrentSession();
  if (!user) redirect("/sign-in");
  if (roles.length && !allows(roles, user.roles)) redirect("/?denied=1");
  return user;
}

interface Ctx<P> {
  req: NextRequest;
  params: P;
  user: CurrentUser | null;
}

/**
 * Wraps a route handler: checks the session against API_POLICY[key] before anything else,
 * turns HttpError into `{ error, fields? }`, an unreachable database into 503, and anything
 * else into a 500 without a stack trace.
 *
 *   export const GET = api("GET /api/me", async ({ user }) => ({ user }));
 */
export function api<P = Record<string, string>>(
  key: RouteKey,
  handler: (ctx: Ctx<P>) => Promise<Response | object | null>,
) {
  const access: Access = API_POLICY[key];
  return async (req: NextRequest, context: { params: Promise<P> }) => {
    try {
      let user: CurrentUser | null = null;
      if (access !== "public") {
        user = (await getCurrentSession()).user;
        if (!user) throw unauthorized();
        if (!allows(access, user.roles)) throw forbidden();
      }
      const params = (await context?.params) ?? ({} as P);
      const out = await handler({ req, params, user });
      if (out instanceof Response) return out;
      return NextResponse.json(out ?? { ok: true });
    } catch (e) {
      return errorResponse(e);
    }
  };
}

export function errorResponse(e: unknown): NextResponse {
  if (e instanceof HttpError) {
    return NextResponse.json(
      { error: e.message, ...(e.fields ? { fields: e.fields } : {}) },
      { status: e.status, headers: e.headers },
    );
  }
  // Input that slipped past validation and was refused by Postgres itself is still the caller's
  // input: a data exception (NUL in text, a number out of range) or a CHECK constraint is 400; a
  // unique index refusing a write (a concurrent request took the same code first) is 409.
  const pgCode = (e as { code?: unknown } | null)?.code;
  if (typeof pgCode === "string" && (/^22[0-9A-Z]{3}$/.test(pgCode) || pgCode === "23514")) {
    console.warn("[api] refused by the database (data exception)", pgCode, (e as Error).message?.slice(-200));
    return NextResponse.json(
      {
        error:
          "A value cannot be stored: it is out of range or holds characters that are not allowed (such as NUL). Nothing was changed.",
      },
      { status: 400 },
    );
  }
  if (pgCode === "23505") {
    console.warn("[api] refused by the database (unique)", (e as { constraint?: string }).constraint);
    return NextResponse.json(
      { error: "Another request saved the same code or name a moment ago. Nothing was changed; check and try again." },
      { status: 409 },
    );
  }
  if (isDatabaseDown(e)) {
    return NextResponse.json(
      { error: "The database cannot be reached. Try again in a moment." },
      { status: 503, headers: { "Retry-After": "5" } },
    );
  }
  console.error("[api] unexpected error", e);
  return NextResponse.json({ error: "Something went wrong on our side. Nothing was changed." }, { status: 500 });
}

/** Reads a JSON body and checks it against a zod schema; 400 naming each bad field otherwise. */
export async function readJson<T extends z.ZodType>(req: Request, schema: T): Promise<z.infer<T>> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) throw new HttpError(415, "Send the request body as application/json.");
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new HttpError(400, "The request body is not valid JSON.");
  }
  return parseWith(schema, body);
}

export function parseWith<T extends z.ZodType>(schema: T, value: unknown): z.infer<T> {
  const r = schema.safeParse(value);
  if (r.success) return r.data;
  throw new HttpError(400, "Some fields need attention.", fieldErrors(r.error));
}

export function fieldErrors(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    fields[key] ??= issue.message;
  }
  return fields;
}
