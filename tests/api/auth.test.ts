import { afterAll, describe, expect, it } from "vitest";
import { client, demoEmail } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeUser, testDb } from "../support/db";

afterAll(closeTestDb);

const sessionCookie = (res: { headers: Record<string, unknown> }) =>
  ([] as string[])
    .concat((res.headers["set-cookie"] as string[] | undefined) ?? [])
    .find((c) => c.startsWith("blockyard_session="));

describe("sign-in and sign-out", () => {
  it("signs a demo user in, shows who they are, and signs them out", async () => {
    const c = client();
    const res = await c.signIn(demoEmail("planner"));
    const cookie = sessionCookie(res);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i); // plain http on loopback
    const me = await c.get("/api/me");
    expect(me.status).toBe(200);
    expect(me.body.user).toMatchObject({ email: demoEmail("planner"), roles: ["planner"] });
    expect((await c.post("/api/auth/sign-out")).status).toBe(200);
    expect((await c.get("/api/me")).status).toBe(401);
  });

  it("gives the cookie the session's lifetime (12 hours), not 400 days", async () => {
    const res = await client().signIn(demoEmail("manager"));
    const cookie = sessionCookie(res)!;
    expect(cookie).toMatch(/Max-Age=43200(;|$)/i);
    const expires = /Expires=([^;]+)/i.exec(cookie)?.[1];
    expect(expires).toBeTruthy();
    const ms = new Date(expires!).getTime() - Date.now();
    expect(ms).toBeGreaterThan(11 * 3600_000);
    expect(ms).toBeLessThanOrEqual(12 * 3600_000 + 60_000);
  });

  it("marks the cookie Secure when the request came over https", async () => {
    const c = client();
    const res = await c
      .post("/api/auth/sign-in", { email: demoEmail("buyer"), password: "blockyard-demo" })
      .set("X-Forwarded-Proto", "https");
    expect(res.status).toBe(200);
    expect(sessionCookie(res)).toMatch(/Secure/i);
  });

  it("gives a wrong password and an unknown user the same answer", async () => {
    const wrong = await client().post("/api/auth/sign-in", { email: demoEmail("admin"), password: "not-the-password" });
    const unknown = await client().post("/api/auth/sign-in", {
      email: "nobody@nowhere.test",
      password: "whatever-123",
    });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(sessionCookie(wrong)).toBeUndefined();
  });

  it("opens a new session on every sign-in and ends the old one", async () => {
    const c = client();
    const first = sessionCookie(await c.signIn(demoEmail("cutter")));
    const second = sessionCookie(await c.signIn(demoEmail("cutter")));
    expect(first && second && first.split(";")[0] !== second.split(";")[0]).toBe(true);
    const old = await client().get("/api/me").set("Cookie", first!.split(";")[0]!);
    expect(old.status).toBe(401);
    expect((await c.get("/api/me")).status).toBe(200);
  });

  it("throttles a client after repeated failures on one account, with a retry time, even for the right password", async () => {
    const { email } = await makeUser(["buyer"]);
    const address = "10.77.1.1";
    for (let i = 0; i < 5; i++) {
      const r = await client({ address }).post("/api/auth/sign-in", { email, password: `wrong-${i}-password` });
      expect(r.status).toBe(401);
    }
    const blocked = await client({ address }).post("/api/auth/sign-in", { email, password: TEST_PASSWORD });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    expect(blocked.body.error).toMatch(/try again/i);
    // Only that client waits: the account is not locked for everyone.
    expect((await client().post("/api/auth/sign-in", { email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it("throttles one client address that tries many accounts", async () => {
    const address = "10.77.0.1";
    let last = 0;
    for (let i = 0; i < 31; i++) {
      last = (
        await client({ address }).post("/api/auth/sign-in", { email: `spray-${i}@x.test`, password: "guess-guess" })
      ).status;
    }
    expect(last).toBe(429);
    // Another address is not affected.
    expect(
      (
        await client({ address: "10.77.0.2" }).post("/api/auth/sign-in", {
          email: demoEmail("manager"),
          password: "blockyard-demo",
        })
      ).status,
    ).toBe(200);
  });

  it("refuses a deactivated user and ends their open sessions at once", async () => {
    const { id, email } = await makeUser(["cutter"]);
    const victim = client();
    await victim.signIn(email, TEST_PASSWORD);
    expect((await victim.get("/api/me")).status).toBe(200);

    const admin = client();
    await admin.signIn(demoEmail("admin"));
    const res = await admin.patch(`/api/admin/users/${id}`, { active: false });
    expect(res.status).toBe(200);
    expect(res.body.user.active).toBe(false);

    expect((await victim.get("/api/me")).status).toBe(401);
    const again = await client().post("/api/auth/sign-in", { email, password: TEST_PASSWORD });
    expect(again.status).toBe(401);
    const sessions = await testDb()("user_sessions").where({ user_id: id }).count<{ n: number }[]>({ n: "*" }).first();
    expect(Number(sessions?.n)).toBe(0);
  });

  it("ends other sessions when a user changes their password, and keeps this one", async () => {
    const { email } = await makeUser(["planner"]);
    const here = client();
    const elsewhere = client();
    await here.signIn(email, TEST_PASSWORD);
    await elsewhere.signIn(email, TEST_PASSWORD);
    const bad = await here.post("/api/me/password", {
      currentPassword: "wrong-one-here",
      newPassword: "a-new-password-1",
    });
    expect(bad.status).toBe(400);
    expect(bad.body.fields.currentPassword).toBeTruthy();
    const ok = await here.post("/api/me/password", { currentPassword: TEST_PASSWORD, newPassword: "a-new-password-1" });
    expect(ok.status).toBe(200);
    expect((await here.get("/api/me")).status).toBe(200);
    expect((await elsewhere.get("/api/me")).status).toBe(401);
    expect((await client().post("/api/auth/sign-in", { email, password: "a-new-password-1" })).status).toBe(200);
  });

  it("refuses a mutation that does not come from a Blockyard page", async () => {
    const noOrigin = await client({ origin: null }).post("/api/auth/sign-in", {
      email: demoEmail("admin"),
      password: "blockyard-demo",
    });
    expect(noOrigin.status).toBe(403);
    const foreign = await client({ origin: "https://elsewhere.example" }).post("/api/auth/sign-in", {
      email: demoEmail("admin"),
      password: "blockyard-demo",
    });
    expect(foreign.status).toBe(403);
  });

  it("answers bad sign-in bodies with 4xx, never 5xx", async () => {
    const c = client();
    expect(
      (await c.call("post", "/api/auth/sign-in").set("content-type", "application/json").send("{not json")).status,
    ).toBe(400);
    expect((await c.post("/api/auth/sign-in", { email: 42, password: [] })).status).toBe(400);
    expect((await c.call("post", "/api/auth/sign-in").set("content-type", "text/plain").send("hello")).status).toBe(
      415,
    );
  });
});

/** Where a page sends the browser: a 3xx Location, or (once streaming began) Next's refresh tag. */
const redirectsTo = (res: { status: number; headers: Record<string, string>; text: string }) => {
  if (res.status >= 300 && res.status < 400) return res.headers.location;
  return /<meta id="__next-page-redirect" http-equiv="refresh" content="\d+;url=([^"]+)"/.exec(res.text)?.[1];
};

describe("a temporary password", () => {
  const temporaryUser = async () => {
    const u = await makeUser(["buyer"]);
    await testDb()("users").where({ id: u.id }).update({ must_change_password: true });
    return u;
  };

  it("allows nothing but changing it and signing out until it is changed", async () => {
    const { email } = await temporaryUser();
    const c = client();
    const signIn = await c.signIn(email, TEST_PASSWORD);
    expect(signIn.body.user.mustChangePassword).toBe(true);
    for (const path of ["/api/blocks", "/api/grades", "/api/settings", "/api/deliveries"]) {
      const r = await c.get(path);
      expect(r.status, path).toBe(403);
      expect(r.body.error).toMatch(/temporary password/i);
    }
    expect((await c.post("/api/grades", { code: "X" })).status).toBe(403);
    const me = await c.get("/api/me");
    expect(me.status).toBe(200);
    expect(me.body.user.mustChangePassword).toBe(true);
    // Pages send them to the account page, which itself opens.
    expect(redirectsTo(await c.get("/stock").redirects(0))).toBe("/account");
    expect(redirectsTo(await c.get("/").redirects(0))).toBe("/account");
    const account = await c.get("/account").redirects(0);
    expect(account.status).toBe(200);
    expect(redirectsTo(account)).toBeUndefined();

    const changed = await c.post("/api/me/password", {
      currentPassword: TEST_PASSWORD,
      newPassword: "my-own-password-1",
    });
    expect(changed.status).toBe(200);
    expect((await c.get("/api/blocks")).status).toBe(200);
    const stock = await c.get("/stock").redirects(0);
    expect(stock.status).toBe(200);
    expect(redirectsTo(stock)).toBeUndefined();
  });

  it("may sign out", async () => {
    const { email } = await temporaryUser();
    const c = client();
    await c.signIn(email, TEST_PASSWORD);
    expect((await c.post("/api/auth/sign-out")).status).toBe(200);
    expect((await c.get("/api/me")).status).toBe(401);
  });
});

describe("health", () => {
  it("reports the version and that the database is up", async () => {
    const res = await client().get("/api/health");
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ ok: true, database: "up" });
    expect(res.body.version).toMatch(/^\d+\.\d+\.\d+/);
  });

  it("sends the security headers on every answer", async () => {
    const res = await client().get("/api/health");
    expect(res.headers["content-security-policy"]).toMatch(/frame-ancestors 'none'/);
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["referrer-policy"]).toBe("same-origin");
  });
});
