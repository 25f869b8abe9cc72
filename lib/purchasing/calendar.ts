/**
 * The shop calendar for purchasing, pure: which weekdays are working days, and counting in them.
 * Suppliers quote lead times in working days, and foam is cut only on working days, so the reorder
 * sums measure everything in working days: daily use d and its spread σd per working day, lead time
 * L and its spread σL in working days. Nothing is converted back and forth; the calendar is needed
 * only to turn dates into working days (use history, promised and received dates) and a lead time
 * into the calendar date it ends on. Public holidays are not modelled.
 *
 * Weekdays are ISO numbers: 1 Monday … 7 Sunday. Dates are "YYYY-MM-DD" calendar days.
 */

export type Weekday = 1 | 2 | 3 | 4 | 5 | 6 | 7;

export const DEFAULT_WORKING_DAYS: readonly Weekday[] = [1, 2, 3, 4, 5];

export const WEEKDAY_NAMES: Record<Weekday, string> = {
  1: "Mon",
  2: "Tue",
  3: "Wed",
  4: "Thu",
  5: "Fri",
  6: "Sat",
  7: "Sun",
};

const DAY_MS = 86_400_000;
const toUtc = (date: string) => Date.parse(`${date.slice(0, 10)}T00:00:00Z`);
const fromUtc = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/**
 *   weekday("2026-12-04")  // 5 (a Friday)
 */
export function weekday(date: string): Weekday {
  const d = new Date(toUtc(date)).getUTCDay(); // 0 Sunday
  return (d === 0 ? 7 : d) as Weekday;
}

/** A calendar that has at least one working day (an empty one would never end a lead time). */
function checked(days: readonly number[]): ReadonlySet<number> {
  const set = new Set(days.filter((d) => Number.isInteger(d) && d >= 1 && d <= 7));
  if (!set.size) throw new RangeError("the shop calendar needs at least one working day");
  return set;
}

export function isWorkingDay(date: string, days: readonly number[] = DEFAULT_WORKING_DAYS): boolean {
  return checked(days).has(weekday(date));
}

/**
 * The calendar date `n` working days after `date` (n ≥ 0; 0 gives `date` itself).
 *
 *   addWorkingDays("2026-12-04", 12)  // "2026-12-22": Friday + 12 working days, Mon–Fri
 */
export function addWorkingDays(date: string, n: number, days: readonly number[] = DEFAULT_WORKING_DAYS): string {
  const set = checked(days);
  let ms = toUtc(date);
  let left = Math.max(0, Math.ceil(n));
  while (left > 0) {
    ms += DAY_MS;
    if (set.has(weekday(fromUtc(ms)))) left--;
  }
  return fromUtc(ms);
}

/**
 * Working days from `from` to `to`: the working days d with from < d ≤ to, negative when `to` is
 * before `from` (a delivery that came early).
 *
 *   workingDaysBetween("2026-12-04", "2026-12-08")  // 2 (Mon 7, Tue 8)
 *   workingDaysBetween("2026-12-08", "2026-12-04")  // -2
 */
export function workingDaysBetween(from: string, to: string, days: readonly number[] = DEFAULT_WORKING_DAYS): number {
  const set = checked(days);
  const a = toUtc(from);
  const b = toUtc(to);
  if (b < a) return -workingDaysBetween(to, from, days);
  let n = 0;
  for (let ms = a + DAY_MS; ms <= b; ms += DAY_MS) if (set.has(weekday(fromUtc(ms)))) n++;
  return n;
}

/** Working days in an average year: the working weekdays × 365/7 (Mon–Fri: 260.7). */
export function workingDaysPerYear(days: readonly number[] = DEFAULT_WORKING_DAYS): number {
  return (checked(days).size * 365) / 7;
}

/**
 * A daily series over the working days from `since` to `today` (both included), from quantities
 * by calendar date. What happened on a day off (a Saturday shift) counts on the working day before
 * it, or on the first working day of the window when there is none before it; nothing is lost.
 *
 *   workingDaySeries(new Map([["2026-12-05", 3]]), "2026-12-04", "2026-12-07")  // [3, 0]: Sat → Fri
 */
export function workingDaySeries(
  byDate: ReadonlyMap<string, number>,
  since: string,
  today: string,
  days: readonly number[] = DEFAULT_WORKING_DAYS,
): number[] {
  const set = checked(days);
  const series: number[] = [];
  let carry = 0;
  for (let ms = toUtc(since); ms <= toUtc(today); ms += DAY_MS) {
    const date = fromUtc(ms);
    const v = byDate.get(date) ?? 0;
    if (set.has(weekday(date))) {
      series.push(v + carry);
      carry = 0;
    } else if (series.length) series[series.length - 1]! += v;
    else carry += v;
  }
  if (carry && series.length) series[0]! += carry;
  return series;
}

/** "Mon–Fri", "Mon–Sat", "Mon, Wed, Fri". */
export function describeWorkingDays(days: readonly number[]): string {
  const sorted = [...checked(days)].sort((a, b) => a - b) as Weekday[];
  const run = sorted.every((d, i) => i === 0 || d === sorted[i - 1]! + 1);
  if (run && sorted.length > 2) return `${WEEKDAY_NAMES[sorted[0]!]}–${WEEKDAY_NAMES[sorted[sorted.length - 1]!]}`;
  return sorted.map((d) => WEEKDAY_NAMES[d]).join(", ");
}
