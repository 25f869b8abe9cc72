import fs from "node:fs";
import path from "node:path";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";
import { formatDate, formatDateTime, formatMoney, formatPercent, formatTime, noun, plural } from "@/lib/format";
import { formatMachineSize, formatSize, formatVolume } from "@/lib/units";

vi.mock("next/navigation", () => ({ useRouter: () => ({ push() {}, refresh() {} }) }));

const { SupplierEditor } = await import("@/components/stock/supplier-editor");

describe("one date format: ISO YYYY-MM-DD, the shop's calendar day", () => {
  it("passes a calendar day through unchanged, whatever the time zone", () => {
    expect(formatDate("2026-12-04")).toBe("2026-12-04");
    expect(formatDate("2026-01-01")).toBe("2026-01-01");
  });

  it("writes a timestamp as its local day, never as 12/4/2026", () => {
    const at = new Date(2026, 11, 4, 9, 5); // 4 December 2026, 09:05 local
    expect(formatDate(at)).toBe("2026-12-04");
    expect(formatDate(at.toISOString())).toBe("2026-12-04");
    expect(formatDateTime(at)).toBe("2026-12-04 09:05");
    expect(formatTime(at.toISOString())).toBe("09:05");
    expect(formatDate(at)).not.toBe(at.toLocaleDateString("en-US"));
  });

  it("shows a dash for nothing and leaves text that is not a date alone", () => {
    expect(formatDate(null)).toBe("–");
    expect(formatDate(undefined)).toBe("–");
    expect(formatDateTime(null)).toBe("–");
    expect(formatDate("soon")).toBe("soon");
  });
});

describe("plurals", () => {
  it("says 1 day and 2 days, 0 blocks and 1 block", () => {
    expect(plural(1, "day")).toBe("1 day");
    expect(plural(2, "day")).toBe("2 days");
    expect(plural(0, "block")).toBe("0 blocks");
    expect(plural(1, "block")).toBe("1 block");
    expect(plural(1.5, "day")).toBe("1.5 days");
  });

  it("takes an irregular plural and groups thousands", () => {
    expect(plural(1, "delivery", "deliveries")).toBe("1 delivery");
    expect(plural(3, "delivery", "deliveries")).toBe("3 deliveries");
    expect(plural(1200, "piece")).toBe("1,200 pieces");
    expect(noun(1, "step")).toBe("step");
    expect(noun(7, "step")).toBe("steps");
  });

  it('writes "Lead time 1 day" on the suppliers page, not "Lead time 1 days"', () => {
    const supplier = (id: number, leadTimeDays: number) => ({
      id,
      name: `Supplier ${id}`,
      contact: null,
      email: null,
      phone: null,
      leadTimeDays,
      leadTimeSdDays: 0,
      notes: null,
      active: true,
    });
    const html = renderToStaticMarkup(createElement(SupplierEditor, { suppliers: [supplier(1, 1), supplier(2, 14)] }));
    expect(html).toMatch(/Lead time 1 (working )?day</);
    expect(html).toMatch(/Lead time 14 (working )?days</);
    expect(html).not.toMatch(/\b1 (working )?days/);
  });
});

describe("the sources use the one formatter", () => {
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, e.name);
      if (e.isDirectory()) walk(full);
      else if (/\.tsx?$/.test(e.name)) files.push(full);
    }
  };
  for (const d of ["app", "components", "lib"]) walk(path.join(process.cwd(), d));

  it("formats no date with the browser's or server's locale (12/4/2026 in one place, 2026-12-04 in another)", () => {
    const offenders = files.filter((f) => /\.toLocale(Date|Time)String\(/.test(fs.readFileSync(f, "utf8")));
    expect(offenders.map((f) => path.relative(process.cwd(), f))).toEqual([]);
  });

  it('writes no count on a page with a fixed plural ("{n} days", "day(s)")', () => {
    // A variable count (lower-case name) followed by a plural word; constants such as {RECENT_DAYS} are never 1.
    const fixed = /(\{[a-z][\w.()[\]]*\}|\$\{[a-z][\w.()[\]]*\}) (days|blocks|rows|jobs|steps|pieces)\b/;
    const either = /\b(day|block|row|grade|buyer|piece|job|step|part)\(s\)/;
    const pages = files.filter((f) => !f.includes(`${path.sep}lib${path.sep}`));
    const offenders = [
      ...pages.filter((f) => fixed.test(fs.readFileSync(f, "utf8"))),
      ...files.filter((f) => either.test(fs.readFileSync(f, "utf8"))),
    ];
    expect(offenders.map((f) => path.relative(process.cwd(), f))).toEqual([]);
  });
});

describe("money and percent, written once", () => {
  it("formats dollars with cents, whole dollars on request, and a dash for nothing", () => {
    expect(formatMoney(18807.333)).toBe("$18,807.33");
    expect(formatMoney(0)).toBe("$0.00");
    expect(formatMoney(1234.5, { whole: true })).toBe("$1,235");
    expect(formatMoney(null)).toBe("–");
    expect(formatMoney(Number.NaN)).toBe("–");
  });

  it("formats a fraction as a percent", () => {
    expect(formatPercent(0.9123)).toBe("91.2 %");
    expect(formatPercent(1)).toBe("100.0 %");
    expect(formatPercent(undefined)).toBe("–");
  });

  it("no page, component or module formats currency by hand", () => {
    const walk = (dir: string): string[] =>
      fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
        const p = path.join(dir, e.name);
        return e.isDirectory() ? walk(p) : /\.tsx?$/.test(e.name) ? [p] : [];
      });
    const offenders = ["app", "components", "lib"]
      .flatMap(walk)
      .filter((f) => !f.endsWith(path.join("lib", "format.ts")))
      .filter((f) => /style:\s*"currency"/.test(fs.readFileSync(f, "utf8")));
    expect(offenders).toEqual([]);
  });
});

describe("sizes in the reader's unit", () => {
  // 1 in = 25.4 mm exactly (the 1959 international yard and pound agreement).
  it("writes inches to 0.01 and millimetres to 0.1; at the machine millimetres first, inches beside", () => {
    expect(formatSize([1270, 762, 508], "in")).toBe("50 × 30 × 20 in");
    expect(formatSize([1.5, 1000.04, 254.05], "mm")).toBe("1.5 × 1000 × 254.1 mm");
    expect(formatMachineSize([1270, 762, 1.5], "in")).toBe("1270 × 762 × 1.5 mm (50 × 30 × 0.06 in)");
    expect(formatMachineSize([1270, 762, 508], "mm")).toBe("1270 × 762 × 508 mm");
  });
});

describe("volume, written once", () => {
  it("writes cubic metres to fixed places with thousands grouped, board feet on request", () => {
    expect(formatVolume(1.5)).toBe("1.500 m³");
    expect(formatVolume(1234.5678, { digits: 2 })).toBe("1,234.57 m³");
    // 1 m³ = 423.776 BF (144 in³ per board foot, 25.4 mm per inch; exact definitions)
    expect(formatVolume(1, { digits: 0, boardFeet: true })).toBe("1 m³ · 424 BF");
  });

  it('no page, component or module writes "m³" after a hand-rounded number', () => {
    const walk = (dir: string): string[] =>
      fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
        const p = path.join(dir, e.name);
        return e.isDirectory() ? walk(p) : /\.tsx?$/.test(e.name) ? [p] : [];
      });
    const offenders = ["app", "components", "lib"]
      .flatMap(walk)
      .filter((f) => /toFixed\(\d\)\s*\}?\s*m³/.test(fs.readFileSync(f, "utf8")));
    expect(offenders).toEqual([]);
  });
});
