import { NextResponse, type NextRequest } from "next/server";

const MUTATIONS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * Cross-site request forgery guard for the JSON API: a mutation must come from this site's own
 * pages (its Origin, or failing that its Referer, matches the Host). Sessions and roles are
 * checked in each handler, not here. Server actions get Next's own origin check.
 */
export function proxy(request: NextRequest) {
  if (!MUTATIONS.has(request.method)) return NextResponse.next();
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
    return NextResponse.json(
      { error: "This request did not come from a Blockyard page (origin check failed)." },
      { status: 403 },
    );
  }
  return NextResponse.next();
}

export const config = { matcher: ["/api/:path*"] };
