import { afterAll, describe, expect, it } from "vitest";
import { client, demoEmail } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeUser } from "../support/db";

/**
 * Sign-in throttling slows the guesser down and never locks anyone else out: limits are per
 * client (the last X-Forwarded-For hop: the one our proxy appended) and per client + account;
 * an account attacked from many addresses is answered more slowly, never refused.
 */

afterAll(closeTestDb);

let seq = 0;
/** An address no other test uses (the throttle counts per address). */
const address = () => `10.${180 + (process.pid % 50)}.${Math.floor(Math.random() * 250)}.${++seq}`;

const signInFrom = (from: string, email: string, password: string) =>
  client({ address: from }).post("/api/auth/sign-in", { email, password });

describe("sign-in throttling", () => {
  it("30 wrong passwords from one client do not stop the owner signing in from another", async () => {
    const { email } = await makeUser(["buyer"]);
    const a = address();
    const statuses: number[] = [];
    for (let i = 0; i < 30; i++) statuses.push((await signInFrom(a, email, `wrong-${i}-password`)).status);
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    expect(statuses.at(-1)).toBe(429); // the guesser waits…
    const started = Date.now();
    const owner = await signInFrom(address(), email, TEST_PASSWORD);
    expect(owner.status, JSON.stringify(owner.body)).toBe(200); // …the owner does not
    expect(Date.now() - started).toBeLessThan(2_000);
  });

  it("five wrong passwords for the admin's e-mail do not lock the admin out", async () => {
    const a = address();
    for (let i = 0; i < 5; i++) {
      expect((await signInFrom(a, demoEmail("admin"), `not-the-admin-${i}`)).status).toBe(401);
    }
    const blocked = await signInFrom(a, demoEmail("admin"), "blockyard-demo");
    expect(blocked.status).toBe(429); // the same client waits, even with the right password
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    expect(Number(blocked.headers["retry-after"])).toBeLessThanOrEqual(30);
    expect(blocked.body.error).toMatch(/try again in \d+ second/i);
    expect((await signInFrom(address(), demoEmail("admin"), "blockyard-demo")).status).toBe(200);
  });

  it("a forged first X-Forwarded-For entry does not give a throttled client a fresh limit", async () => {
    const a = address();
    let last = 0;
    for (let i = 0; i < 30; i++) {
      last = (await signInFrom(a, `spray-${a}-${i}@x.test`, "guess-guess")).status;
    }
    expect(last).toBe(401);
    expect((await signInFrom(a, `spray-${a}-30@x.test`, "guess-guess")).status).toBe(429);
    // The client puts an address of its own choosing first; our proxy's hop (last) still names it.
    const forged = await client({ address: `203.0.113.${++seq % 250}, ${a}` }).post("/api/auth/sign-in", {
      email: `spray-${a}-31@x.test`,
      password: "guess-guess",
    });
    expect(forged.status).toBe(429);
    expect(Number(forged.headers["retry-after"])).toBeGreaterThan(0);
  });

  it("an account guessed at from many addresses is slowed down, not locked", async () => {
    const { email } = await makeUser(["cutter"]);
    for (let i = 0; i < 12; i++) {
      expect((await signInFrom(address(), email, `spread-${i}-guess`)).status).toBe(401);
    }
    const started = Date.now();
    const owner = await signInFrom(address(), email, TEST_PASSWORD);
    expect(owner.status, JSON.stringify(owner.body)).toBe(200);
    expect(Date.now() - started).toBeGreaterThanOrEqual(700); // 12 failures: 3 × 250 ms
  });
});

describe("changing one's password is throttled like signing in", () => {
  it("refuses further tries after five wrong current passwords, and changes nothing", async () => {
    const { email } = await makeUser(["planner"]);
    const c = client({ address: address() });
    await c.signIn(email, TEST_PASSWORD);
    for (let i = 0; i < 5; i++) {
      const r = await c.post("/api/me/password", {
        currentPassword: `wrong-${i}-current`,
        newPassword: "a-new-password-9",
      });
      expect(r.status).toBe(400);
    }
    const blocked = await c.post("/api/me/password", {
      currentPassword: TEST_PASSWORD,
      newPassword: "a-new-password-9",
    });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    expect(blocked.body.error).toMatch(/password changes/i);
    // The password is unchanged: the old one still signs in, the new one does not.
    expect((await signInFrom(address(), email, "a-new-password-9")).status).toBe(401);
    expect((await signInFrom(address(), email, TEST_PASSWORD)).status).toBe(200);
  });

  it("does not let the same session hop addresses to keep guessing", async () => {
    const { email } = await makeUser(["planner"]);
    const c = client({ address: address() });
    await c.signIn(email, TEST_PASSWORD);
    const statuses: number[] = [];
    for (let i = 0; i < 11; i++) {
      const r = await c
        .call("post", "/api/me/password")
        .set("X-Forwarded-For", address())
        .send({ currentPassword: `wrong-${i}-current`, newPassword: "a-new-password-9" });
      statuses.push(r.status);
    }
    expect(statuses.slice(0, 10).every((s) => s === 400)).toBe(true);
    expect(statuses[10]).toBe(429);
  });
});
