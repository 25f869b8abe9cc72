import type { Role } from "@/lib/roles";

/** A person as the admin pages and the API show them (never their password hash). */
export interface UserSummary {
  id: string;
  email: string;
  name: string;
  active: boolean;
  mustChangePassword: boolean;
  roles: Role[];
  createdAt: string;
}
