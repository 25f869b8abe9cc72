import "server-only";
import { headers } from "next/headers";
import { findUserForSignIn } from "@/db/queries/users";
import { HttpError } from "@/lib/errors";
import { dummyHash, verifyPassword } from "./password";
import { beginAttempt } from "./throttle";
import { startSession } from "./session";

export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";

/**
 * The client address used for throttling. Next puts the socket's address in X-Forwarded-For when
 * a request arrives without one. Behind our own proxy (TRUST_PROXY) the LAST entry is the one that
 * proxy appended — the address it saw; everything before it is whatever the client sent, so never
 * the first entry. Without TRUST_PROXY a header the client sent itself is not ours to trust: the
 * last entry is still used (it is the socket address unless forged; the server can drop a
 * client-sent header before Next sees it), and the per-account slow-down in throttle.ts does not
 * depend on it. Never one shared key for every client: that let 30 failures lock everyone out.
 */
export async function clientAddress(): Promise<string> {
  const h = await headers();
  const hops = (h.get("x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  return (hops.at(-1) ?? "unknown").toLowerCase().slice(0, 64);
}

/**
 * Checks the throttle, then the password; opens a new session on success. Every failure —
 * unknown e-mail, wrong password, deactivated account — gets the same message.
 */
export async function signIn(emailRaw: string, password: string): Promise<string> {
  const account = emailRaw.trim().toLowerCase().slice(0, 320);
  const attempt = await beginAttempt(account, await clientAddress());
  const user = account ? await findUserForSignIn(account) : undefined;
  const ok = user
    ? await verifyPassword(user.password_hash, password)
    : (await verifyPassword(await dummyHash(), password), false);
  if (!user || !ok || !user.active) throw new HttpError(401, SIGN_IN_FAILED);
  await attempt.succeeded();
  await startSession(user.id);
  return user.id;
}
