import "server-only";
import { getPasswordHash, setPassword } from "@/db/queries/users";
import { HttpError } from "@/lib/errors";
import { hashPassword, verifyPassword } from "./password";
import { startSession, type CurrentUser } from "./session";
import { clientAddress } from "./sign-in";
import { PASSWORD_CHANGE_MAX, beginAttempt, passwordChangeKey } from "./throttle";

/**
 * Checks the current password, sets the new one, ends every session and opens a fresh one here.
 * Wrong current passwords are throttled like sign-ins, so a borrowed session cannot guess it.
 */
export async function changeOwnPassword(user: CurrentUser, current: string, next: string): Promise<void> {
  const attempt = await beginAttempt(passwordChangeKey(user.id), await clientAddress(), {
    what: "password changes",
    accountMax: PASSWORD_CHANGE_MAX,
  });
  const hashed = await getPasswordHash(user.id);
  if (!hashed || !(await verifyPassword(hashed, current))) {
    throw new HttpError(400, "Some fields need attention.", { currentPassword: "That is not your current password." });
  }
  await attempt.succeeded();
  if (current === next) {
    throw new HttpError(400, "Some fields need attention.", {
      newPassword: "Choose a password different from the current one.",
    });
  }
  await setPassword(user.id, await hashPassword(next), { temporary: false, actorId: user.id });
  await startSession(user.id);
}
