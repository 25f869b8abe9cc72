/**
 * How dates and counts read everywhere in Blockyard, on the server and in the browser alike.
 * Dates are ISO 8601 (YYYY-MM-DD), the shop's own calendar day: there is no shop date-format
 * setting, and ISO reads the same in every country (12/4 is April in one and December in another).
 *
 *   formatDate("2026-12-04T09:30:00Z")  // "2026-12-04" (local day)
 *   plural(1, "day")                    // "1 day"
 *   plural(3, "person", "people")       // "3 people"
 *   formatMoney(18807.3)                // "$18,807.30"
 *   formatPercent(0.9123)               // "91.2 %"
 */

const pad = (n: number) => String(n).padStart(2, "0");

/** A date-only value ("2026-12-04", a DATE column) is a calendar day already: never shifted by a time zone. */
const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

function toDate(value: Date | string): Date | null {
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

/** YYYY-MM-DD on the local calendar; "–" for nothing; text that is not a date comes back as it is. */
export function formatDate(value: Date | string | null | undefined): string {
  if (value === null || value === undefined || value === "") return "–";
  if (typeof value === "string" && DATE_ONLY.test(value)) return value;
  const d = toDate(value);
  if (!d) return String(value);
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** HH:MM on a 24-hour clock, local time. */
export function formatTime(value: Date | string): string {
  const d = toDate(value);
  if (!d) return String(value);
  return `${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** YYYY-MM-DD HH:MM, local time: for ledger rows and sent mail. */
export function formatDateTime(value: Date | string | null | undefined): string {
  if (value === null || value === undefined || value === "") return "–";
  const d = toDate(value);
  if (!d) return String(value);
  return `${formatDate(d)} ${formatTime(d)}`;
}

/** The word for a count: noun(1, "block") → "block", noun(2, "block") → "blocks". */
export function noun(count: number, one: string, many = `${one}s`): string {
  return count === 1 ? one : many;
}

/** A count and its word: plural(1, "day") → "1 day", plural(1200, "piece") → "1,200 pieces". */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count.toLocaleString("en")} ${noun(count, one, many)}`;
}

/**
 * Money, written once: US dollars with cents (whole dollars with `{ whole: true }`, for charts and
 * report totals); "–" for nothing.
 */
export function formatMoney(value: number | null | undefined, opts: { whole?: boolean } = {}): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "–";
  return (opts.whole ? WHOLE_DOLLARS : DOLLARS).format(value);
}
// Built once (`toLocaleString` with options builds a formatter on every call; a stock page makes hundreds).
const DOLLARS = new Intl.NumberFormat("en", { style: "currency", currency: "USD" });
const WHOLE_DOLLARS = new Intl.NumberFormat("en", { style: "currency", currency: "USD", maximumFractionDigits: 0 });

/** A fraction as a percent with one decimal and a thin space before the sign: 0.9123 → "91.2 %". */
export function formatPercent(fraction: number | null | undefined, digits = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return "–";
  return `${(fraction * 100).toFixed(digits)} %`;
}
