import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createUser, emailTaken, getUser, listUsers } from "@/db/queries/users";
import { createUserSchema } from "@/lib/validations/users";
import { hashPassword } from "@/lib/auth/password";
import { HttpError } from "@/lib/errors";

export const GET = api("GET /api/admin/users", async () => ({ items: await listUsers() }));

export const POST = api("POST /api/admin/users", async ({ req, user }) => {
  const input = await readJson(req, createUserSchema);
  if (await emailTaken(input.email)) {
    throw new HttpError(409, "Some fields need attention.", { email: "A user with that e-mail already exists." });
  }
  const id = await createUser(
    { email: input.email, name: input.name, roles: input.roles, passwordHash: await hashPassword(input.password) },
    user.id,
  );
  return NextResponse.json({ user: await getUser(id) }, { status: 201 });
});
