import type { Role } from "@/lib/roles";

export interface NavItem {
  href: string;
  label: string;
  /** Who sees it; undefined: everyone signed in. Pages still check roles on the server. */
  roles?: Role[];
}

export const NAV: NavItem[] = [
  { href: "/", label: "Today" },
  { href: "/admin/users", label: "People", roles: ["admin"] },
  { href: "/admin/settings", label: "Shop settings", roles: ["admin"] },
];

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV.filter((n) => !n.roles || roles.includes("admin") || n.roles.some((r) => roles.includes(r)));
}
