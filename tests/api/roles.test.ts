import fs from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { API_POLICY, PAGE_POLICY, allows, type Access, type PageKey, type RouteKey } from "@/lib/auth/policy";
import { NAV, navFor } from "@/lib/nav";
import { ROLES, type Role } from "@/lib/roles";
import { client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeUser } from "../support/db";
import { EXAMPLES } from "./route-examples";

afterAll(closeTestDb);

const API_DIR = path.join(process.cwd(), "app", "api");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

/** Every route handler under app/api, found on disk, with the policy key each method declares. */
function discoverRoutes(): { file: string; route: string; method: string; key: string | null }[] {
  const out: { file: string; route: string; method: string; key: string | null }[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/^route\.(ts|tsx|js)$/.test(entry.name)) {
        const route = `/${path.relative(path.join(process.cwd(), "app"), path.dirname(full)).split(path.sep).join("/")}`;
        const text = fs.readFileSync(full, "utf8");
        for (const method of METHODS) {
          const exported = new RegExp(`export\\s+(const|async\\s+function|function)\\s+${method}\\b`).test(text);
          if (!exported) continue;
          const m = text.match(new RegExp(`export\\s+const\\s+${method}\\s*=\\s*api(?:<[^>]*>)?\\(\\s*"([^"]+)"`));
          out.push({ file: path.relative(process.cwd(), full), route, method, key: m?.[1] ?? null });
        }
      }
    }
  };
  walk(API_DIR);
  return out;
}

const routes = discoverRoutes();

describe("route discovery", () => {
  it("finds the route handlers", () => {
    expect(routes.length).toBeGreaterThanOrEqual(Object.keys(API_POLICY).length);
  });

  it.each(routes.map((r) => [`${r.method} ${r.route}`, r] as const))(
    "%s goes through the guarded api() wrapper with its own key",
    (_name, r) => {
      expect(r.key, `${r.file}: export const ${r.method} = api("${r.method} ${r.route}", …)`).toBe(
        `${r.method} ${r.route}`,
      );
      expect(API_POLICY).toHaveProperty([r.key!]);
    },
  );

  it("has no policy entry without a route", () => {
    const found = new Set(routes.map((r) => r.key));
    expect(Object.keys(API_POLICY).filter((k) => !found.has(k))).toEqual([]);
  });

  it("has a worked example for every route that changes data or takes a parameter", () => {
    const missing = routes
      .filter((r) => (r.method !== "GET" || r.route.includes("[")) && !EXAMPLES[r.key as RouteKey])
      .map((r) => r.key);
    expect(missing).toEqual([]);
  });
});

const APP_DIR = path.join(process.cwd(), "app");
/** Pages outside app/(shop), open to anyone: they do not go through the page guard. */
const PUBLIC_PAGES = ["/sign-in"];

/** Every page.tsx under app, found on disk: its path (route groups dropped) and its guard call. */
function discoverPages(): { file: string; page: string; shop: boolean; keys: string[] }[] {
  const out: { file: string; page: string; shop: boolean; keys: string[] }[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) {
        if (full !== path.join(APP_DIR, "api")) walk(full);
      } else if (/^page\.(tsx|ts|jsx|js)$/.test(entry.name)) {
        const segments = path.relative(APP_DIR, path.dirname(full)).split(path.sep).filter(Boolean);
        const page = `/${segments.filter((s) => !/^\(.+\)$/.test(s)).join("/")}`;
        const text = fs.readFileSync(full, "utf8");
        out.push({
          file: path.relative(process.cwd(), full),
          page,
          shop: segments[0] === "(shop)",
          keys: [...text.matchAll(/requirePage\(\s*"([^"]+)"\s*\)/g)].map((m) => m[1]!),
        });
      }
    }
  };
  walk(APP_DIR);
  return out;
}

const pages = discoverPages();
const shopPages = pages.filter((p) => p.shop);

describe("page discovery", () => {
  it("finds the pages", () => {
    expect(shopPages.length).toBeGreaterThanOrEqual(Object.keys(PAGE_POLICY).length);
  });

  it.each(shopPages.map((p) => [p.page, p] as const))("%s goes through the page guard with its own key", (_name, p) => {
    expect(p.keys, `${p.file}: const user = await requirePage("${p.page}")`).toEqual([p.page]);
    expect(PAGE_POLICY).toHaveProperty([p.page]);
  });

  it("has a page for every page policy entry", () => {
    const found = new Set(shopPages.map((p) => p.page));
    expect(Object.keys(PAGE_POLICY).filter((k) => !found.has(k))).toEqual([]);
  });

  it("leaves only the known public pages outside app/(shop)", () => {
    expect(pages.filter((p) => !p.shop).map((p) => p.page)).toEqual(PUBLIC_PAGES);
    for (const page of PUBLIC_PAGES) expect(PAGE_POLICY).not.toHaveProperty([page]);
  });
});

describe("navigation follows the page policy", () => {
  it("links only to pages in the table, each once, with no role list of its own", () => {
    for (const item of NAV) {
      expect(PAGE_POLICY, item.href).toHaveProperty([item.href]);
      expect(Object.keys(item).sort(), item.href).toEqual(["href", "label"]);
    }
    expect(new Set(NAV.map((n) => n.href)).size).toBe(NAV.length);
  });

  it.each(ROLES.map((r) => [r] as const))("%s sees exactly the menu pages the table lets them open", (role) => {
    const opens = (key: PageKey) => allows(PAGE_POLICY[key], [role]);
    expect(navFor([role]).map((n) => n.href)).toEqual(NAV.filter((n) => opens(n.href)).map((n) => n.href));
  });

  it("gives someone with two roles the union of their menus, in menu order", () => {
    const both = navFor(["buyer", "cutter"]).map((n) => n.href);
    const either = new Set([...navFor(["buyer"]), ...navFor(["cutter"])].map((n) => n.href));
    expect(both).toEqual(NAV.map((n) => n.href).filter((h) => either.has(h)));
  });
});

async function callAs(key: RouteKey, caller: Role | "anonymous") {
  const [method, pattern] = key.split(" ") as [string, string];
  // The caller first, so an example can make a record of theirs (a defect zone they flagged).
  const u = caller === "anonymous" ? null : await makeUser([caller]);
  const example =
    (await EXAMPLES[key]?.({
      makeUser,
      password: TEST_PASSWORD,
      ...(u && caller !== "anonymous" ? { caller: { id: u.id, roles: [caller] } } : {}),
    })) ?? {};
  const url =
    pattern.replace(/\[(\w+)\]/g, (_, p: string) => encodeURIComponent(example.params?.[p] ?? "missing")) +
    (example.query ? `?${example.query}` : "");
  const c = client();
  if (u) await c.signIn(u.email, TEST_PASSWORD);
  let req = c.call(method.toLowerCase() as "get", url);
  if (example.contentType) req = req.set("content-type", example.contentType);
  for (const f of example.files ?? [])
    req = req.attach(f.field, f.content, { filename: f.name, contentType: f.contentType });
  const res = example.body !== undefined ? await req.send(example.body as object) : await req;
  return { res, example };
}

describe("role matrix: anonymous → 401, a role without access → 403, a permitted role → success", () => {
  const cases: [string, RouteKey, Role | "anonymous", Access][] = [];
  for (const key of Object.keys(API_POLICY) as RouteKey[]) {
    const access: Access = API_POLICY[key];
    cases.push([`${key} as anonymous`, key, "anonymous", access]);
    for (const role of ROLES) cases.push([`${key} as ${role}`, key, role, access]);
  }

  it.each(cases)("%s", async (_name, key, caller, access) => {
    const { res, example } = await callAs(key, caller);
    const permitted = access === "public" || (caller !== "anonymous" && allows(access, [caller]));
    if (caller === "anonymous" && access !== "public") {
      expect(res.status, JSON.stringify(res.body)).toBe(401);
    } else if (!permitted) {
      expect(res.status, JSON.stringify(res.body)).toBe(403);
    } else if (example.expect) {
      expect(res.status, JSON.stringify(res.body)).toBe(example.expect);
    } else {
      expect(res.status, JSON.stringify(res.body)).toBeGreaterThanOrEqual(200);
      expect(res.status, JSON.stringify(res.body)).toBeLessThan(300);
    }
  });
});
