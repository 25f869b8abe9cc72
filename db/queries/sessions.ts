import "server-only";
import { db } from "@/db";
import { prepared } from "@/db/prepared";

/**
 * Sessions and sign-in failures: the rows behind lib/auth (Lucia's storage and the sign-in
 * throttle). lib/auth decides; these only read and write.
 */

export interface SessionRow {
  id: string;
  user_id: string;
  expires_at: Date;
}

export interface SessionUserRow extends SessionRow {
  email: string;
  name: string;
  active: boolean;
  must_change_password: boolean;
  display_units: "mm" | "in" | null;
  roles: string[];
}

/**
 * A session with its user and roles, in one round trip (every request validates its session), as a
 * prepared statement: planned once per pooled connection, not on every request (db/prepared.ts).
 */
export async function findSessionWithUser(sessionId: string): Promise<SessionUserRow | undefined> {
  const { rows } = await prepared(
    db().raw(
      `SELECT s.id, s.user_id, s.expires_at,
            u.email, u.name, u.active, u.must_change_password, u.display_units,
            coalesce((SELECT array_agg(r.role ORDER BY r.role) FROM user_roles r WHERE r.user_id = u.id), '{}') AS roles
       FROM user_sessions s JOIN users u ON u.id = s.user_id
      WHERE s.id = ?`,
      [sessionId],
    ),
  );
  return rows[0] as SessionUserRow | undefined;
}

export async function listUserSessions(userId: string): Promise<SessionRow[]> {
  return db()("user_sessions").where({ user_id: userId }).select("id", "user_id", "expires_at");
}

export async function insertSession(s: { id: string; userId: string; expiresAt: Date }): Promise<void> {
  await db()("user_sessions").insert({ id: s.id, user_id: s.userId, expires_at: s.expiresAt });
}

export async function extendSession(sessionId: string, expiresAt: Date): Promise<void> {
  await db()("user_sessions").where({ id: sessionId }).update({ expires_at: expiresAt });
}

export async function deleteSession(sessionId: string): Promise<void> {
  await db()("user_sessions").where({ id: sessionId }).delete();
}

export async function deleteUserSessions(userId: string): Promise<void> {
  await db()("user_sessions").where({ user_id: userId }).delete();
}

export async function deleteExpiredSessions(now = new Date()): Promise<void> {
  await db()("user_sessions").where("expires_at", "<=", now).delete();
}

// ---- sign-in failures (lib/auth/throttle.ts) ----

/** Counts (BIGINT) and ages (NUMERIC, ms) arrive as numbers (db/types.ts); an age is null when there is no failure. */
export interface FailureCounts {
  pair_n: number;
  pair_age_ms: number | null;
  client_n: number;
  client_age_ms: number | null;
  account_n: number;
  account_age_ms: number | null;
}

/** Records one attempt (a failure until forgotten); its id. */
export async function recordAttempt(account: string, client: string): Promise<number> {
  const [row] = await db()("sign_in_failures").insert({ account, client }).returning("id");
  return row!.id;
}

export async function forgetAttempt(id: number): Promise<void> {
  await db()("sign_in_failures").where({ id }).delete();
}

/** Failures of the pair, the client and the account within the window, other than attempt `own`. */
export async function failureCounts(
  account: string,
  client: string,
  own: number,
  windowSecs: number,
): Promise<FailureCounts> {
  const { rows } = await db().raw(
    `SELECT count(*) FILTER (WHERE account = :account AND client = :client) AS pair_n,
            extract(epoch FROM now() - max(at) FILTER (WHERE account = :account AND client = :client)) * 1000 AS pair_age_ms,
            count(*) FILTER (WHERE client = :client) AS client_n,
            extract(epoch FROM now() - max(at) FILTER (WHERE client = :client)) * 1000 AS client_age_ms,
            count(*) FILTER (WHERE account = :account) AS account_n,
            extract(epoch FROM now() - min(at) FILTER (WHERE account = :account)) * 1000 AS account_age_ms
       FROM sign_in_failures
      WHERE at > now() - make_interval(secs => :windowSecs)
        AND id <> :own
        AND (account = :account OR client = :client)`,
    { account, client, own, windowSecs },
  );
  return rows[0] as FailureCounts;
}

/** A right password clears the pair's failures and the attempt itself. */
export async function clearFailures(account: string, client: string, own: number): Promise<void> {
  await db()("sign_in_failures").where({ account, client }).orWhere({ id: own }).delete();
}
