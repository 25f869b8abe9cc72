import { api, readJson } from "@/lib/auth/guard";
import { countActiveAdmins, getUser, updateUser } from "@/db/queries/users";
import { updateUserSchema } from "@/lib/validations/users";
import { HttpError, notFound } from "@/lib/errors";

type P = { userId: string };

export const GET = api<P>("GET /api/admin/users/[userId]", async ({ params }) => {
  const user = await getUser(params.userId);
  if (!user) throw notFound("That user");
  return { user };
});

export const PATCH = api<P>("PATCH /api/admin/users/[userId]", async ({ req, params, user: actor }) => {
  const patch = await readJson(req, updateUserSchema);
  const target = await getUser(params.userId);
  if (!target) throw notFound("That user");
  // The shop must keep at least one active admin, or nobody can manage users again.
  const losesAdmin =
    target.roles.includes("admin") &&
    target.active &&
    (patch.active === false || (patch.roles && !patch.roles.includes("admin")));
  if (losesAdmin && (await countActiveAdmins(target.id)) === 0) {
    throw new HttpError(409, "Blockyard needs at least one active admin. Give another user the admin role first.");
  }
  await updateUser(target.id, patch, actor.id);
  return { user: await getUser(target.id) };
});
