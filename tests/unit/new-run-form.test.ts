import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";
import { runSettingsSchema, secondsToMs } from "@/lib/validations/runs";

vi.mock("next/navigation", () => ({ useRouter: () => ({ push() {}, refresh() {} }) }));

const { NewRunForm } = await import("@/components/plans/new-run-form");

const SETTINGS = {
  kerf: 1.5,
  trim: 10,
  defectMargin: 20,
  minOffcut: [200, 200, 25] as [number, number, number],
  layout: "guillotine" as const,
  timeLimitMs: 8000,
};

const html = renderToStaticMarkup(
  createElement(NewRunForm, {
    jobIds: [1],
    candidates: [
      {
        id: 7,
        code: "HF-1001",
        gradeCode: "EPS-II",
        size: [4877, 1219, 1219],
        volumeM3: 1.381,
        cost: 100,
        isOffcut: false,
        location: "Bay 2",
        defectCount: 0,
        since: "2026-01-01",
      },
    ],
    defaults: SETTINGS,
    machines: [{ id: 1, name: "Bench cutter" }],
  }),
);

describe("the new-plan form", () => {
  it("pads every header and cell of the stock table, so m³ and Since do not run together", () => {
    const cells = [...html.matchAll(/<(th|td)( class="([^"]*)")?>/g)].map((m) => m[3] ?? "");
    expect(cells.length).toBe(16);
    for (const c of cells) expect(c, c).toMatch(/\b(px|pl|pr)-\d/);
    // Neighbouring figures sit in padded cells of their own: "1.381" then "2026-01-01".
    expect(html).toMatch(/tabular-nums">1\.381<\/td><td class="[^"]*px-3[^"]*">2026-01-01<\/td>/);
  });

  it("asks for the time budget in seconds, with the shop default converted", () => {
    expect(html).toContain(">Time budget (seconds)</label>");
    expect(html).toMatch(/<input[^>]*name="timeBudgetS"[^>]*>/);
    const input = html.match(/<input[^>]*name="timeBudgetS"[^>]*>/)![0];
    expect(input).toContain('value="8"');
    expect(input).toContain('inputMode="decimal"');
    expect(html).not.toContain("(ms)");
  });

  it("sends milliseconds to the API: 0.5 s → 500, 4 s → 4000, 120 s → 120000; empty stays empty", () => {
    expect(secondsToMs(0.5)).toBe(500);
    expect(secondsToMs(4)).toBe(4000);
    expect(secondsToMs(120)).toBe(120_000);
    expect(secondsToMs(1.2345)).toBe(1235);
    expect(secondsToMs(null)).toBeNull();
  });

  it("names the time budget, in seconds, when it is out of range or missing", () => {
    const msg = (timeLimitMs: unknown) => {
      const r = runSettingsSchema.safeParse({ ...SETTINGS, timeLimitMs });
      return r.success ? null : r.error.issues[0]!.message;
    };
    expect(msg(500)).toBeNull();
    expect(msg(120_000)).toBeNull();
    expect(msg(secondsToMs(0.4))).toBe("Time budget must be at least 0.5 s.");
    expect(msg(secondsToMs(121))).toBe("Time budget must be at most 120 s.");
    expect(msg(null)).toBe("Time budget must be a number: 0.5 to 120 seconds.");
  });
});
