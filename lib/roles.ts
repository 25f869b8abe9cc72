/** The five roles of a foam shop. A user may hold several. Shared by server and client code. */
export const ROLES = ["admin", "buyer", "cutter", "planner", "manager"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  buyer: "Buyer",
  cutter: "Cutter",
  planner: "Planner",
  manager: "Manager",
};

export const ROLE_DUTIES: Record<Role, string> = {
  admin: "Users and shop settings",
  buyer: "Deliveries, suppliers and ordering",
  cutter: "Defects, cut sheets and offcut labels",
  planner: "Nesting parts into stock",
  manager: "Yield, losses and supplier quality",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
