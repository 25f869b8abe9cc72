import type { RouteKey } from "@/lib/auth/policy";
import type { Role } from "@/lib/roles";
import { makeJob, makeJobPart, makeLibraryPart } from "../support/job-fixtures";

export interface ExampleCtx {
  /** A throwaway user, for routes that act on a user. */
  makeUser(roles: Role[]): Promise<{ id: string; email: string }>;
  /** The signed-in caller's password (each matrix check signs in a fresh user). */
  password: string;
}

export interface Example {
  params?: Record<string, string>;
  /** Query string appended to the URL. */
  query?: string;
  body?: unknown;
  /** Content type of a raw (non-JSON) body. */
  contentType?: string;
  /** Status a permitted caller must get (default: 2xx). */
  expect?: number;
}

let n = 0;
const unique = () => `${Date.now().toString(36)}-${++n}`;

/**
 * A valid request for every route that needs more than a bare GET. The role matrix test fails
 * when a mutating route has no entry here, so a new route cannot slip past it.
 */
export const EXAMPLES: Partial<Record<RouteKey, (ctx: ExampleCtx) => Promise<Example>>> = {
  "POST /api/auth/sign-in": async (ctx) => {
    const u = await ctx.makeUser(["cutter"]);
    return { body: { email: u.email, password: ctx.password } };
  },
  "POST /api/auth/sign-out": async () => ({}),
  "POST /api/me/password": async (ctx) => ({ body: { currentPassword: ctx.password, newPassword: `changed-${unique()}` } }),
  "PUT /api/settings": async () => ({
    body: {
      shopName: "Hollowfield Foamworks",
      displayUnits: "mm",
      kerf: 1.5,
      trim: 6,
      defectMargin: 10,
      minOffcut: [150, 150, 25],
      layout: "guillotine",
      feedMmPerMin: 300,
      nestingTimeLimitMs: 3000,
    },
  }),
  "POST /api/admin/users": async () => ({
    body: { email: `new-${unique()}@test.blockyard.test`, name: "New Person", roles: ["cutter"], password: "temporary-pass-1" },
    expect: 201,
  }),
  "GET /api/admin/users/[userId]": async (ctx) => ({ params: { userId: (await ctx.makeUser(["buyer"])).id } }),
  "PATCH /api/admin/users/[userId]": async (ctx) => ({ params: { userId: (await ctx.makeUser(["buyer"])).id }, body: { roles: ["buyer", "planner"] } }),
  "POST /api/admin/users/[userId]/password": async (ctx) => ({
    params: { userId: (await ctx.makeUser(["buyer"])).id },
    body: { password: "temporary-pass-2" },
  }),
  // Jobs and the part library.
  "POST /api/jobs": async () => ({ body: { name: `Job ${unique()}`, customer: "Test customer", dueOn: "2026-12-24" }, expect: 201 }),
  "GET /api/jobs/[jobId]": async () => ({ params: { jobId: String(await makeJob()) } }),
  "PATCH /api/jobs/[jobId]": async () => ({ params: { jobId: String(await makeJob()) }, body: { dueOn: "2026-12-31" } }),
  "POST /api/jobs/[jobId]/parts": async () => ({ params: { jobId: String(await makeJob()) }, body: { name: "Rib", quantity: 4, size: [400, 120, 20] }, expect: 201 }),
  "PATCH /api/jobs/[jobId]/parts/[partId]": async () => {
    const jobId = await makeJob();
    return { params: { jobId: String(jobId), partId: String(await makeJobPart(jobId)) }, body: { quantity: 6 } };
  },
  "DELETE /api/jobs/[jobId]/parts/[partId]": async () => {
    const jobId = await makeJob();
    return { params: { jobId: String(jobId), partId: String(await makeJobPart(jobId)) } };
  },
  "POST /api/jobs/[jobId]/parts/import": async () => ({
    params: { jobId: String(await makeJob()) },
    query: "commit=0",
    contentType: "text/csv",
    body: "name,quantity,length_mm,width_mm,height_mm\nRib,4,400,120,20\n",
  }),
  "POST /api/library": async () => ({ body: { kit: "Test kit", name: `Former ${unique()}`, size: [200, 150, 10] }, expect: 201 }),
  "PATCH /api/library/[partId]": async () => ({ params: { partId: String(await makeLibraryPart()) }, body: { defaultQuantity: 3 } }),
};
