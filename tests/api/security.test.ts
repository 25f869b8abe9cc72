import { execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { API_POLICY, type RouteKey } from "@/lib/auth/policy";
import { BASE_URL, client, demoEmail, type Client } from "../support/http";
import { closeTestDb, makeBlock, testDb } from "../support/db";
import { diff, fingerprint } from "../support/fingerprint";

/**
 * What auth.test.ts and photos.test.ts do not already cover: headers on pages as well as the API,
 * the origin check on every mutating route, path traversal, SQL built only with bindings, no
 * secrets in the repository, and who-changed-what records.
 */

afterAll(closeTestDb);

let admin: Client;
let buyer: Client;
beforeAll(async () => {
  admin = client();
  await admin.signIn(demoEmail("admin"));
  buyer = client();
  await buyer.signIn(demoEmail("buyer"));
});

const MUTATING = (Object.keys(API_POLICY) as RouteKey[]).filter((k) => !k.startsWith("GET "));

describe("security headers", () => {
  it.each(["/sign-in", "/", "/stock", "/api/health", "/api/me", "/api/blocks?page=abc", "/no-such-page"])(
    "%s carries CSP with frame-ancestors, a referrer policy and nosniff",
    async (url) => {
      const res = await client().get(url).redirects(0);
      expect(res.headers["content-security-policy"]).toMatch(/frame-ancestors 'none'/);
      expect(res.headers["content-security-policy"]).toMatch(/default-src 'self'/);
      expect(res.headers["content-security-policy"]).toMatch(/object-src 'none'/);
      expect(res.headers["referrer-policy"]).toBe("same-origin");
      expect(res.headers["x-content-type-options"]).toBe("nosniff");
      expect(res.headers["x-frame-options"]).toBe("DENY");
      expect(res.headers["x-powered-by"]).toBeUndefined();
    },
  );

  it("sends the headers on a signed-in page too", async () => {
    const res = await admin.get("/stock").redirects(0);
    expect(res.status).toBe(200);
    expect(res.headers["content-security-policy"]).toMatch(/frame-ancestors 'none'/);
  });
});

describe("caching and transport", () => {
  it.each([
    ["a signed-in read", () => admin.get("/api/me"), 200],
    ["a public read", () => client().get("/api/health"), 200],
    ["a refusal without a session", () => client().get("/api/blocks"), 401],
    ["a missing record", () => admin.get("/api/grades/999999"), 404],
    ["bad input", () => admin.post("/api/grades", {}), 400],
    ["a failed origin check", () => client({ origin: null }).post("/api/grades", {}), 403],
    ["a CSV export", () => buyer.get("/api/blocks/export"), 200],
  ] as const)("%s answers with Cache-Control: no-store", async (_what, call, status) => {
    const res = await call();
    expect(res.status).toBe(status);
    expect(res.headers["cache-control"]).toMatch(/no-store/);
  });

  it("sends Strict-Transport-Security when served over https, and not over plain http", async () => {
    for (const url of ["/api/health", "/sign-in"]) {
      const https = await client().get(url).set("X-Forwarded-Proto", "https").redirects(0);
      expect(https.headers["strict-transport-security"], url).toMatch(/max-age=\d{7,}/);
      const plain = await client().get(url).redirects(0);
      expect(plain.headers["strict-transport-security"], url).toBeUndefined();
    }
  });

  it("answers an id out of range with 404, not a database complaint", async () => {
    for (const id of ["99999999999", "2147483648", "9223372036854775808"]) {
      const res = await admin.get(`/api/grades/${id}`);
      expect(res.status, id).toBe(404);
      expect(res.body.error).toBe("That grade was not found.");
    }
  });
});

describe("origin check on every mutating route", () => {
  const cases = MUTATING.flatMap((key) => [
    [key, "no Origin or Referer", null] as const,
    [key, "a foreign Origin", "https://evil.example"] as const,
    [key, "Origin: null (sandboxed frame)", "null"] as const,
    [key, "a lookalike host", `${BASE_URL}.evil.example`] as const,
  ]);

  let before: Record<string, string>;
  beforeAll(async () => {
    before = await fingerprint();
  });

  it.each(cases)("%s with %s → 403", async (key, _what, origin) => {
    const [method, pattern] = key.split(" ") as [string, string];
    const url = pattern.replace(/\[(\w+)\]/g, "1");
    // Signed in as admin: only the origin check can refuse.
    let req = admin.agent[method.toLowerCase() as "post"](url).set("X-Forwarded-For", "10.77.0.1");
    if (origin) req = req.set("Origin", origin);
    const res = await req.set("Content-Type", "application/json").send("{}");
    expect(res.status, JSON.stringify(res.body)).toBe(403);
    expect(res.body.error).toMatch(/origin/i);
  });

  it("a foreign Referer without Origin is refused too", async () => {
    const res = await admin.agent.post("/api/grades").set("Referer", "https://evil.example/page").send({});
    expect(res.status).toBe(403);
  });

  it("none of the refused requests changed anything", async () => {
    expect(diff(before, await fingerprint())).toEqual([]);
  });
});

describe("no path traversal when serving files", () => {
  it.each([
    "/api/photos/..%2F..%2Fetc%2Fpasswd",
    "/api/photos/%2e%2e%2f%2e%2e%2fetc%2fpasswd",
    "/api/photos/..%252F..%252Fetc%252Fpasswd",
    "/api/photos/1%00.jpg",
    "/api/photos/..%5C..%5Cwindows%5Cwin.ini",
    "/api/photos/1?size=..%2F..%2Fetc%2Fpasswd",
    "/api/photos/%2Fetc%2Fpasswd",
  ])("%s gives no file", async (url) => {
    const res = await admin.get(url);
    expect([400, 404]).toContain(res.status);
    expect(res.text).not.toMatch(/root:.*:0:0:|\[fonts\]/);
    expect(res.headers["content-type"]).toMatch(/json/);
  });

  it("static paths do not climb out either", async () => {
    for (const url of [
      "/_next/static/..%2F..%2F..%2Fpackage.json",
      "/_next/static/%2e%2e/%2e%2e/%2e%2e/package.json",
      "/..%2F..%2Fpackage.json",
      "/public/..%2Fpackage.json",
    ]) {
      const res = await client().get(url);
      expect(res.status, url).toBeGreaterThanOrEqual(400);
      expect(res.text, url).not.toMatch(/"name":\s*"blockyard"/);
    }
  });
});

// ---- source checks ----

const ROOT = process.cwd();

function sourceFiles(dirs: string[]): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    if (!fs.existsSync(dir)) return;
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, e.name);
      if (e.isDirectory()) walk(full);
      else if (/\.(ts|tsx|mts|js|mjs)$/.test(e.name)) out.push(full);
    }
  };
  dirs.forEach((d) => walk(path.join(ROOT, d)));
  return out;
}

/** The first argument of a Knex raw call, as written (up to its end, across lines). */
function firstArgument(text: string, start: number): string {
  let i = start;
  while (/\s/.test(text[i] ?? "")) i++;
  const q = text[i];
  if (q === "`" || q === '"' || q === "'") {
    let j = i + 1;
    while (j < text.length && text[j] !== q) j += text[j] === "\\" ? 2 : 1;
    let k = j + 1;
    while (/\s/.test(text[k] ?? "")) k++;
    // A literal followed by `+` is string building, whatever comes next.
    return text.slice(i, text[k] === "+" ? k + 1 : j + 1);
  }
  const m = /^[\w$.]+(\([^)]*\))?/.exec(text.slice(i));
  return m ? m[0] : text.slice(i, i + 40);
}

/**
 * SQL text handed to Knex that is built from values (template interpolation, concatenation or a
 * variable) instead of `?` bindings. Allowed: the few cases below, each an identifier or a
 * fragment from a constant in the same file, never a value from a request.
 */
const ALLOWED_DYNAMIC_SQL: { file: string; sql: string; why: string }[] = [
  {
    file: "db/migrations/20261201000100_foundation.ts",
    sql: "`ALTER TABLE user_roles ADD CONSTRAINT user_roles_role CHECK (role IN (${ROLES.map((r) => `",
    why: "DDL from the constant role list",
  },
  {
    file: "db/queries/blocks.ts",
    sql: "`${col}::text AS sort_key`",
    why: "the sort column comes from that file's SORT_COLUMNS constant (the request picks a key of an enum)",
  },
  {
    file: "db/queries/blocks.ts",
    sql: '`(${col}, b.id) ${dir === "asc" ? ">" : "<"} (CAST(? AS ${SORT_TYPES[f.sort]}), ?)`',
    why: "column and SQL type from that file's constants, the operator from the sort direction; the cursor's values are bound",
  },
  {
    file: "db/queries/reports.ts",
    sql: "`${column} >= ?::date AND ${column} < ?::date + 1`",
    why: "column names are constants of that file; the dates are bound",
  },
  { file: "db/queries/reports.ts", sql: 'inPeriod(k, "pb.cut_at", p)', why: "a Knex.Raw built with bindings above" },
  { file: "db/queries/reports.ts", sql: 'inPeriod(k, "created_at", p)', why: "a Knex.Raw built with bindings above" },
  {
    file: "db/queries/reports.ts",
    sql: 'inPeriod(k, "d.received_on", p)',
    why: "a Knex.Raw built with bindings above",
  },
  {
    file: "db/queries/reports.ts",
    sql: 'inPeriod(k, "c.created_at", p)',
    why: "a Knex.Raw built with bindings above",
  },
];

describe("SQL only through Knex bindings", () => {
  it("no raw SQL in app/, lib/ or db/ is built by interpolating or concatenating values", () => {
    const offenders: string[] = [];
    for (const file of sourceFiles(["app", "lib", "db", "components"])) {
      const rel = path.relative(ROOT, file).split(path.sep).join("/");
      const text = fs.readFileSync(file, "utf8");
      const re =
        /\.(raw|whereRaw|orWhereRaw|andWhereRaw|havingRaw|orHavingRaw|orderByRaw|groupByRaw|joinRaw|fromRaw|onRaw|andOnRaw|orOnRaw|selectRaw)\s*\(/g;
      for (let m: RegExpExecArray | null; (m = re.exec(text)); ) {
        const arg = firstArgument(text, m.index + m[0].length);
        const dynamic = (arg.startsWith("`") && arg.includes("${")) || arg.endsWith("+") || !/^[`"']/.test(arg);
        if (!dynamic) continue;
        if (ALLOWED_DYNAMIC_SQL.some((a) => a.file === rel && a.sql === arg)) continue;
        const line = text.slice(0, m.index).split("\n").length;
        offenders.push(`${rel}:${line}: ${m[1]}(${arg.slice(0, 100)}`);
      }
    }
    expect(offenders).toEqual([]);
  });

  it("the check itself catches interpolation, concatenation and variables", () => {
    const sample =
      'db().raw(`now() - ${x}`); k.whereRaw("a = " + b); k.raw(sql); k.raw("select 1"); k.whereRaw(`x = ?`, [1]);';
    const found = [...sample.matchAll(/\.(raw|whereRaw)\s*\(/g)].map((m) =>
      firstArgument(sample, m.index! + m[0].length),
    );
    const dynamic = found.filter(
      (arg) => (arg.startsWith("`") && arg.includes("${")) || arg.endsWith("+") || !/^[`"']/.test(arg),
    );
    expect(dynamic).toEqual(["`now() - ${x}`", '"a = " +', "sql"]);
  });
});

describe("no secrets in the repository", () => {
  // Files git would commit: tracked, plus untracked ones not ignored.
  const files = execFileSync("git", ["ls-files", "--cached", "--others", "--exclude-standard"], {
    cwd: ROOT,
    encoding: "utf8",
  })
    .split("\n")
    .filter(
      (f) =>
        f &&
        fs.existsSync(path.join(ROOT, f)) &&
        !/\.(png|jpe?g|webp|gif|ico|woff2?|pdf|lock)$/i.test(f) &&
        fs.statSync(path.join(ROOT, f)).size < 2_000_000,
    );

  // The documented throwaway values: demo users (README), test users, the local S3 fake's fixed keys.
  const DOCUMENTED = ["blockyard-demo", "test-password-123", "S3RVER", "secret", "pass"];

  const patterns = [
    /-----BEGIN [A-Z ]*PRIVATE KEY-----/,
    /\bAKIA[0-9A-Z]{16}\b/,
    /\baws_secret_access_key\s*[=:]\s*[A-Za-z0-9/+]{30,}/i,
    /\bgh[pousr]_[A-Za-z0-9]{30,}\b/,
    /\bxox[abpr]-[A-Za-z0-9-]{10,}/,
    /\bsk_live_[A-Za-z0-9]{16,}/,
  ];

  it("the patterns catch planted keys", () => {
    const planted = ["-----BEGIN RSA PRIVATE " + "KEY-----", "AKIA" + "ABCDEFGHIJKLMNOP", `ghp_${"a".repeat(36)}`];
    expect(planted.map((p) => patterns.some((re) => re.test(p)))).toEqual([true, true, true]);
  });

  it("has no private keys, cloud keys or tokens", () => {
    const hits = files.flatMap((f) => {
      const text = fs.readFileSync(path.join(ROOT, f), "utf8");
      return patterns.filter((p) => p.test(text)).map((p) => `${f}: ${p}`);
    });
    expect(hits).toEqual([]);
  });

  it("has no passwords in code or configuration other than the documented demo and test ones", () => {
    const hits: string[] = [];
    for (const f of files.filter((x) => !x.startsWith("tests/") && !x.endsWith(".md"))) {
      const text = fs.readFileSync(path.join(ROOT, f), "utf8");
      // A key named like a secret and assigned a literal (not `"/api/me/password": …` or `"user.password_change"`).
      for (const m of text.matchAll(
        /(?<![\w./-])(password|passwd|secret|api[_-]?key|token)["']?\s*[:=]\s*["'`]([^"'`\s]{4,})["'`]/gi,
      )) {
        if (!DOCUMENTED.includes(m[2]!) && !/^(process\.env|env\.)/.test(m[2]!)) hits.push(`${f}: ${m[0]}`);
      }
      for (const m of text.matchAll(/\b(postgres(?:ql)?|mysql|smtps?|redis|amqp):\/\/([^:@/\s]+):([^@\s]+)@/gi)) {
        if (!DOCUMENTED.includes(m[3]!)) hits.push(`${f}: ${m[0]}`);
      }
    }
    expect(hits).toEqual([]);
  });

  it("commits no .env files", () => {
    expect(files.filter((f) => /(^|\/)\.env(\.|$)/.test(f) && !f.endsWith(".example"))).toEqual([]);
  });
});

describe("who changed what", () => {
  const lastAudit = async (action: string, subject?: string) => {
    const q = testDb()("audit_log").where({ action }).orderBy("id", "desc");
    if (subject) q.where({ subject });
    return q.first();
  };
  const userId = async (role: string) =>
    (await testDb()("users")
      .where({ email: demoEmail(role) })
      .first("id"))!.id;

  it("records the actor of settings, grade, supplier and block changes in the audit log", async () => {
    const adminId = await userId("admin");
    const buyerId = await userId("buyer");

    const settings = (await admin.get("/api/settings")).body;
    const put = await admin.put("/api/settings", {
      ...(settings.settings ?? settings),
      shopName: "Hollowfield Foamworks",
    });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    expect(await lastAudit("settings.update")).toMatchObject({ actor_id: adminId, subject: "shop" });

    const code = `AUD-${Date.now().toString(36)}`.toUpperCase();
    const grade = await buyer.post("/api/grades", {
      code,
      material: "EPS",
      gradeSystem: "shop",
      grade: "audit",
      cureDays: 1,
      neverHotWire: false,
      colour: "#336699",
      priceUnit: "m3",
    });
    expect(grade.status, JSON.stringify(grade.body)).toBe(201);
    expect(await lastAudit("grade.create")).toMatchObject({ actor_id: buyerId });

    const supplier = await buyer.post("/api/suppliers", { name: `Audit supplier ${code}`, leadTimeDays: 5 });
    expect(supplier.status).toBe(201);
    expect(await lastAudit("supplier.create")).toMatchObject({ actor_id: buyerId });

    const b = await makeBlock();
    expect((await buyer.patch(`/api/blocks/${b.id}`, { location: "Audit bay" })).status).toBe(200);
    expect(await lastAudit("block.update", `block:${b.id}`)).toMatchObject({
      actor_id: buyerId,
      detail: { location: "Audit bay" },
    });
  });

  it("records who moved stock, with the reason, in the ledger", async () => {
    const buyerId = await userId("buyer");
    const a = await makeBlock();
    const c = await makeBlock();
    expect(
      (await buyer.post(`/api/blocks/${a.id}/adjust`, { size: [1990, 1000, 500], reason: "Re-measured for audit" }))
        .status,
    ).toBe(200);
    expect((await buyer.post(`/api/blocks/${c.id}/scrap`, { reason: "Forklift, audit test" })).status).toBe(200);
    expect(await testDb()("stock_ledger").where({ block_id: a.id, kind: "adjusted" }).first()).toMatchObject({
      user_id: buyerId,
      reason: "Re-measured for audit",
    });
    expect(await testDb()("stock_ledger").where({ block_id: c.id, kind: "scrapped" }).first()).toMatchObject({
      user_id: buyerId,
      reason: "Forklift, audit test",
    });
  });
});
