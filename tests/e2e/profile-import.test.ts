/**
 * A planner brings shapes in: a DXF written here to a temp file (a window frame: a 200 × 120 mm
 * rectangle with a round hole of radius 30), drawn to scale before it is added; a drawing with no
 * unit asks for one; the word "OPEN" in the shipped font; the wing panel laid out in plan and
 * section. Screenshots at the tablet width (820 px) and wide.
 */
import fs from "node:fs";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { closeTestDb, testDb } from "../support/db";
import { JobsPage } from "./pages/jobs";

const AXE = createRequire(import.meta.url).resolve("axe-core/axe.min.js");

/**
 * Serious or critical WCAG 2.1 A/AA violations on the page as it stands, by axe-core (the rules
 * and threshold of tests/e2e/a11y.test.ts).
 */
async function axeProblems(page: Page): Promise<string[]> {
  await page.addScriptTag({ path: AXE });
  const found = (await page.evaluate(() =>
    (window as any).axe.run(document, {
      runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] },
    }),
  )) as { violations: { id: string; impact: string | null; nodes: { target: string[] }[] }[] };
  return found.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
}

let browser: Browser;
let dir: string;
beforeAll(async () => {
  browser = await launch();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "blockyard-dxf-"));
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

const g = (code: number, value: string | number) => `${code}\n${value}`;
function dxf(entities: string[], insunits: number | null): string {
  const header =
    insunits === null ? [] : [g(0, "SECTION"), g(2, "HEADER"), g(9, "$INSUNITS"), g(70, insunits), g(0, "ENDSEC")];
  return [...header, g(0, "SECTION"), g(2, "ENTITIES"), ...entities, g(0, "ENDSEC"), g(0, "EOF"), ""].join("\n");
}
const rect = (h: string, w: number, hgt: number) =>
  [
    g(0, "LWPOLYLINE"),
    g(5, h),
    g(8, "0"),
    g(90, 4),
    g(70, 1),
    ...[
      [0, 0],
      [w, 0],
      [w, hgt],
      [0, hgt],
    ].flatMap(([x, y]) => [g(10, x!), g(20, y!)]),
  ].join("\n");
const circle = (h: string, cx: number, cy: number, r: number) =>
  [g(0, "CIRCLE"), g(5, h), g(8, "0"), g(10, cx), g(20, cy), g(40, r)].join("\n");

function writeDxf(name: string, text: string): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, text);
  return file;
}

/** The outline's drawn width in the sheet's own units, over its scale: the width in mm it shows. */
async function drawnWidthMm(
  page: Page,
  index = 0,
): Promise<{ drawn: number; said: number; bar: number; barDrawn: number }> {
  return page.getByTestId("profile-sheet").evaluate((svg, i) => {
    const k = Number(svg.getAttribute("data-px-per-mm"));
    const cell = svg.querySelectorAll('[data-testid="sheet-profile"]')[i]!;
    const outline = cell.querySelector('[data-role="outline"]') as SVGGraphicsElement;
    const bar = svg.querySelector('[data-testid="scale-bar"]')!;
    const rects = [...bar.querySelectorAll("rect")].map((r) => Number(r.getAttribute("width")));
    return {
      drawn: outline.getBBox().width / k,
      said: Number(cell.getAttribute("data-width-mm")),
      bar: Number(bar.getAttribute("data-length-mm")),
      barDrawn: rects.reduce((s, w) => s + w, 0) / k,
    };
  }, index);
}

async function chooseShape(page: Page, label: string) {
  await page.getByLabel(label, { exact: true }).check();
}

describe("a planner imports shapes", () => {
  it("imports a DXF, sees it to scale with its dimensions, adds it with its true area", async () => {
    const page = await signedInPage(browser, "planner", VIEWPORTS.wide);
    const jobs = new JobsPage(page);
    await jobs.openList();
    const jobId = await jobs.createJob("Window frames — Quarry Road", "Quarry Road Studio", "2026-12-21");

    await chooseShape(page, "From a drawing");
    const file = writeDxf("frame.dxf", dxf([rect("2A", 200, 120), circle("2B", 100, 60, 30)], 4));
    await page.getByLabel("Drawing file (DXF or SVG)").setInputFiles(file);
    const sheet = page.getByTestId("profile-sheet");
    await sheet.waitFor();
    // Drawn to scale: the outline's drawn width over the sheet's scale is its 200 mm, and so is the bar's.
    const m = await drawnWidthMm(page);
    expect(m.said).toBe(200);
    expect(Math.abs(m.drawn - 200)).toBeLessThan(0.5);
    expect(Math.abs(m.barDrawn - m.bar)).toBeLessThan(0.01);
    const sheetText = (await sheet.textContent()) ?? "";
    expect(sheetText).toContain("200 mm");
    expect(sheetText).toContain("120 mm");
    expect(sheetText).toContain("frame.dxf");
    // The hole is drawn: the outline's path has two loops, filled even-odd.
    const d = (await sheet.locator('[data-role="outline"]').getAttribute("d")) ?? "";
    expect(d.match(/M/g)?.length).toBe(2);
    expect(await sheet.locator('[data-role="outline"]').getAttribute("fill-rule")).toBe("evenodd");

    await page.getByLabel("Part name").fill("Window frame");
    await page.getByLabel("Quantity", { exact: true }).fill("3");
    expect(await axeProblems(page)).toEqual([]);
    await page.getByLabel("Extrusion mm (along the wire)").fill("40");
    await expect
      .poll(async () => (await page.getByTestId("import-volume").textContent()) ?? "")
      .toMatch(/frame\.dxf 0\.847 dm³/);
    await screenshot(page, "profile-import-dxf-wide");
    await jobs.submitPart();
    await page.getByText("Window frame added.").waitFor();
    await expect.poll(() => jobs.partRows().count(), { timeout: 20_000 }).toBe(1);
    const rowText = (await jobs.partRows().first().textContent()) ?? "";
    expect(rowText).toMatch(/Window frame/);
    expect(rowText).toMatch(/Polygon, \d+ points, 1 hole × 40 mm, 21,1\d\d mm² · frame\.dxf/);
    expect(rowText).toMatch(/0\.85/); // dm³ each
    // True area: 200 × 120 − π·30² = 21,172.6 mm² (hand-worked); the flattened hole is at most
    // 2π·30 × 0.05 mm smaller, so the foam is at most that much more.
    const row = (await testDb()("job_parts")
      .where({ job_id: jobId })
      .first("true_volume_mm3", "size_x", "size_y", "size_z", "quantity"))!;
    const area = Number(row.true_volume_mm3) / 40;
    expect(area).toBeGreaterThan(200 * 120 - Math.PI * 900);
    expect(area).toBeLessThan(200 * 120 - Math.PI * 900 + 2 * Math.PI * 30 * 0.05);
    expect([Number(row.size_x), Number(row.size_y), Number(row.size_z), row.quantity]).toEqual([40, 200, 120, 3]);

    await page.setViewportSize(VIEWPORTS.tablet);
    await page.reload();
    await page.getByTestId("job-parts").waitFor();
    const shot = await screenshot(page, "profile-import-job-tablet");
    expect(fs.statSync(shot).size).toBeGreaterThan(20_000);
    await page.context().close();
  });

  it("a DXF without a unit: the unit field says so (tied to it for screen readers); inches read it × 25.4", async () => {
    const page = await signedInPage(browser, "planner", VIEWPORTS.tablet);
    const jobs = new JobsPage(page);
    await jobs.openList();
    await jobs.createJob("Inch drawings", "Harbour Signs", "2026-12-22");
    await chooseShape(page, "From a drawing");
    await page
      .getByLabel("Drawing file (DXF or SVG)")
      .setInputFiles(writeDxf("plate.dxf", dxf([rect("1", 4, 2)], null)));
    const unit = page.getByLabel("Drawing unit");
    await expect.poll(() => unit.getAttribute("aria-invalid")).toBe("true");
    const describedBy = await unit.getAttribute("aria-describedby");
    expect(await page.locator(`#${describedBy}`).textContent()).toMatch(/does not say its unit/);
    await screenshot(page, "profile-import-unit-asked-tablet");
    expect(await axeProblems(page)).toEqual([]);
    await unit.selectOption("in");
    await page.getByTestId("profile-sheet").waitFor();
    expect((await drawnWidthMm(page)).said).toBe(101.6);
    expect(await page.getByTestId("import-summary").textContent()).toMatch(/plate\.dxf 101\.6 mm × 50\.8 mm/);
    await page.context().close();
  });

  it("turns “OPEN” into four letter parts, O and P with their holes, at 820 px", async () => {
    const page = await signedInPage(browser, "planner", VIEWPORTS.tablet);
    const jobs = new JobsPage(page);
    await jobs.openList();
    const jobId = await jobs.createJob("Shop sign OPEN", "Corner Bakery", "2026-12-23");
    await chooseShape(page, "Text");
    await page.getByLabel("Text to cut").fill("OPEN");
    await page.getByLabel("Letter height mm").fill("150");
    await page.getByLabel("Letter spacing mm").fill("10");
    await page.getByRole("button", { name: "Draw the letters" }).click();
    const sheet = page.getByTestId("profile-sheet");
    await sheet.waitFor();
    const cells = sheet.getByTestId("sheet-profile");
    expect(await cells.evaluateAll((els) => els.map((e) => e.getAttribute("data-name")))).toEqual([
      "Letter O",
      "Letter P",
      "Letter E",
      "Letter N",
    ]);
    const loops = await cells.evaluateAll((els) =>
      els.map((e) => (e.querySelector('[data-role="outline"]')?.getAttribute("d")?.match(/M/g) ?? []).length),
    );
    expect(loops).toEqual([2, 2, 1, 1]);
    // The E is flat-topped: exactly the 150 mm asked for.
    expect(Number(await cells.nth(2).getAttribute("data-height-mm"))).toBeCloseTo(150, 1);
    await page.getByLabel("Extrusion mm (along the wire)").fill("50");
    await screenshot(page, "profile-import-text-tablet");
    expect(await axeProblems(page)).toEqual([]);
    await page.getByRole("button", { name: "Add 4 parts" }).click();
    await page.getByText(/^4 parts \(Letter O, Letter P, Letter E, Letter N\) added\.$/).waitFor();
    await expect.poll(() => jobs.partRows().count(), { timeout: 20_000 }).toBe(4);
    const names = await testDb()("job_parts").where({ job_id: jobId }).orderBy("id").pluck("name");
    expect(names).toEqual(["Letter O", "Letter P", "Letter E", "Letter N"]);
    await page.setViewportSize(VIEWPORTS.wide);
    await page.reload();
    await page.getByTestId("job-parts").waitFor();
    await screenshot(page, "profile-import-text-job-wide");
    await page.context().close();
  });

  it("adds the letters of a word to the part library from its add form", async () => {
    const page = await signedInPage(browser, "planner", VIEWPORTS.wide);
    await page.goto(`${BASE_URL}/library`);
    await page.getByRole("heading", { name: "Kestrel 1.6 m glider" }).waitFor();
    await chooseShape(page, "Text");
    await page.getByLabel("Kit").fill("Gallery letters");
    await page.getByLabel("Text to cut").fill("AB");
    await page.getByLabel("Letter height mm").fill("200");
    await page.getByLabel("Letter height mm").press("Enter"); // draws the letters; adds nothing yet
    await page.getByTestId("profile-sheet").waitFor();
    expect(await page.getByRole("heading", { name: "Gallery letters" }).count()).toBe(0);
    await page.getByLabel("Extrusion mm (along the wire)").fill("30");
    await screenshot(page, "profile-import-library-wide");
    await page.getByRole("button", { name: "Add 2 parts to the library" }).click();
    await page.getByRole("heading", { name: "Gallery letters" }).waitFor();
    const rows = await testDb()("library_parts")
      .where({ kit: "Gallery letters" })
      .orderBy("id")
      .select("name", "profile");
    expect(rows.map((r) => [r.name, (r.profile as { holes?: unknown[] }).holes?.length])).toEqual([
      ["Letter A", 1],
      ["Letter B", 2],
    ]);
    await page.context().close();
  });

  it("lays the wing panel out in plan with its numbers on the drawing, and the section to scale", async () => {
    for (const [size, viewport] of Object.entries(VIEWPORTS)) {
      const page = await signedInPage(browser, "planner", viewport);
      await page.goto(`${BASE_URL}/jobs`);
      await page.getByTestId("job-list").waitFor();
      await page.getByRole("link", { name: "Kestrel kits — batch 3" }).click();
      await page.getByTestId("job-parts").waitFor();
      await chooseShape(page, "NACA wing panel");
      const plan = page.getByTestId("panel-plan");
      await page.getByLabel("NACA code").fill("0012");
      await page.getByLabel("Root chord mm").fill("230");
      await page.getByLabel("Tip chord mm").fill("150");
      await page.getByLabel("Span mm (along the wire)").fill("600");
      await page.getByLabel("Sweep mm").fill("60");
      await expect.poll(async () => (await plan.getByTestId("plan-tip").textContent()) ?? "").toBe("150 mm");
      expect(await plan.getByTestId("plan-root").textContent()).toBe("230 mm");
      expect(await plan.getByTestId("plan-span").textContent()).toBe("span 600 mm");
      expect(await plan.getByTestId("plan-sweep").textContent()).toBe("sweep 60 mm");
      expect(await plan.getAttribute("aria-label")).toBe(
        "Wing panel in plan: root chord 230 mm, tip chord 150 mm, span 600 mm, sweep 60 mm",
      );
      // The section drawn to scale: the root's drawn width over the drawing's scale is its 230 mm chord.
      const section = page.getByTestId("wing-panel").getByTestId("section-preview");
      const w = await section.evaluate((svg) => {
        const k = Number(svg.getAttribute("data-px-per-mm"));
        return (svg.querySelector("path") as SVGGraphicsElement).getBBox().width / k;
      });
      expect(Math.abs(w - 230)).toBeLessThan(0.5);
      expect(await page.getByTestId("computed-box").textContent()).toMatch(/Box 600 × 230(\.\d+)? × 27\.6 mm/);
      expect(await axeProblems(page)).toEqual([]);
      await page.getByTestId("wing-panel").scrollIntoViewIfNeeded();
      const shot = await screenshot(page, `wing-panel-form-${size}`);
      expect(fs.statSync(shot).size).toBeGreaterThan(20_000);
      await page.context().close();
    }
  });
});
