import type { Role } from "@/lib/roles";

/**
 * Who may call which API route: the one table the server enforces and the role test reads.
 * "public": anyone; "signed-in": any role; a role list: those roles (admin may always call).
 * Keys are "METHOD /api/path" with [param] segments as in the app folder.
 */
export type Access = "public" | "signed-in" | readonly Role[];

export const API_POLICY = {
  "GET /api/health": "public",
  "POST /api/auth/sign-in": "public",
  "POST /api/auth/sign-out": "signed-in",
  "GET /api/me": "signed-in",
  "POST /api/me/password": "signed-in",
  "GET /api/settings": "signed-in",
  "PUT /api/settings": ["admin"],
  "GET /api/admin/users": ["admin"],
  "POST /api/admin/users": ["admin"],
  "GET /api/admin/users/[userId]": ["admin"],
  "PATCH /api/admin/users/[userId]": ["admin"],
  "POST /api/admin/users/[userId]/password": ["admin"],

  // Stock register: the buyer receives and corrects; the cutter flags defects and moves blocks;
  // planner and manager read.
  "GET /api/grades": "signed-in",
  "POST /api/grades": ["buyer"],
  "GET /api/grades/[gradeId]": "signed-in",
  "PUT /api/grades/[gradeId]": ["buyer"],
  "GET /api/suppliers": "signed-in",
  "POST /api/suppliers": ["buyer"],
  "GET /api/suppliers/[supplierId]": "signed-in",
  "PUT /api/suppliers/[supplierId]": ["buyer"],
  "GET /api/deliveries": ["buyer", "planner", "manager"],
  "POST /api/deliveries": ["buyer"],
  "GET /api/deliveries/[deliveryId]": ["buyer", "planner", "manager"],
  "GET /api/deliveries/export": ["buyer", "planner", "manager"],
  "GET /api/blocks": "signed-in",
  "GET /api/blocks/export": ["buyer", "planner", "manager"],
  "GET /api/blocks/[blockId]": "signed-in",
  "PATCH /api/blocks/[blockId]": ["buyer", "cutter"],
  "POST /api/blocks/[blockId]/scrap": ["buyer"],
  "POST /api/blocks/[blockId]/adjust": ["buyer"],
  // A suspect block is held out of usable stock by the buyer or the cutter who finds it wet or
  // damaged; only the buyer, who deals with the supplier, releases it.
  "POST /api/blocks/[blockId]/hold": ["buyer", "cutter"],
  "POST /api/blocks/[blockId]/release": ["buyer"],
  "GET /api/blocks/[blockId]/defects": "signed-in",
  "POST /api/blocks/[blockId]/defects": ["cutter"],
  "POST /api/defects/[defectId]/photos": ["cutter"],
  // Correcting or taking back a zone: the cutter who flagged it or a planner (the handler narrows
  // cutters to their own zones).
  "PATCH /api/defects/[defectId]": ["cutter", "planner"],
  "DELETE /api/defects/[defectId]": ["cutter", "planner"],
  "GET /api/photos/[photoId]": "signed-in",
  "GET /api/ledger": ["buyer", "planner", "manager"],
  "GET /api/ledger/export": ["buyer", "planner", "manager"],
  "POST /api/imports/deliveries": ["buyer"],
  "POST /api/imports/stock-counts": ["buyer"],
  // A count by scanning labels on the tablet: the buyer, who owns stock counts and write-offs.
  "GET /api/stock-counts/check": ["buyer"],
  "POST /api/stock-counts": ["buyer"],

  // Purchasing: the buyer orders and receives; the manager reads. Reports: manager and planner
  // read. The outbox of sent mail: admin.
  "GET /api/reorder": ["buyer", "manager"],
  "PUT /api/reorder/settings": ["buyer"],
  "PUT /api/reorder/[gradeId]": ["buyer"],
  "POST /api/reorder/draft": ["buyer"],
  "POST /api/reorder/alert": ["buyer"],
  "GET /api/purchase-orders": ["buyer", "manager"],
  "POST /api/purchase-orders": ["buyer"],
  "GET /api/purchase-orders/[poId]": ["buyer", "manager"],
  "PUT /api/purchase-orders/[poId]": ["buyer"],
  "POST /api/purchase-orders/[poId]/send": ["buyer"],
  "POST /api/purchase-orders/[poId]/cancel": ["buyer"],
  "POST /api/purchase-orders/[poId]/close": ["buyer"],
  "POST /api/purchase-orders/[poId]/receive": ["buyer"],
  "GET /api/purchase-orders/[poId]/export": ["buyer", "manager"],
  "GET /api/reports/[report]": ["manager", "planner"],
  // Claims to suppliers (reason, blocks, photos, credit): the buyer makes and settles them; the
  // manager reads them (they feed the supplier quality report).
  "GET /api/claims": ["buyer", "manager"],
  "POST /api/claims": ["buyer"],
  "GET /api/claims/[claimId]": ["buyer", "manager"],
  "POST /api/claims/[claimId]/decide": ["buyer"],
  "POST /api/claims/[claimId]/photos": ["buyer"],
  "GET /api/claims/[claimId]/photos/[photoId]": ["buyer", "manager"],
  "GET /api/outbox": ["admin"],

  // Jobs and the part library: the planner writes; the cutter and the manager read.
  "GET /api/jobs": ["planner", "cutter", "manager"],
  "POST /api/jobs": ["planner"],
  "GET /api/jobs/[jobId]": ["planner", "cutter", "manager"],
  "PATCH /api/jobs/[jobId]": ["planner"],
  "POST /api/jobs/[jobId]/parts": ["planner"],
  "PATCH /api/jobs/[jobId]/parts/[partId]": ["planner"],
  "DELETE /api/jobs/[jobId]/parts/[partId]": ["planner"],
  "POST /api/jobs/[jobId]/parts/import": ["planner"],
  // A part's profile program and its drawing: for who plans and who cuts.
  "GET /api/jobs/[jobId]/parts/[partId]/program": ["planner", "cutter"],
  "GET /api/library": ["planner", "cutter", "manager"],
  "POST /api/library": ["planner"],
  "PATCH /api/library/[partId]": ["planner"],
  // A drawing, SVG path or text turned into profiles to look at before adding parts: stores nothing.
  "POST /api/profiles/import": ["planner"],

  // The shop's cutters: the admin and the planner keep them (kerf and feed per grade too).
  "GET /api/machines": "signed-in",
  "POST /api/machines": ["planner"],
  "GET /api/machines/[machineId]": "signed-in",
  "PUT /api/machines/[machineId]": ["planner"],
  "PUT /api/machines/[machineId]/grades": ["planner"],

  // Cut planning: the planner runs, approves and releases plans; the cutter records cuts.
  "GET /api/runs": "signed-in",
  "POST /api/runs": ["planner"],
  "GET /api/runs/candidates": ["planner"],
  "GET /api/runs/[runId]": "signed-in",
  "GET /api/runs/[runId]/plan": "signed-in",
  "POST /api/runs/[runId]/cancel": ["planner"],
  "POST /api/runs/[runId]/approve": ["planner"],
  "POST /api/runs/[runId]/release": ["planner"],
  "POST /api/runs/[runId]/replan": ["planner"],
  "POST /api/runs/[runId]/blocks/[blockId]/cut": ["cutter"],
  "POST /api/runs/[runId]/blocks/[blockId]/undo": ["cutter", "planner"],
  "GET /api/runs/[runId]/blocks/[blockId]/steps": "signed-in",
  "PUT /api/runs/[runId]/blocks/[blockId]/steps/[step]": ["cutter"],
  "GET /api/runs/[runId]/cut-list": "signed-in",
  "GET /api/runs/[runId]/gcode": ["cutter", "planner"],
  "GET /api/runs/[runId]/profile-programs": ["cutter", "planner"],
} as const satisfies Record<string, Access>;

export type RouteKey = keyof typeof API_POLICY;

/** The routes anyone may call; their handlers get `user: null`. Every other route's get the user. */
export type PublicRouteKey = {
  [K in RouteKey]: (typeof API_POLICY)[K] extends "public" ? K : never;
}[RouteKey];
export type GuardedRouteKey = Exclude<RouteKey, PublicRouteKey>;

/**
 * Who may open which page under app/(shop): the one table the page guard (requirePage), the shop
 * layout, the navigation (lib/nav.ts) and the role test read. Keys are the page's path with
 * [param] segments as in the app folder. "public" pages open without signing in too (in a plain
 * frame without the menu); every other page is for someone signed in (sign-in itself lives
 * outside (shop)). A page admits the roles that may read what it shows; buttons that change data
 * follow API_POLICY.
 */
export type PageAccess = Access;

export const PAGE_POLICY = {
  "/": "signed-in",
  "/account": "signed-in",
  // Cautions belong on the shop wall and with anyone at the machine, signed in or not.
  "/safety": "public",

  // Stock: everyone reads the register and prints labels (the buyer for new deliveries, the
  // cutter for offcuts, planner and manager to reprint); the buyer receives and keeps lists.
  "/stock": "signed-in",
  "/stock/[code]": "signed-in",
  "/labels": "signed-in",
  "/stock/import": ["buyer"],
  "/stock/count": ["buyer"],
  "/deliveries": ["buyer", "planner", "manager"],
  "/deliveries/new": ["buyer"],
  "/ledger": ["buyer", "planner", "manager"],
  "/grades": ["buyer"],
  "/suppliers": ["buyer"],
  "/defects/new": ["cutter"],

  // Purchasing and reports.
  "/purchasing": ["buyer", "manager"],
  "/purchasing/orders": ["buyer", "manager"],
  "/purchasing/orders/new": ["buyer"],
  "/purchasing/orders/[poId]": ["buyer", "manager"],
  "/purchasing/orders/[poId]/receive": ["buyer"],
  "/claims": ["buyer", "manager"],
  "/reports": ["manager", "planner"],

  // Jobs, parts, machines and cut plans. One plan and its cut sheet open for anyone signed in,
  // as GET /api/runs/[runId] and its cut list do; the list of plans, the planner's new-plan page
  // and the cutter's station are for their roles.
  "/jobs": ["planner", "cutter", "manager"],
  "/jobs/[jobId]": ["planner", "cutter", "manager"],
  "/library": ["planner", "cutter", "manager"],
  "/machines": ["planner", "cutter"],
  "/plans": ["planner", "cutter", "manager"],
  "/plans/new": ["planner"],
  "/plans/[runId]": "signed-in",
  "/plans/[runId]/sheet": "signed-in",
  "/plans/[runId]/cut": ["cutter"],

  "/admin/users": ["admin"],
  "/admin/settings": ["admin"],
  "/admin/outbox": ["admin"],
} as const satisfies Record<string, PageAccess>;

export type PageKey = keyof typeof PAGE_POLICY;

/** The pages anyone may open; their guard gives `null` for someone signed out. */
export type PublicPageKey = {
  [K in PageKey]: (typeof PAGE_POLICY)[K] extends "public" ? K : never;
}[PageKey];
export type GuardedPageKey = Exclude<PageKey, PublicPageKey>;

/** Whether a path (as the browser asked for it, e.g. "/safety") is a public page in PAGE_POLICY. */
export function isPublicPage(path: string | null | undefined): boolean {
  if (!path) return false;
  const clean = path.length > 1 ? path.replace(/\/+$/, "") : path;
  return (Object.keys(PAGE_POLICY) as PageKey[]).some((key) => {
    if (PAGE_POLICY[key] !== "public") return false;
    const pattern = key.replace(/\[[^\]]+\]/g, "[^/]+");
    return new RegExp(`^${pattern}$`).test(clean);
  });
}

export function allows(access: Access, roles: readonly Role[]): boolean {
  if (access === "public" || access === "signed-in") return true;
  return roles.includes("admin") || roles.some((r) => access.includes(r));
}

/**
 * Who sees money (a block's cost, the stock's value, a plan's cost, the ledger's value): the roles
 * that buy, plan or answer for the stock — the same roles the exports admit (and the admin, as
 * everywhere). A cutter sees sizes, grades, counts and places, never prices. Pages ask seesMoney;
 * the API wrapper blanks the fields below in the answers of everyone else.
 */
export const MONEY: readonly Role[] = ["buyer", "planner", "manager"];

/** The readable routes whose answers carry money, and the names of the fields that hold it. */
export const MONEY_FIELDS: Partial<Record<RouteKey, readonly string[]>> = {
  "GET /api/blocks": ["cost", "value"],
  "GET /api/blocks/[blockId]": ["cost", "value"],
  "GET /api/runs": ["cost"],
  "GET /api/runs/[runId]": ["cost"],
  "GET /api/runs/[runId]/plan": ["cost", "value"],
};

export function seesMoney(roles: readonly Role[]): boolean {
  return allows(MONEY, roles);
}

/** A copy of `data` with every field named in `keys`, at any depth, set to null. */
export function withoutMoney<T>(data: T, keys: readonly string[]): T {
  const names = new Set(keys);
  const walk = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(walk);
    if (v && typeof v === "object" && Object.getPrototypeOf(v) === Object.prototype) {
      return Object.fromEntries(
        Object.entries(v as Record<string, unknown>).map(([k, x]) => [k, names.has(k) ? null : walk(x)]),
      );
    }
    return v;
  };
  return walk(data) as T;
}
