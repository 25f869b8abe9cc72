import pg from "pg";

/**
 * How column values arrive from PostgreSQL, set once for every connection of the process (the app,
 * the worker, the scripts and the tests all load this through db/index.ts, knexfile.ts or
 * tests/support/db.ts):
 * - NUMERIC (oid 1700) and BIGINT (20, e.g. count(*)) as numbers — sizes, volumes, money and counts
 *   here stay far inside a double's exact range;
 * - DATE (1082) as its 'YYYY-MM-DD' text: a calendar day has no time zone, and a Date object would
 *   shift it by the server's offset.
 * db/tables.ts (generated) declares the row types to match.
 */
const NUMERIC = 1700;
const INT8 = 20;
const DATE = 1082;
pg.types.setTypeParser(NUMERIC, (v) => Number.parseFloat(v));
pg.types.setTypeParser(INT8, (v) => Number.parseInt(v, 10));
pg.types.setTypeParser(DATE, (v) => v);

export const TYPE_PARSERS = { NUMERIC, INT8, DATE } as const;
