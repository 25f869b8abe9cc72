import "server-only";
import { headers } from "next/headers";
import { findUserForSignIn } from "@/db/queries/users";
import { HttpError } from "@/lib/errors";
import { env } from "@/lib/env";
import { dummyHash, verifyPassword } from "./password";
import { checkThrottle, clearFailures, recordFailure } from "./throttle";
import { startSession } from "./session";

export const SIGN_IN_FAILED = "That e-mail and password do not match an active account.";

/** The client address used for throttling: the proxy's X-Forwarded-For only when we trust it. */
export async function clientAddress(): Promise<string> {
  if (!env().TRUST_PROXY) return "direct";
  const h = await headers();
  const fwd = h.get("x-forwarded-for")?.split(",")[0]?.trim();
  return (fwd || h.get("x-real-ip") || "direct").slice(0, 64);
}

/**
 * Checks the throttle, then the password; opens a new session on success. Every failure —
 * unknown e-mail, wrong password, deactivated account — gets the same message.
 */
export async function signIn(emailRaw: string, password: string): Promise<string> {
  const account = emailRaw.trim().toLowerCase().slice(0, 320);
  const client = await clientAddress();
  await checkThrottle(account, client);
  const user = account ? await findUserForSignIn(account) : undefined;
  const ok = user
    ? await verifyPassword(user.password_hash, password)
    : (await verifyPassword(await dummyHash(), password), false);
  if (!user || !ok || !user.active) {
    await recordFailure(account, client);
    throw new HttpError(401, SIGN_IN_FAILED);
  }
  await clearFailures(account);
  await startSession(user.id);
  return user.id;
}
