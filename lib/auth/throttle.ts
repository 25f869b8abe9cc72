import "server-only";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";

// Failed sign-ins are counted in the database so every app server sees the same numbers.
export const WINDOW_MS = 15 * 60 * 1000;
export const MAX_PER_ACCOUNT = 5;
export const MAX_PER_CLIENT = 30;

export async function checkThrottle(account: string, client: string): Promise<void> {
  const since = new Date(Date.now() - WINDOW_MS);
  const [acc, cli] = await Promise.all([
    db()("sign_in_failures")
      .where("account", account)
      .where("at", ">", since)
      .count<{ n: string }[]>({ n: "*" })
      .min({ first: "at" })
      .first(),
    db()("sign_in_failures")
      .where("client", client)
      .where("at", ">", since)
      .count<{ n: string }[]>({ n: "*" })
      .min({ first: "at" })
      .first(),
  ]);
  for (const [row, max] of [
    [acc, MAX_PER_ACCOUNT],
    [cli, MAX_PER_CLIENT],
  ] as const) {
    const r = row as unknown as { n: string; first: Date | null } | undefined;
    if (r && Number(r.n) >= max && r.first) {
      const retry = Math.max(1, Math.ceil((new Date(r.first).getTime() + WINDOW_MS - Date.now()) / 1000));
      throw new HttpError(
        429,
        `Too many failed sign-ins. Try again in ${Math.ceil(retry / 60)} minute(s).`,
        undefined,
        {
          "Retry-After": String(retry),
        },
      );
    }
  }
}

export async function recordFailure(account: string, client: string): Promise<void> {
  await db()("sign_in_failures").insert({ account, client });
}

export async function clearFailures(account: string): Promise<void> {
  await db()("sign_in_failures").where({ account }).delete();
}
