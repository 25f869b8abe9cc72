import { z } from "zod";
import { ROLES } from "@/lib/roles";

export const passwordSchema = z
  .string({ error: "Enter a password." })
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.");

export const signInSchema = z.object({
  email: z.string({ error: "Enter your e-mail." }).max(320, "That e-mail is too long."),
  password: z.string({ error: "Enter your password." }).max(1000, "That password is too long."),
});

const roles = z
  .array(z.enum(ROLES, { error: `Choose from: ${ROLES.join(", ")}.` }), { error: "Choose at least one role." })
  .min(1, "Choose at least one role.")
  .transform((r) => [...new Set(r)]);

export const createUserSchema = z.object({
  email: z.email({ error: "Enter a valid e-mail address." }).max(320),
  name: z.string({ error: "Enter a name." }).trim().min(1, "Enter a name.").max(100, "Use at most 100 characters."),
  roles,
  password: passwordSchema,
});

export const updateUserSchema = z
  .object({
    name: z.string().trim().min(1, "Enter a name.").max(100, "Use at most 100 characters.").optional(),
    roles: roles.optional(),
    active: z.boolean({ error: "Must be true or false." }).optional(),
  })
  .strict();

export const temporaryPasswordSchema = z.object({ password: passwordSchema });

export const changePasswordSchema = z.object({
  currentPassword: z.string({ error: "Enter your current password." }).min(1, "Enter your current password.").max(1000),
  newPassword: passwordSchema,
});
