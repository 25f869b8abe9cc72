import "server-only";
import { cache } from "react";
import { cookies, headers } from "next/headers";
import { env } from "@/lib/env";
import { lucia } from "./lucia";
import { isRole, type Role } from "@/lib/roles";

export interface CurrentUser {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  mustChangePassword: boolean;
  displayUnits: "mm" | "in" | null;
}

export type SessionResult = { user: CurrentUser; sessionId: string } | { user: null; sessionId: null };

/** The signed-in user of this request, checked once per request (React cache). */
export const getCurrentSession = cache(async (): Promise<SessionResult> => {
  const jar = await cookies();
  const id = jar.get(lucia().sessionCookieName)?.value ?? null;
  if (!id) return { user: null, sessionId: null };
  const { session, user } = await lucia().validateSession(id);
  if (!session || !user) {
    await trySet(jar, lucia().createBlankSessionCookie());
    return { user: null, sessionId: null };
  }
  if (!user.active) {
    await lucia().invalidateSession(session.id);
    await trySet(jar, lucia().createBlankSessionCookie());
    return { user: null, sessionId: null };
  }
  if (session.fresh) await trySet(jar, lucia().createSessionCookie(session.id));
  return {
    user: {
      id: user.id,
      email: user.email,
      name: user.name,
      roles: user.roles.filter(isRole),
      mustChangePassword: user.mustChangePassword,
      displayUnits: user.displayUnits,
    },
    sessionId: session.id,
  };
});

type Jar = Awaited<ReturnType<typeof cookies>>;
type LuciaCookie = ReturnType<ReturnType<typeof lucia>["createBlankSessionCookie"]>;

// Server components may not set cookies; route handlers and actions may. Refreshing is best-effort.
async function trySet(jar: Jar, c: LuciaCookie) {
  const secure = await servedOverHttps();
  try {
    jar.set(c.name, c.value, { ...c.attributes, secure });
  } catch {
    /* rendering a server component */
  }
}

/** Opens a new session for a user and sets its cookie (route handlers and actions only). */
export async function startSession(userId: string): Promise<void> {
  const jar = await cookies();
  const old = jar.get(lucia().sessionCookieName)?.value;
  if (old) await lucia().invalidateSession(old); // never reuse a session across sign-ins
  const session = await lucia().createSession(userId, {});
  const c = lucia().createSessionCookie(session.id);
  jar.set(c.name, c.value, { ...c.attributes, secure: await servedOverHttps() });
}

export async function endSession(): Promise<void> {
  const jar = await cookies();
  const id = jar.get(lucia().sessionCookieName)?.value;
  if (id) await lucia().invalidateSession(id);
  const c = lucia().createBlankSessionCookie();
  jar.set(c.name, c.value, { ...c.attributes, secure: await servedOverHttps() });
}

/**
 * Secure cookies when the request came over https (directly or through a proxy that says so),
 * or when COOKIE_SECURE=true forces it. Plain http on localhost (tests, the demo) gets none.
 */
async function servedOverHttps(): Promise<boolean> {
  const forced = env().COOKIE_SECURE;
  if (forced !== undefined) return forced;
  const h = await headers();
  return (h.get("x-forwarded-proto") ?? "").split(",")[0]?.trim() === "https";
}
