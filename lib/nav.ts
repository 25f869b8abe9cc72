import type { Role } from "@/lib/roles";

export interface NavItem {
  href: string;
  label: string;
  /** Who sees it; undefined: everyone signed in. Pages still check roles on the server. */
  roles?: Role[];
}

export const NAV: NavItem[] = [
  { href: "/", label: "Today" },
  { href: "/stock", label: "Stock" },
  { href: "/plans", label: "Plans", roles: ["planner", "cutter", "manager"] },
  { href: "/jobs", label: "Jobs", roles: ["planner", "cutter", "manager"] },
  { href: "/library", label: "Part library", roles: ["planner", "cutter", "manager"] },
  { href: "/defects/new", label: "Flag a defect", roles: ["cutter"] },
  { href: "/labels", label: "Labels", roles: ["cutter"] },
  { href: "/deliveries/new", label: "Receive a delivery", roles: ["buyer"] },
  { href: "/deliveries", label: "Deliveries", roles: ["buyer", "planner", "manager"] },
  { href: "/stock/import", label: "CSV import", roles: ["buyer"] },
  { href: "/ledger", label: "Stock ledger", roles: ["buyer", "planner", "manager"] },
  { href: "/grades", label: "Grades", roles: ["buyer"] },
  { href: "/suppliers", label: "Suppliers", roles: ["buyer"] },
  { href: "/purchasing", label: "Reorder list", roles: ["buyer", "manager"] },
  { href: "/purchasing/orders", label: "Purchase orders", roles: ["buyer", "manager"] },
  { href: "/reports", label: "Reports", roles: ["manager", "planner"] },
  { href: "/admin/users", label: "People", roles: ["admin"] },
  { href: "/admin/settings", label: "Shop settings", roles: ["admin"] },
  { href: "/machines", label: "Machines", roles: ["planner", "cutter"] },
  { href: "/admin/outbox", label: "Outbox", roles: ["admin"] },
  { href: "/safety", label: "Safety" },
];

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV.filter((n) => !n.roles || roles.includes("admin") || n.roles.some((r) => roles.includes(r)));
}
