import fc from "fast-check";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { API_POLICY, type RouteKey } from "@/lib/auth/policy";
import { BASE_URL, client, type Client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeBlock, makeUser, testDb } from "../support/db";
import { makeJobWithParts } from "../support/planning-fixtures";
import { diff, fingerprint } from "../support/fingerprint";
import { EXAMPLES, type Example } from "./route-examples";

/**
 * Hostile input against every route in API_POLICY, signed in as admin so the guard lets each
 * request through to validation. For every answer: never 5xx; a 4xx is JSON `{ error }`; and a
 * refused request leaves the database exactly as it was (a one-query fingerprint of every table,
 * taken after each request). Inputs come from fast-check with a fixed seed, so a failure repeats.
 */

afterAll(closeTestDb);

const SEED = 20261201;
const KEYS = Object.keys(API_POLICY) as RouteKey[];
const CSV_ROUTES = new Set<RouteKey>([
  "POST /api/imports/deliveries",
  "POST /api/imports/stock-counts",
  "POST /api/jobs/[jobId]/parts/import",
]);
// Routes whose success would end or change the caller's own session get a throwaway admin each.
const OWN_CLIENT = new Set<RouteKey>(["POST /api/auth/sign-in", "POST /api/auth/sign-out", "POST /api/me/password"]);

// ---- hostile values ----

const deep = (n: number): unknown => {
  let v: unknown = 1;
  for (let i = 0; i < n; i++) v = i % 2 ? { a: v } : [v];
  return v;
};

const HOSTILE: unknown[] = [
  null,
  true,
  false,
  0,
  -0,
  -1,
  -1e9,
  1.5,
  1e308,
  -1e308,
  2 ** 53 + 1,
  5e-324,
  "",
  " ",
  "NaN",
  "Infinity",
  "-Infinity",
  "1e999",
  "-1",
  "0x1F",
  "١٢٣",
  "1,5",
  "12abc",
  "x".repeat(100_000),
  "\u202Egpj.exe", // right-to-left override
  "a\u200Bb\uFEFF", // zero-width space, BOM inside
  "a\u0000b", // NUL
  "\uD800",
  "\uDFFFx", // lone surrogates
  "e\u0301\u0301\u0301\u0301", // stacked combining marks
  "<script>alert(1)</script>",
  "' OR '1'='1' --",
  "'; DROP TABLE blocks; --",
  "=cmd|' /C calc'!A0",
  "../../../etc/passwd",
  "%00",
  "${7*7}",
  "{{7*7}}",
  "2026-02-30",
  "9999-99-99",
  "0000-00-00",
  [],
  {},
  [null],
  [[]],
  ["a", 1, null],
  { length: 1e9 },
  [1e308, -1e308, 0],
  deep(200),
];

const hostileValue = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom(...HOSTILE) },
  { weight: 1, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.integer({ min: -(2 ** 31), max: 2 ** 31 }) },
  { weight: 1, arbitrary: fc.string({ unit: "binary", maxLength: 40 }) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
);

const INVALID_JSON = [
  "{",
  "}",
  '{"a":}',
  "{'a':1}",
  "[1,]",
  '{"a":1,}',
  "NaN",
  '{"a":NaN}',
  '{"a":Infinity}',
  '{"a":-Infinity}',
  "undefined",
  "",
  " ",
  "\uFEFF{}",
  '{"a":"\\ud800"',
  "1".padEnd(400, "0"),
  '{"a":1}{"b":2}',
  "/* */{}",
  '{"a":01}',
];

const WRONG_TYPES = [
  "text/plain",
  "application/x-www-form-urlencoded",
  "multipart/form-data; boundary=xyz",
  "application/xml",
  "image/png",
  "application/json; charset=utf-16",
  "application/jsonx",
];

const HOSTILE_PARAMS = [
  "0",
  "-1",
  "1.5",
  "1e99",
  "99999999999999999999",
  "abc",
  "..%2F..%2Fetc%2Fpasswd",
  "%00",
  "1%3BDROP%20TABLE%20blocks",
  "%E2%80%AE1",
  "__proto__",
  "constructor",
  "NaN",
  "Infinity",
  "0x10",
  "%20%201",
];

// ---- variants ----

interface Variant {
  label: string;
  params?: Record<string, string>;
  query?: string;
  body?: string | Buffer;
  contentType?: string | null;
}

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Every path into a JSON value (objects and arrays), leaves and branches alike. */
function paths(v: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = prefix.length ? [prefix] : [];
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...paths(x, [...prefix, i])));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) out.push(...paths(x, [...prefix, k]));
  return out;
}

function setAt(root: unknown, path: (string | number)[], value: unknown, drop = false): unknown {
  const copy = structuredClone(root) as Record<string | number, unknown>;
  let cur = copy;
  for (const p of path.slice(0, -1)) cur = cur[p] as Record<string | number, unknown>;
  const last = path.at(-1)!;
  if (drop) {
    if (Array.isArray(cur)) cur.splice(Number(last), 1);
    else delete cur[last];
  } else cur[last] = value;
  return copy;
}

function jsonVariants(example: Example, runs: number, seed: number): Variant[] {
  const base = (example.body && typeof example.body === "object" ? example.body : {}) as Json;
  const ps = paths(base);
  const pathArb = ps.length ? fc.constantFrom(...ps) : fc.constant(["field"] as (string | number)[]);
  const variant: fc.Arbitrary<Variant> = fc.oneof(
    {
      weight: 8,
      arbitrary: fc
        .tuple(pathArb, hostileValue)
        .map(([p, v]) => ({ label: `${p.join(".")} = ${short(v)}`, body: JSON.stringify(setAt(base, p, v)) })),
    },
    {
      weight: 2,
      arbitrary: pathArb.map((p) => ({
        label: `without ${p.join(".")}`,
        body: JSON.stringify(setAt(base, p, undefined, true)),
      })),
    },
    {
      weight: 2,
      arbitrary: fc.constantFrom("__proto__", "constructor", "prototype", "toString", "hasOwnProperty").map((k) => ({
        label: `extra key ${k}`,
        body: JSON.stringify(base).replace(
          /^\{/,
          `{"${k}":{"isAdmin":true,"roles":["admin"],"polluted":1}${Object.keys(base ?? {}).length ? "," : ""}`,
        ),
      })),
    },
    {
      weight: 2,
      arbitrary: hostileValue.map((v) => ({ label: `whole body ${short(v)}`, body: JSON.stringify(v) ?? "null" })),
    },
    {
      weight: 2,
      arbitrary: fc.constantFrom(...INVALID_JSON).map((t) => ({ label: `invalid JSON ${short(t)}`, body: t })),
    },
    {
      weight: 1,
      arbitrary: fc.constant({
        label: "invalid UTF-8 bytes",
        body: Buffer.from([0x7b, 0x22, 0x61, 0x22, 0x3a, 0x22, 0xff, 0xfe, 0xc0, 0x22, 0x7d]),
      }),
    },
    {
      weight: 2,
      arbitrary: fc
        .constantFrom(...WRONG_TYPES)
        .map((t) => ({ label: `content-type ${t}`, body: JSON.stringify(base), contentType: t })),
    },
    {
      weight: 1,
      arbitrary: fc.constant({ label: "no content-type", body: Buffer.from(JSON.stringify(base)), contentType: null }),
    },
    {
      weight: 1,
      arbitrary: fc.constant({
        label: "2 MB string field",
        body: JSON.stringify(
          ps.length ? setAt(base, ps[0]!, "y".repeat(2 * 1024 * 1024)) : { field: "y".repeat(2 * 1024 * 1024) },
        ),
      }),
    },
  );
  const out = fc.sample(variant, { numRuns: runs, seed }).map((v) => ({ params: example.params, ...v }));
  // Hostile path parameters too, for routes that take them.
  if (example.params) {
    const names = Object.keys(example.params);
    for (const [i, bad] of fc.sample(fc.constantFrom(...HOSTILE_PARAMS), { numRuns: 3, seed: seed + 1 }).entries()) {
      const name = names[i % names.length]!;
      out.push({
        label: `param ${name}=${bad}`,
        params: { ...example.params, [name]: bad },
        body: JSON.stringify(base),
      });
    }
  }
  return out;
}

const QUERY_KEYS = [
  "page",
  "pageSize",
  "sort",
  "dir",
  "status",
  "grade",
  "q",
  "minLength",
  "maxLength",
  "minVolume",
  "offcuts",
  "location",
  "jobs",
  "block",
  "size",
  "from",
  "to",
  "kind",
  "limit",
  "commit",
  "name",
  "blockId",
  "jobId",
  "__proto__",
  "constructor",
];
const RAW_QUERIES = [
  "%",
  "%zz=1",
  "q=%E0%A4%A",
  "q=%00",
  "page=1&page=2&page=-1",
  "__proto__[polluted]=1",
  "constructor[prototype][x]=1",
  "q[]=a&q[]=b",
  "sort=code;DROP TABLE blocks",
  "q=%25%5F%5C",
  "pageSize=1e309",
  "page=0x10",
  "=&&=&",
  `q=${"%F0%9F%98%80".repeat(300)}`,
];

function queryVariants(example: Example, runs: number, seed: number): Variant[] {
  const pair = fc.tuple(
    fc.constantFrom(...QUERY_KEYS),
    hostileValue.map((v) => (typeof v === "string" ? v.slice(0, 1500) : (JSON.stringify(v)?.slice(0, 1500) ?? ""))),
  );
  const q = fc.oneof(
    {
      weight: 4,
      arbitrary: fc
        .array(pair, { minLength: 1, maxLength: 4 })
        .map((ps) => ps.map(([k, v]) => `${enc(k)}=${enc(v)}`).join("&")),
    },
    { weight: 2, arbitrary: fc.constantFrom(...RAW_QUERIES) },
  );
  const out: Variant[] = fc.sample(q, { numRuns: runs, seed }).map((s) => ({
    label: `?${short(s)}`,
    params: example.params,
    query: [example.query, s].filter(Boolean).join("&"),
  }));
  if (example.params) {
    const names = Object.keys(example.params);
    for (const [i, bad] of HOSTILE_PARAMS.slice(0, 6).entries()) {
      const name = names[i % names.length]!;
      out.push({ label: `param ${name}=${bad}`, params: { ...example.params, [name]: bad }, query: example.query });
    }
  }
  return out;
}

function csvVariants(example: Example, runs: number, seed: number): Variant[] {
  const text = String(example.body ?? "");
  const [header = "", ...rest] = text.trim().split("\n");
  const row = rest[0] ?? "";
  const cells = row.split(",");
  const withCell = (i: number, v: string) => cells.map((c, j) => (j === i ? v : c)).join(",");
  const formula = ["=cmd|' /C calc'!A0", "+1+1", "-2+3", "@SUM(A1:A9)", "\t=1", '=HYPERLINK("http://x")', '"=1,2"'];
  const fixed: Variant[] = [
    ...formula
      .flatMap((f, k) =>
        cells.map((_, i) => ({
          label: `formula ${short(f)} in cell ${i}`,
          body: `${header}\n${withCell(i, f)}\n`,
          query: k % 2 ? "commit=1" : "commit=0",
        })),
      )
      .slice(0, 14),
    { label: "BOM", body: `\uFEFF${header}\n${row}\n` },
    { label: "two BOMs", body: `\uFEFF\uFEFF${header}\n${row}\n` },
    {
      label: "UTF-16LE with BOM",
      body: Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(`${header}\n${row}\n`, "utf16le")]),
    },
    {
      label: "invalid UTF-8",
      body: Buffer.concat([Buffer.from(`${header}\n`), Buffer.from([0xc3, 0x28, 0xff, 0x2c, 0x0a])]),
    },
    { label: "NUL in a cell", body: `${header}\n${withCell(0, "a\u0000b")}\n` },
    { label: "NULs only", body: Buffer.alloc(4096) },
    {
      label: "20,000 columns in the header",
      body: `${header},${Array.from({ length: 20_000 }, (_, i) => `c${i}`).join(",")}\n${row}\n`,
    },
    { label: "20,000 columns in a row", body: `${header}\n${row},${",x".repeat(20_000)}\n` },
    { label: "CRLF", body: `${header}\r\n${row}\r\n` },
    { label: "CR only", body: `${header}\r${row}\r` },
    { label: "CR, LF and CRLF mixed", body: `${header}\r\n${row}\n${row}\r${row}\r\n` },
    { label: "unbalanced quote", body: `${header}\n"${row}\n` },
    { label: "quote inside a cell", body: `${header}\n${withCell(0, 'ab"c')}\n` },
    { label: "quoted newline", body: `${header}\n${withCell(0, '"a\nb"')}\n` },
    { label: "empty", body: "" },
    { label: "header only", body: `${header}\n` },
    { label: "whitespace only", body: " \n\t\n \r\n" },
    { label: "semicolons", body: text.replace(/,/g, ";") },
    { label: "1 MB cell", body: `${header}\n${withCell(0, "z".repeat(1024 * 1024))}\n` },
    { label: "duplicate header", body: `${header},${header.split(",")[0]}\n${row},x\n` },
    {
      label: "RTL override and zero-width in cells",
      body: `${header}\n${cells.map((c) => `\u202E${c}\u200B`).join(",")}\n`,
    },
    { label: "lone surrogate", body: `${header}\n${withCell(0, "\uD800")}\n` },
    { label: "content-type application/json", body: text, contentType: "application/json" },
    { label: "content-type image/png", body: text, contentType: "image/png" },
    { label: "no content-type", body: Buffer.from(text), contentType: null },
  ];
  const cell = fc.oneof(
    fc.string({ unit: "binary", maxLength: 30 }),
    fc.constantFrom("NaN", "Infinity", "-1", "1e999", "0", "١٢٣", "2026-13-01", "=1", '"', '""', ""),
  );
  const randomRows = fc.array(fc.array(cell, { minLength: 1, maxLength: cells.length + 2 }), {
    minLength: 1,
    maxLength: 5,
  });
  const generated = fc.sample(randomRows, { numRuns: runs, seed }).map((rows) => ({
    label: `random rows ${short(JSON.stringify(rows))}`,
    body: `${header}\n${rows.map((r) => r.map((c) => (/[",\n\r]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(",")).join("\n")}\n`,
  }));
  return [...fixed, ...generated].map((v) => ({
    contentType: "text/csv",
    query: "commit=1",
    ...v,
    params: example.params,
  }));
}

/** Percent-encoding that survives lone surrogates (sent as U+FFFD, as a browser would). */
function enc(s: string): string {
  try {
    return encodeURIComponent(s);
  } catch {
    return encodeURIComponent(
      s.replace(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, "\uFFFD"),
    );
  }
}

function short(v: unknown): string {
  const s = typeof v === "string" ? v : (JSON.stringify(v) ?? String(v));
  return JSON.stringify(s.length > 40 ? `${s.slice(0, 40)}…(${s.length})` : s);
}

// ---- sending and checking ----

let admin: Client;
let adminEmail: string;
let sent = 0;
const failures: string[] = [];

async function freshAdmin(email = adminEmail): Promise<Client> {
  const c = client();
  await c.signIn(email, TEST_PASSWORD);
  return c;
}

/** An admin of its own, for routes that sign out or change the caller's password (ending other sessions). */
async function throwawayAdmin(): Promise<Client> {
  return freshAdmin((await makeUser(["admin"])).email);
}

function urlFor(key: RouteKey, params: Record<string, string> | undefined, query: string | undefined): string {
  const pattern = key.split(" ")[1]!;
  // Hostile params are sent as written (already percent-encoded where they need to be).
  const path = pattern.replace(/\[(\w+)\]/g, (_, p: string) => params?.[p] ?? "1");
  return query ? `${path}?${query}` : path;
}

async function fire(c: Client, key: RouteKey, v: Variant) {
  const method = key.split(" ")[0]!.toLowerCase() as "get";
  const url = urlFor(key, v.params, v.query);
  let req = c.call(method, url);
  if (v.contentType) req = req.set("Content-Type", v.contentType);
  if (v.body !== undefined && method !== "get") {
    if (v.contentType === undefined) req = req.set("Content-Type", "application/json");
    req = req.send(typeof v.body === "string" ? v.body : v.body);
  }
  return req
    .timeout({ response: 60_000, deadline: 90_000 })
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on("data", (d: Buffer) => chunks.push(d));
      res.on("end", () => done(null, Buffer.concat(chunks)));
    });
}

/**
 * Sends each variant, checking the answer and that a refused one changed nothing. Returns what went
 * wrong, so each route's test fails on its own (the totals test below sums them).
 */
async function attack(key: RouteKey, variants: Variant[], c: Client): Promise<string[]> {
  const found: string[] = [];
  const fail = (msg: string) => {
    found.push(msg);
    fail(msg);
  };
  let before = await fingerprint();
  for (const v of variants) {
    const what = `${key} [${v.label}]`;
    let res: Awaited<ReturnType<typeof fire>>;
    try {
      res = await fire(c, key, v);
    } catch (e) {
      fail(`${what}: no answer (${(e as Error).message})`);
      before = await fingerprint();
      continue;
    }
    sent++;
    const raw = (res.body as Buffer).toString("utf8");
    if (res.status >= 500) fail(`${what}: ${res.status} ${raw.slice(0, 200)}`);
    if (res.status >= 400) {
      let body: { error?: unknown } | undefined;
      try {
        body = JSON.parse(raw);
      } catch {
        body = undefined;
      }
      if (
        !/application\/json/.test(String(res.headers["content-type"])) ||
        typeof body?.error !== "string" ||
        !body.error
      ) {
        fail(
          `${what}: ${res.status} without a JSON { error }: ${String(res.headers["content-type"])} ${raw.slice(0, 120)}`,
        );
      }
      const after = await fingerprint();
      const changed = diff(before, after);
      if (changed.length) fail(`${what}: refused with ${res.status} but the database changed: ${changed.join("; ")}`);
      before = after;
    } else {
      before = await fingerprint(); // accepted: whatever it changed is the new baseline
    }
  }
  return found;
}

/** The shared admin must stay signed in, or later requests would only test the guard. */
async function stillSignedIn(): Promise<string[]> {
  const me = await admin.get("/api/me");
  if (me.status === 200) return [];
  const msg = `the shared admin session ended (GET /api/me → ${me.status})`;
  failures.push(msg);
  admin = await freshAdmin();
  return [msg];
}

async function exampleFor(key: RouteKey): Promise<Example> {
  return (await EXAMPLES[key]?.({ makeUser, password: TEST_PASSWORD })) ?? {};
}

beforeAll(async () => {
  adminEmail = (await makeUser(["admin"])).email;
  admin = await freshAdmin();
});

describe("hostile input to every route, signed in as admin", () => {
  const mutating = KEYS.filter((k) => !k.startsWith("GET ") && !CSV_ROUTES.has(k));
  const reads = KEYS.filter((k) => k.startsWith("GET "));

  it.each(mutating.map((k, i) => [k, i] as const))("%s: malformed and hostile JSON bodies", async (key, i) => {
    const example = await exampleFor(key);
    const c = OWN_CLIENT.has(key) ? await throwawayAdmin() : admin;
    const found = await attack(key, jsonVariants(example, 16, SEED + i * 7), c);
    expect([...found, ...(await stillSignedIn())]).toEqual([]);
  });

  it.each(reads.map((k, i) => [k, i] as const))("%s: hostile query strings", async (key, i) => {
    const example = await exampleFor(key);
    const found = await attack(key, queryVariants(example, 8, SEED + 1000 + i * 7), admin);
    expect([...found, ...(await stillSignedIn())]).toEqual([]);
  });

  it.each([...CSV_ROUTES].map((k, i) => [k, i] as const))("%s: hostile CSV files", async (key, i) => {
    const example = await exampleFor(key);
    const found = await attack(key, csvVariants(example, 12, SEED + 2000 + i * 7), admin);
    expect([...found, ...(await stillSignedIn())]).toEqual([]);
  });

  it("refuses bodies larger than the server takes, with 4xx and nothing saved", async () => {
    // fetch, not supertest: superagent stalls sending a 66 MB buffer to a server that answers early.
    const signIn = await fetch(`${BASE_URL}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: BASE_URL, "x-forwarded-for": "10.88.0.1" },
      body: JSON.stringify({ email: adminEmail, password: TEST_PASSWORD }),
    });
    const cookie = signIn.headers.get("set-cookie")!.split(";")[0]!;
    const big = Buffer.alloc(66 * 1024 * 1024, 0x61);
    const cases: [string, string, Buffer][] = [
      ["/api/grades", "application/json", Buffer.concat([Buffer.from('{"code":"'), big, Buffer.from('"}')])],
      [
        "/api/imports/deliveries?commit=1",
        "text/csv",
        Buffer.concat([Buffer.from("supplier,received_on,lot\n"), big.subarray(0, 21 * 1024 * 1024)]),
      ],
      [
        "/api/defects/1/photos",
        "multipart/form-data; boundary=x",
        Buffer.concat([
          Buffer.from(
            '--x\r\nContent-Disposition: form-data; name="photos"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\n\xff\xd8\xff',
          ),
          big.subarray(0, 40 * 1024 * 1024),
          Buffer.from("\r\n--x--\r\n"),
        ]),
      ],
    ];
    for (const [url, type, body] of cases) {
      const before = await fingerprint();
      const res = await fetch(`${BASE_URL}${url}`, {
        method: "POST",
        headers: { cookie, origin: BASE_URL, "content-type": type },
        body: new Uint8Array(body),
      }).catch((e: Error & { cause?: { code?: string } }) => {
        // The server may answer 413 and close before the client has written the whole body; the
        // client then fails on the write (EPIPE/ECONNRESET) before it reads the answer. That is a
        // refusal too; anything else is a failure. Nothing may be saved either way.
        if (!["EPIPE", "ECONNRESET"].includes(e.cause?.code ?? "")) throw e;
        return null;
      });
      sent++;
      if (!res) {
        expect(diff(before, await fingerprint()), `${url} (hung up on)`).toEqual([]);
        continue;
      }
      const json = (await res.json().catch(() => ({}))) as { error?: string };
      expect(res.status, `${url}: ${JSON.stringify(json)}`).toBeGreaterThanOrEqual(400);
      expect(res.status, url).toBeLessThan(500);
      expect(typeof json.error, url).toBe("string");
      expect(diff(before, await fingerprint()), url).toEqual([]);
    }
  }, 180_000);

  it("sent at least 1,000 hostile requests in all, and every route's failures are counted above", () => {
    console.info(`[hostile] ${sent} hostile requests answered; ${failures.length} failures`);
    expect(failures).toEqual([]);
    expect(sent).toBeGreaterThanOrEqual(1000);
  });
});

describe("CSV exports defuse formula cells", () => {
  it.each(["=", "+", "-", "@"])(
    "a block whose location starts with %s comes back with a leading apostrophe",
    async (p) => {
      const location = `${p}cmd|' /C calc'!A0`;
      const b = await makeBlock({ location });
      const res = await admin.get(`/api/blocks/export?q=${encodeURIComponent(b.code)}&status=all`);
      expect(res.status).toBe(200);
      const text = (res.text ?? "").replace(/^\uFEFF/, "");
      const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
      expect(parsed.data).toHaveLength(1);
      expect(parsed.data[0]!.code).toBe(b.code);
      expect(parsed.data[0]!.location).toBe(`'${location}`);
      // No cell of the file starts a formula.
      for (const cell of parsed.data.flatMap((r) => Object.values(r))) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
    },
  );
});

describe("hostile stored data", () => {
  it("re-plans the rejects of a history run that kept no settings (demo history) instead of failing", async () => {
    const k = testDb();
    const block = await makeBlock({ size: [2000, 1000, 600] });
    const spare = await makeBlock({ size: [2000, 1000, 600] });
    const { jobId, partIds } = await makeJobWithParts([
      { name: "History rib", quantity: 2, size: [600, 300, 100], gradeCode: "EPS-II" },
    ]);
    const [run] = await k("nesting_runs")
      .insert({
        status: "closed",
        job_ids: [jobId],
        block_ids: [block.id],
        settings: JSON.stringify({ seeded: true }),
        problem: JSON.stringify({ seeded: true }),
        progress: 1,
      })
      .returning("id");
    const admin = await k("users").where({ email: adminEmail }).first("id");
    await k("cut_parts").insert({
      run_id: run!.id,
      block_id: block.id,
      job_part_id: partIds[0]!,
      good_count: 1,
      rejected_count: 1,
      reject_reason: "test",
      part_volume_m3: 0.018,
      volume_basis: "box",
      recorded_by: admin!.id,
    });
    const res = await (await freshAdmin()).post(`/api/runs/${run!.id}/replan`);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const child = await k("nesting_runs").where({ id: res.body.id }).first("settings", "parent_run_id");
    expect(child!.parent_run_id).toBe(run!.id);
    expect((child!.settings as { minOffcut: number[] }).minOffcut).toHaveLength(3);
    expect(spare.id).toBeGreaterThan(0);
  });
});
