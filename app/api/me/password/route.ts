import { api, readJson } from "@/lib/auth/guard";
import { changePasswordSchema } from "@/lib/validations/users";
import { changeOwnPassword } from "@/lib/auth/account";

export const POST = api("POST /api/me/password", async ({ req, user }) => {
  const input = await readJson(req, changePasswordSchema);
  await changeOwnPassword(user, input.currentPassword, input.newPassword);
  return { ok: true };
});
