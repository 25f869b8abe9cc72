import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { NextResponse, type NextRequest } from "next/server";
import type { z } from "zod";
import { getCurrentSession, type CurrentUser } from "./session";
import {
  API_POLICY,
  MONEY_FIELDS,
  PAGE_POLICY,
  allows,
  seesMoney,
  withoutMoney,
  type Access,
  type GuardedPageKey,
  type GuardedRouteKey,
  type PageKey,
  type PublicPageKey,
  type PublicRouteKey,
  type RouteKey,
} from "./policy";
import { HttpError, NUL_REFUSED, forbidden, isDatabaseDown, unauthorized } from "@/lib/errors";

/** The page path proxy.ts passes along (it overwrites whatever the client sent). */
export const PATH_HEADER = "x-blockyard-path";

/**
 * For pages: the signed-in user whom PAGE_POLICY[key] admits (admin always passes); someone
 * signed out goes to sign-in, someone without the role home with a notice. Someone still on a
 * temporary password is sent to the account page to choose their own first. A public page lets
 * everyone in and gives whoever is signed in, or null.
 *
 *   const user = await requirePage("/plans/[runId]/cut");
 */
export async function requirePage(key: PublicPageKey): Promise<CurrentUser | null>;
export async function requirePage(key: GuardedPageKey): Promise<CurrentUser>;
export async function requirePage(key: PageKey): Promise<CurrentUser | null> {
  const { user } = await getCurrentSession();
  if (PAGE_POLICY[key] === "public") return user;
  if (!user) redirect("/sign-in");
  if (user.mustChangePassword) {
    const path = (await headers()).get(PATH_HEADER);
    if (path && path !== "/account") redirect("/account");
  }
  if (!allows(PAGE_POLICY[key], user.roles)) redirect("/?denied=1");
  return user;
}

/** What someone on a temporary password may still call: changing it, signing out, and who am I. */
const ALLOWED_WITH_TEMPORARY_PASSWORD: ReadonlySet<RouteKey> = new Set<RouteKey>([
  "POST /api/me/password",
  "POST /api/auth/sign-out",
  "GET /api/me",
]);

export const TEMPORARY_PASSWORD_REFUSED =
  "You are signed in with a temporary password. Choose your own password first (Your account page, or POST /api/me/password); until then only that and signing out are allowed.";

/** API answers hold someone's data or a decision about them: never kept by a browser or a proxy. */
function noStore(res: Response): Response {
  try {
    if (!res.headers.has("cache-control")) res.headers.set("Cache-Control", "no-store");
  } catch {
    /* a response with immutable headers (passed through from a fetch): left as it is */
  }
  return res;
}

interface Ctx<P, U extends CurrentUser | null> {
  req: NextRequest;
  params: P;
  /** The caller: always there when the route's policy asks for a session, null for public routes. */
  user: U;
}

type Handler<P, U extends CurrentUser | null> = (ctx: Ctx<P, U>) => Promise<Response | object | null>;
type RouteHandler<P> = (req: NextRequest, context: { params: Promise<P> }) => Promise<Response>;

/**
 * Wraps a route handler: checks the session against API_POLICY[key] before anything else
 * (someone on a temporary password gets 403 for everything but changing it and signing out),
 * turns HttpError into `{ error, fields? }`, an unreachable database into 503, and anything
 * else into a 500 without a stack trace. Every answer carries `Cache-Control: no-store` unless
 * the handler chose its own (a photo that never changes under its id).
 *
 *   export const GET = api("GET /api/me", async ({ user }) => ({ user }));
 */
export function api<P = Record<string, string>>(key: PublicRouteKey, handler: Handler<P, null>): RouteHandler<P>;
export function api<P = Record<string, string>>(
  key: GuardedRouteKey,
  handler: Handler<P, CurrentUser>,
): RouteHandler<P>;
export function api<P>(key: RouteKey, handler: Handler<P, CurrentUser> | Handler<P, null>): RouteHandler<P> {
  const access: Access = API_POLICY[key];
  // The overloads tie the handler's `user` to the key; the checks below make it so at run time.
  const run = handler as Handler<P, CurrentUser | null>;
  return async (req, context) => {
    try {
      let user: CurrentUser | null = null;
      if (access !== "public") {
        user = (await getCurrentSession()).user;
        if (!user) throw unauthorized();
        if (user.mustChangePassword && !ALLOWED_WITH_TEMPORARY_PASSWORD.has(key)) {
          throw new HttpError(403, TEMPORARY_PASSWORD_REFUSED);
        }
        if (!allows(access, user.roles)) throw forbidden();
      }
      const params = (await context?.params) ?? ({} as P);
      const out = await run({ req, params, user });
      if (out instanceof Response) return noStore(out);
      // Money figures only for the roles that see money (lib/auth/policy.ts, MONEY).
      const money = MONEY_FIELDS[key];
      const shown = money && user && !seesMoney(user.roles) ? withoutMoney(out, money) : out;
      return noStore(NextResponse.json(shown ?? { ok: true }));
    } catch (e) {
      return errorResponse(e);
    }
  };
}

export function errorResponse(e: unknown): NextResponse {
  const res = errorAnswer(e);
  res.headers.set("Cache-Control", "no-store");
  return res;
}

function errorAnswer(e: unknown): NextResponse {
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

/**
 * The path of every string in `value` that holds a NUL character, as `fieldErrors` names paths
 * ("parts.3.name"), each with `NUL_REFUSED`.
 * @example nulFields({ parts: [{ name: "ok" }, { name: "a\u0000b" }] }) // → { "parts.1.name": NUL_REFUSED }
 */
export function nulFields(value: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (v: unknown, path: (string | number)[]) => {
    if (typeof v === "string") {
      if (v.includes("\u0000")) out[path.length ? path.join(".") : "_"] = NUL_REFUSED;
    } else if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...path, i]));
    else if (v && typeof v === "object") for (const [key, x] of Object.entries(v)) walk(x, [...path, key]);
  };
  walk(value, []);
  return out;
}

/** Checks a value against a zod schema; 400 naming each bad field (and each holding a NUL) otherwise. */
export function parseWith<T extends z.ZodType>(schema: T, value: unknown): z.infer<T> {
  const nul = nulFields(value);
  if (Object.keys(nul).length) throw new HttpError(400, "Some fields need attention.", nul);
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
