import { PAGE_POLICY, allows, type PageKey } from "@/lib/auth/policy";
import type { Role } from "@/lib/roles";

export interface NavItem {
  href: PageKey;
  label: string;
}

/**
 * The menu, in order. Who sees an entry is not written here: it is whoever PAGE_POLICY admits to
 * the page, so the menu never offers a page that refuses its reader, nor hides one that admits them.
 */
export const NAV: readonly NavItem[] = [
  { href: "/", label: "Today" },
  { href: "/stock", label: "Stock" },
  { href: "/plans", label: "Plans" },
  { href: "/jobs", label: "Jobs" },
  { href: "/library", label: "Part library" },
  { href: "/defects/new", label: "Flag a defect" },
  { href: "/labels", label: "Labels" },
  { href: "/deliveries/new", label: "Receive a delivery" },
  { href: "/deliveries", label: "Deliveries" },
  { href: "/stock/import", label: "CSV import" },
  { href: "/stock/count", label: "Stock count" },
  { href: "/ledger", label: "Stock ledger" },
  { href: "/grades", label: "Grades" },
  { href: "/suppliers", label: "Suppliers" },
  { href: "/purchasing", label: "Reorder list" },
  { href: "/purchasing/orders", label: "Purchase orders" },
  { href: "/claims", label: "Supplier claims" },
  { href: "/reports", label: "Reports" },
  { href: "/admin/users", label: "People" },
  { href: "/admin/settings", label: "Shop settings" },
  { href: "/machines", label: "Machines" },
  { href: "/admin/outbox", label: "Outbox" },
  { href: "/safety", label: "Safety" },
];

export function navFor(roles: readonly Role[]): NavItem[] {
  return NAV.filter((n) => allows(PAGE_POLICY[n.href], roles));
}
