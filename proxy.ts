import { NextResponse, type NextRequest } from "next/server";

const MUTATIONS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/** Read by requirePage (lib/auth/guard.ts): pages send someone on a temporary password to /account. */
const PATH_HEADER = "x-blockyard-path";

/** Browsers keep to https for a year once they have seen this over https. */
const HSTS = "max-age=31536000";

/**
 * Runs before every page and API request:
 *  - Cross-site request forgery guard for the JSON API: a mutation must come from this site's own
 *    pages (its Origin, or failing that its Referer, matches the Host). Sessions and roles are
 *    checked in each handler, not here. Server actions get Next's own origin check.
 *  - Passes the page's path on to the server components (always overwriting what the client sent).
 *  - Strict-Transport-Security on every answer to a request that came over https (directly or
 *    through a proxy that says so in X-Forwarded-Proto).
 */
export function proxy(request: NextRequest) {
  const https =
    request.nextUrl.protocol === "https:" ||
    (request.headers.get("x-forwarded-proto") ?? "").split(",")[0]?.trim().toLowerCase() === "https";
  const finish = (res: NextResponse) => {
    if (https) res.headers.set("Strict-Transport-Security", HSTS);
    return res;
  };
  const { pathname } = request.nextUrl;
  if (pathname !== "/api" && !pathname.startsWith("/api/")) {
    const forwarded = new Headers(request.headers);
    forwarded.set(PATH_HEADER, pathname);
    return finish(NextResponse.next({ request: { headers: forwarded } }));
  }
  if (!MUTATIONS.has(request.method)) return finish(NextResponse.next());
  // X-Forwarded-Host only from a proxy we were told to trust.
  const trustProxy = ["true", "1"].includes(process.env.TRUST_PROXY ?? "");
  const host = (trustProxy ? request.headers.get("x-forwarded-host") : null) ?? request.headers.get("host");
  const origin = request.headers.get("origin") ?? request.headers.get("referer");
  let ok = false;
  if (host && origin) {
    try {
      ok = new URL(origin).host === host;
    } catch {
      ok = false;
    }
  }
  if (!ok) {
    return finish(
      NextResponse.json(
        { error: "This request did not come from a Blockyard page (origin check failed)." },
        { status: 403, headers: { "Cache-Control": "no-store" } },
      ),
    );
  }
  return finish(NextResponse.next());
}

// Everything but Next's own static files (which carry no data and never redirect).
export const config = { matcher: ["/((?!_next/static|_next/image|favicon.ico).*)"] };
