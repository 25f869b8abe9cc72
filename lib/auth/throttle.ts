import "server-only";
import { clearFailures, failureCounts, forgetAttempt, recordAttempt } from "@/db/queries/sessions";
import { HttpError } from "@/lib/errors";

/**
 * Password guessing is slowed down, never turned into a lock anyone can put on someone else.
 * Failures are counted in the database (so every app server sees the same numbers), per
 * account (the lower-cased e-mail as typed) and client (see clientAddress in sign-in.ts):
 *
 *  - one client on one account: after PAIR_FREE failures it must wait, 30 s after the last
 *    failure, doubling with each further failure (at most the window). Only that client waits:
 *    the right password from anywhere else still works at once.
 *  - one client on any accounts: after CLIENT_FREE failures it must wait, 60 s doubling.
 *  - one account from every client together: never refused (that would let anyone lock anyone
 *    out); after ACCOUNT_FREE failures every attempt on it is answered a little later, up to
 *    ACCOUNT_MAX_DELAY_MS, which slows guessing from many addresses without locking the owner out.
 *
 * An attempt is counted as a failure before its password is checked and forgiven when it was
 * right, so a burst of parallel guesses sees itself. Refused attempts are not counted: waiting
 * out a Retry-After is enough.
 */
export const WINDOW_MS = 15 * 60 * 1000;
export const PAIR_FREE = 5;
export const PAIR_BASE_MS = 30_000;
export const CLIENT_FREE = 30;
export const CLIENT_BASE_MS = 60_000;
export const ACCOUNT_FREE = 10;
export const ACCOUNT_STEP_MS = 250;
export const ACCOUNT_MAX_DELAY_MS = 3_000;

/** Changing one's own password: the session holder alone can cause this limit, so it may refuse. */
export const PASSWORD_CHANGE_MAX = 10;

/**
 * The account key of a password change. Sign-in keys are lower-cased, so an upper-case prefix
 * can never be produced by typing an e-mail on the sign-in form.
 */
export const passwordChangeKey = (userId: string) => `PASSWORD-CHANGE ${userId}`;

/** How long a key must wait after its last failure: nothing below `free` failures, then doubling. */
export function backoffMs(failures: number, free: number, baseMs: number): number {
  if (failures < free) return 0;
  return Math.min(WINDOW_MS, baseMs * 2 ** Math.min(failures - free, 20));
}

/** The delay every attempt on an account gets once it has had many failures from anywhere. */
export function accountDelayMs(failures: number): number {
  if (failures < ACCOUNT_FREE) return 0;
  return Math.min(ACCOUNT_MAX_DELAY_MS, ACCOUNT_STEP_MS * (failures - ACCOUNT_FREE + 1));
}

export interface Attempt {
  /** The password was right: forget this attempt and this client's earlier failures on the account. */
  succeeded(): Promise<void>;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function tooMany(waitMs: number, what: string): HttpError {
  const retry = Math.max(1, Math.ceil(waitMs / 1000));
  const when = retry < 60 ? `${retry} second(s)` : `${Math.ceil(retry / 60)} minute(s)`;
  return new HttpError(429, `Too many failed ${what} from here. Try again in ${when}.`, undefined, {
    "Retry-After": String(retry),
  });
}

/**
 * Records an attempt on `account` from `client` and waits or refuses as the limits say (429 with
 * Retry-After). Call before checking the password; call `succeeded()` when it was right.
 * `accountMax` turns the account-wide slow-down into a refusal (only for keys no stranger can
 * reach, such as a signed-in user's own password change).
 */
export async function beginAttempt(
  account: string,
  client: string,
  opts: { what?: string; accountMax?: number } = {},
): Promise<Attempt> {
  const what = opts.what ?? "sign-ins";
  const own = await recordAttempt(account, client);
  const forget = () => forgetAttempt(own);
  const c = await failureCounts(account, client, own, WINDOW_MS / 1000);
  const n = (v: number | null) => v ?? 0;

  const waits = [
    backoffMs(n(c.pair_n), PAIR_FREE, PAIR_BASE_MS) - n(c.pair_age_ms),
    backoffMs(n(c.client_n), CLIENT_FREE, CLIENT_BASE_MS) - n(c.client_age_ms),
  ];
  if (opts.accountMax !== undefined && n(c.account_n) >= opts.accountMax) {
    waits.push(WINDOW_MS - n(c.account_age_ms)); // until the oldest failure leaves the window
  }
  const wait = Math.max(...waits);
  if (wait > 0) {
    await forget();
    throw tooMany(wait, what);
  }
  const delay = accountDelayMs(n(c.account_n));
  if (delay > 0) await sleep(delay);
  return {
    async succeeded() {
      await clearFailures(account, client, own);
    },
  };
}
