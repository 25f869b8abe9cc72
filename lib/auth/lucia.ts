import "server-only";
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from "lucia";
import { db } from "@/db";

// Lucia v3 is finished upstream; everything outside lib/auth talks to session.ts, so it can be swapped.
interface UserRow {
  email: string;
  name: string;
  active: boolean;
  must_change_password: boolean;
  display_units: "mm" | "in" | null;
  roles: string[];
}

/**
 * Lucia's storage on the app's one Knex pool. Every request validates its session, so reading it
 * is a single round trip: session, user and roles in one query (the stock Postgres adapter makes
 * two, on a pool of its own, and the roles were a third).
 */
class SessionStore implements Adapter {
  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const { rows } = await db().raw(
      `SELECT s.id, s.user_id, s.expires_at,
              u.email, u.name, u.active, u.must_change_password, u.display_units,
              coalesce((SELECT array_agg(r.role ORDER BY r.role) FROM user_roles r WHERE r.user_id = u.id), '{}') AS roles
         FROM user_sessions s JOIN users u ON u.id = s.user_id
        WHERE s.id = ?`,
      [sessionId],
    );
    const r = rows[0] as ({ id: string; user_id: string; expires_at: Date } & UserRow) | undefined;
    if (!r) return [null, null];
    const { id, user_id, expires_at, ...attributes } = r;
    return [
      { id, userId: user_id, expiresAt: expires_at, attributes: {} },
      { id: user_id, attributes },
    ];
  }

  async getUserSessions(userId: string): Promise<DatabaseSession[]> {
    const rows: { id: string; user_id: string; expires_at: Date }[] = await db()("user_sessions")
      .where({ user_id: userId })
      .select("id", "user_id", "expires_at");
    return rows.map((r) => ({ id: r.id, userId: r.user_id, expiresAt: r.expires_at, attributes: {} }));
  }

  async setSession(s: DatabaseSession): Promise<void> {
    await db()("user_sessions").insert({ id: s.id, user_id: s.userId, expires_at: s.expiresAt });
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await db()("user_sessions").where({ id: sessionId }).update({ expires_at: expiresAt });
  }

  async deleteSession(sessionId: string): Promise<void> {
    await db()("user_sessions").where({ id: sessionId }).delete();
  }

  async deleteUserSessions(userId: string): Promise<void> {
    await db()("user_sessions").where({ user_id: userId }).delete();
  }

  async deleteExpiredSessions(): Promise<void> {
    await db()("user_sessions").where("expires_at", "<=", new Date()).delete();
  }
}

function createLucia() {
  return new Lucia(new SessionStore(), {
    sessionExpiresIn: new TimeSpan(12, "h"),
    sessionCookie: {
      name: "blockyard_session",
      // The cookie lives as long as the session (Max-Age 12 h, renewed with it), not Lucia's 400 days.
      expires: true,
      attributes: { secure: false, sameSite: "lax" }, // secure is decided per request in session.ts
    },
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      active: row.active,
      mustChangePassword: row.must_change_password,
      displayUnits: row.display_units,
      roles: row.roles,
    }),
  });
}

type AppLucia = ReturnType<typeof createLucia>;

declare module "lucia" {
  interface Register {
    Lucia: AppLucia;
    DatabaseUserAttributes: UserRow;
  }
}

const g = globalThis as unknown as { blockyardLucia?: AppLucia };

export function lucia(): AppLucia {
  g.blockyardLucia ??= createLucia();
  return g.blockyardLucia;
}
