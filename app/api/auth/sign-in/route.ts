import { api, readJson } from "@/lib/auth/guard";
import { signIn } from "@/lib/auth/sign-in";
import { signInSchema } from "@/lib/validations/users";
import { getUser } from "@/db/queries/users";

export const POST = api("POST /api/auth/sign-in", async ({ req }) => {
  const { email, password } = await readJson(req, signInSchema);
  const id = await signIn(email, password);
  const user = await getUser(id);
  return {
    user: user && {
      id: user.id,
      email: user.email,
      name: user.name,
      roles: user.roles,
      mustChangePassword: user.mustChangePassword,
    },
  };
});
