import "server-only";
import { getPasswordHash, setPassword } from "@/db/queries/users";
import { HttpError } from "@/lib/errors";
import { hashPassword, verifyPassword } from "./password";
import { startSession, type CurrentUser } from "./session";

/** Checks the current password, sets the new one, ends every session and opens a fresh one here. */
export async function changeOwnPassword(user: CurrentUser, current: string, next: string): Promise<void> {
  const hashed = await getPasswordHash(user.id);
  if (!hashed || !(await verifyPassword(hashed, current))) {
    throw new HttpError(400, "Some fields need attention.", { currentPassword: "That is not your current password." });
  }
  if (current === next) {
    throw new HttpError(400, "Some fields need attention.", {
      newPassword: "Choose a password different from the current one.",
    });
  }
  await setPassword(user.id, await hashPassword(next), { temporary: false, actorId: user.id });
  await startSession(user.id);
}
