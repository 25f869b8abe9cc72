/**
 * The private PostgreSQL and the S3 fake that `npm start` and `npm test` run have no passwords
 * (trust authentication; the fake's fixed S3RVER key): they may listen on this machine's loopback
 * address only. Their host can be changed (BLOCKYARD_PG_HOST, BLOCKYARD_S3_HOST, e.g. to ::1 on an
 * IPv6-only machine) but never to an address another machine can reach.
 *
 *   isLoopback("127.0.0.1")                           // true (also 127.x.x.x, ::1, [::1], localhost)
 *   loopbackHost("BLOCKYARD_PG_HOST", "0.0.0.0")      // throws NotLoopback, saying what to do instead
 *   urlHost("::1")                                    // "[::1]"
 */

export const DEFAULT_LOOPBACK = "127.0.0.1";

/** True for a host that only this machine can reach. Lists, wildcards and names other than localhost are not. */
export function isLoopback(host: string): boolean {
  let h = host.trim().toLowerCase();
  if (h.startsWith("[") && h.endsWith("]")) h = h.slice(1, -1);
  if (h === "localhost" || h === "::1" || h === "0:0:0:0:0:0:0:1") return true;
  const v4 = /^(?:::ffff:)?(\d{1,3})\.(\d{1,3})\.(\d{1,3})\.(\d{1,3})$/.exec(h);
  return !!v4 && v4[1] === "127" && v4.slice(2).every((o) => Number(o) <= 255 && (o === "0" || !o.startsWith("0")));
}

export class NotLoopback extends Error {
  constructor(
    readonly variable: string,
    readonly value: string,
    what: string,
    instead: string,
  ) {
    super(
      `${variable}=${value} refused: ${what}, so it listens on this machine's loopback address only ` +
        `(127.0.0.1, ::1 or localhost), never on an address other machines can reach. ${instead}`,
    );
    this.name = "NotLoopback";
  }
}

const SERVICES: Record<string, { what: string; instead: string }> = {
  BLOCKYARD_PG_HOST: {
    what: "the private PostgreSQL that npm start runs lets anyone in without a password",
    instead: "To use a PostgreSQL elsewhere (with a password), set DATABASE_URL and none is started.",
  },
  BLOCKYARD_S3_HOST: {
    what: "the local S3 fake that npm start runs takes the well-known key S3RVER",
    instead: "To use a real bucket, set S3_ENDPOINT (see README, Photo storage) and none is started.",
  },
};

/**
 * The host a password-less local service may listen on: `value` when it is loopback, 127.0.0.1
 * when unset or blank; anything else throws `NotLoopback` naming the variable.
 */
export function loopbackHost(variable: string, value: string | undefined): string {
  const v = value?.trim() ?? "";
  if (!v) return DEFAULT_LOOPBACK;
  if (!isLoopback(v)) {
    const s = SERVICES[variable] ?? { what: "this local service has no password", instead: "" };
    throw new NotLoopback(variable, v, s.what, s.instead);
  }
  return v.replace(/^\[(.*)\]$/, "$1");
}

/** A host as it goes in a URL: IPv6 addresses in brackets. */
export function urlHost(host: string): string {
  return host.includes(":") ? `[${host}]` : host;
}

/**
 * `npm start` checks both hosts before it starts anything: a service that is not started (DATABASE_URL,
 * S3_ENDPOINT set) is not checked. Throws `NotLoopback` for the first one off loopback.
 */
export function checkLocalServiceHosts(env: Record<string, string | undefined>): void {
  if (!env.DATABASE_URL) loopbackHost("BLOCKYARD_PG_HOST", env.BLOCKYARD_PG_HOST);
  if (!env.S3_ENDPOINT) loopbackHost("BLOCKYARD_S3_HOST", env.BLOCKYARD_S3_HOST);
}
