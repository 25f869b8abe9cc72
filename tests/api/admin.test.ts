import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { client, demoEmail, type Client } from "../support/http";
import { closeTestDb, makeUser, tableCounts, testDb } from "../support/db";

afterAll(closeTestDb);

let admin: Client;
beforeAll(async () => {
  admin = client();
  await admin.signIn(demoEmail("admin"));
});

describe("people (admin)", () => {
  it("creates a user with roles who must then choose their own password", async () => {
    const email = `ines-${Date.now()}@test.blockyard.test`;
    const res = await admin.post("/api/admin/users", {
      email,
      name: "Ines Varga",
      roles: ["planner", "cutter"],
      password: "first-pass-123",
    });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({
      email,
      roles: ["cutter", "planner"],
      active: true,
      mustChangePassword: true,
    });
    const c = client();
    const signIn = await c.signIn(email, "first-pass-123");
    expect(signIn.body.user.mustChangePassword).toBe(true);
    const listed = await admin.get("/api/admin/users");
    expect(listed.body.items.map((u: { email: string }) => u.email)).toContain(email);
  });

  it("refuses bad fields by name and saves nothing", async () => {
    const before = await tableCounts();
    const res = await admin.post("/api/admin/users", {
      email: "not-an-email",
      name: "",
      roles: ["wizard"],
      password: "short",
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.fields).sort()).toEqual(["email", "name", "password", "roles.0"]);
    expect(await tableCounts()).toEqual(before);
  });

  it("refuses a second user with the same e-mail, whatever its case", async () => {
    const before = await tableCounts();
    const res = await admin.post("/api/admin/users", {
      email: demoEmail("buyer").toUpperCase(),
      name: "Copy",
      roles: ["buyer"],
      password: "another-pass-1",
    });
    expect(res.status).toBe(409);
    expect(res.body.fields.email).toMatch(/already exists/);
    expect(await tableCounts()).toEqual(before);
  });

  it("changes roles, and the change applies to the user's next request", async () => {
    const u = await makeUser(["buyer"]);
    const c = client();
    await c.signIn(u.email, "test-password-123");
    expect((await c.get("/api/admin/users")).status).toBe(403);
    const res = await admin.patch(`/api/admin/users/${u.id}`, { roles: ["admin"] });
    expect(res.status).toBe(200);
    expect((await c.get("/api/admin/users")).status).toBe(200);
  });

  it("keeps at least one active admin", async () => {
    const admins = await testDb()("user_roles as r")
      .join("users as u", "u.id", "r.user_id")
      .where({ "r.role": "admin", "u.active": true })
      .select("u.id");
    // Demote every other admin first so the demo admin is the last one.
    const others = admins.map((a: { id: string }) => a.id).filter((id: string) => id !== "u-admin");
    await testDb()("users").whereIn("id", others).update({ active: false });
    try {
      const res = await admin.patch("/api/admin/users/u-admin", { roles: ["buyer"] });
      expect(res.status).toBe(409);
      expect(res.body.error).toMatch(/at least one active admin/);
      const roles = await testDb()("user_roles").where({ user_id: "u-admin" }).pluck("role");
      expect(roles).toEqual(["admin"]);
    } finally {
      await testDb()("users").whereIn("id", others).update({ active: true });
    }
  });

  it("sets a temporary password that ends the user's sessions", async () => {
    const u = await makeUser(["cutter"]);
    const c = client();
    await c.signIn(u.email, "test-password-123");
    const res = await admin.post(`/api/admin/users/${u.id}/password`, { password: "temporary-123" });
    expect(res.status).toBe(200);
    expect((await c.get("/api/me")).status).toBe(401);
    const again = client();
    const s = await again.signIn(u.email, "temporary-123");
    expect(s.body.user.mustChangePassword).toBe(true);
  });

  it("answers 404 for a user that does not exist", async () => {
    expect((await admin.get("/api/admin/users/u-nobody")).status).toBe(404);
    expect((await admin.patch("/api/admin/users/u-nobody", { active: false })).status).toBe(404);
  });

  it("refuses unknown fields in a user update", async () => {
    const u = await makeUser(["cutter"]);
    const res = await admin.patch(`/api/admin/users/${u.id}`, { password_hash: "x" });
    expect(res.status).toBe(400);
  });

  it("writes an audit row for each admin change", async () => {
    const u = await makeUser(["cutter"]);
    await admin.patch(`/api/admin/users/${u.id}`, { name: "Renamed Person" });
    const rows = await testDb()("audit_log").where({ subject: u.id, action: "user.update" });
    expect(rows).toHaveLength(1);
    expect(rows[0]!.actor_id).toBe("u-admin");
  });
});

describe("shop settings", () => {
  const valid = {
    shopName: "Hollowfield Foamworks",
    displayUnits: "in",
    kerf: 1.2,
    trim: 8,
    defectMargin: 12,
    minOffcut: [200, 150, 30],
    layout: "layers",
    feedMmPerMin: 250,
    nestingTimeLimitMs: 4000,
  };

  it("saves valid settings that everyone can then read", async () => {
    expect((await admin.put("/api/settings", valid)).status).toBe(200);
    const planner = client();
    await planner.signIn(demoEmail("planner"));
    const res = await planner.get("/api/settings");
    expect(res.body.settings).toMatchObject({
      kerf: 1.2,
      layout: "layers",
      minOffcut: [200, 150, 30],
      displayUnits: "in",
    });
    await admin.put("/api/settings", {
      ...valid,
      displayUnits: "mm",
      kerf: 1.5,
      trim: 6,
      defectMargin: 10,
      minOffcut: [150, 150, 25],
      layout: "guillotine",
      feedMmPerMin: 300,
      nestingTimeLimitMs: 3000,
    });
  });

  it("names each bad setting and changes nothing", async () => {
    const before = await testDb()("shop_settings").first();
    const res = await admin.put("/api/settings", {
      ...valid,
      kerf: -1,
      minOffcut: [200, "wide", 30],
      layout: "spiral",
    });
    expect(res.status).toBe(400);
    expect(res.body.fields).toHaveProperty("kerf");
    expect(res.body.fields).toHaveProperty(["minOffcut.1"]);
    expect(res.body.fields).toHaveProperty("layout");
    expect(await testDb()("shop_settings").first()).toEqual(before);
  });
});
