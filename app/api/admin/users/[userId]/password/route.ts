import { api, readJson } from "@/lib/auth/guard";
import { getUser, setPassword } from "@/db/queries/users";
import { temporaryPasswordSchema } from "@/lib/validations/users";
import { hashPassword } from "@/lib/auth/password";
import { notFound } from "@/lib/errors";

type P = { userId: string };

/** Sets a temporary password: the user's sessions end and they must choose a new one at next sign-in. */
export const POST = api<P>("POST /api/admin/users/[userId]/password", async ({ req, params, user: actor }) => {
  const { password } = await readJson(req, temporaryPasswordSchema);
  const target = await getUser(params.userId);
  if (!target) throw notFound("That user");
  await setPassword(target.id, await hashPassword(password), { temporary: true, actorId: actor.id });
  return { ok: true };
});
