import "server-only";
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from "lucia";
import * as sessions from "@/db/queries/sessions";

// Lucia v3 is finished upstream; everything outside lib/auth talks to session.ts, so it can be swapped.

/**
 * Lucia's storage on the app's one Knex pool, through db/queries/sessions.ts. Every request
 * validates its session, so reading it is a single round trip: session, user and roles in one
 * query (the stock Postgres adapter makes two, on a pool of its own, and the roles were a third).
 */
class SessionStore implements Adapter {
  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const r = await sessions.findSessionWithUser(sessionId);
    if (!r) return [null, null];
    const { id, user_id, expires_at, ...attributes } = r;
    return [
      { id, userId: user_id, expiresAt: expires_at, attributes: {} },
      { id: user_id, attributes },
    ];
  }

  async getUserSessions(userId: string): Promise<DatabaseSession[]> {
    const rows = await sessions.listUserSessions(userId);
    return rows.map((r) => ({ id: r.id, userId: r.user_id, expiresAt: r.expires_at, attributes: {} }));
  }

  async setSession(s: DatabaseSession): Promise<void> {
    await sessions.insertSession(s);
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await sessions.extendSession(sessionId, expiresAt);
  }

  async deleteSession(sessionId: string): Promise<void> {
    await sessions.deleteSession(sessionId);
  }

  async deleteUserSessions(userId: string): Promise<void> {
    await sessions.deleteUserSessions(userId);
  }

  async deleteExpiredSessions(): Promise<void> {
    await sessions.deleteExpiredSessions();
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
    DatabaseUserAttributes: Omit<sessions.SessionUserRow, keyof sessions.SessionRow>;
  }
}

const g = globalThis as unknown as { blockyardLucia?: AppLucia };

export function lucia(): AppLucia {
  g.blockyardLucia ??= createLucia();
  return g.blockyardLucia;
}
