import type { RouteKey } from "@/lib/auth/policy";
import type { Role } from "@/lib/roles";

export interface ExampleCtx {
  /** A throwaway user, for routes that act on a user. */
  makeUser(roles: Role[]): Promise<{ id: string; email: string }>;
  /** The signed-in caller's password (each matrix check signs in a fresh user). */
  password: string;
}

export interface Example {
  params?: Record<string, string>;
  body?: unknown;
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
};
