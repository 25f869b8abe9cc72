/**
 * The loop of an anytime search, shared by the box nesting and the true-shape engine: step until
 * the search says it is done (budget, bound or abort), report progress at most every 100 ms of the
 * handed-in clock, and yield to the event loop every 20 ms so an abort or a progress bar can act.
 * Without a clock it reports and yields after every step. Pure: the clock is the caller's.
 *
 *   await runAnytime(search, { now: () => performance.now(), signal, onProgress }, () => report(search, options));
 */
export interface AnytimeSearch {
  done(signal?: AbortSignal): boolean;
  step(): void;
}

export async function runAnytime(
  search: AnytimeSearch,
  options: { now?: () => number; signal?: AbortSignal; onProgress?: unknown },
  report: () => void,
): Promise<void> {
  let lastYield = options.now?.() ?? 0;
  let lastReport = -Infinity;
  while (!search.done(options.signal)) {
    search.step();
    const t = options.now?.() ?? 0;
    if (options.onProgress && (!options.now || t - lastReport >= 100)) {
      report();
      lastReport = t;
    }
    if (!options.now || t - lastYield >= 20) {
      await new Promise<void>((resolve) => setTimeout(resolve, 0));
      lastYield = options.now?.() ?? 0;
    }
  }
  report();
}
