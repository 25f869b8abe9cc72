import "server-only";
import { Lucia, TimeSpan } from "lucia";
import { NodePostgresAdapter } from "@lucia-auth/adapter-postgresql";
import pg from "pg";
import { env } from "@/lib/env";

// Lucia v3 is finished upstream; everything outside lib/auth talks to session.ts, so it can be swapped.
interface UserRow {
  email: string;
  name: string;
  active: boolean;
  must_change_password: boolean;
  display_units: "mm" | "in" | null;
}

function createLucia() {
  const pool = new pg.Pool({ connectionString: env().DATABASE_URL, max: 4, connectionTimeoutMillis: 5_000 });
  pool.on("error", () => {}); // a dropped idle connection must not crash the server
  const adapter = new NodePostgresAdapter(pool, { user: "users", session: "user_sessions" });
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(12, "h"),
    sessionCookie: {
      name: "blockyard_session",
      expires: false,
      attributes: { secure: false, sameSite: "lax" }, // secure is decided per request in session.ts
    },
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      active: row.active,
      mustChangePassword: row.must_change_password,
      displayUnits: row.display_units,
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
