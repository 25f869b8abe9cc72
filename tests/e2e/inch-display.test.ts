/**
 * Someone who reads inches (their account's display units) planning and cutting: the plan page and
 * the new-plan form show sizes in inches and take lengths in inches, stored in millimetres; the cut
 * sheet and the at-the-machine page keep millimetres (the machines are driven in mm) with the inches
 * beside each size. These pages once showed millimetres only, whatever the person chose.
 * Sizes are whole inches (1 in = 25.4 mm exactly, by the 1959 international yard and pound
 * agreement), so every figure below is worked out by hand.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInAs } from "./pages/sign-in";
import { client } from "../support/http";
import { TEST_PASSWORD, closeTestDb, makeBlock, makeGrade, makeUser, testDb } from "../support/db";
import { makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("a planner and cutter who reads inches", () => {
  it("sees inches on the plan page and the new-plan form, and millimetres with inches at the machine", async () => {
    const k = testDb();
    const grade = await makeGrade("INCH");
    const user = await makeUser(["planner", "cutter"]);
    await k("users").where({ id: user.id }).update({ display_units: "in" });
    // 50 × 30 × 20 in, and parts of 20 × 10 × 5 in.
    const block = await makeBlock({ size: [1270, 762, 508], gradeCode: grade.code });
    const { jobId } = await makeJobWithParts([
      { name: "Inch plinth", quantity: 2, size: [508, 254, 127], gradeCode: grade.code },
    ]);
    const { runId } = await makeDoneRun(jobId, [block]);

    const page = await signedInAs(browser, user.email, TEST_PASSWORD, VIEWPORTS.tablet);
    const main = async () => (await page.locator("main").textContent()) ?? "";
    /** Opens a page and waits for its own heading (the shop's loading screen comes first). */
    const open = async (path: string, heading: RegExp) => {
      await page.goto(`${BASE_URL}${path}`);
      await page.getByRole("heading", { level: 1, name: heading }).waitFor();
      return main();
    };

    // The new-plan form: lengths typed in inches. The shop's defect margin and smallest offcut
    // left as shown go in exactly; a trim typed as 0.25 in is stored as 6.35 mm.
    const shop = (await k("shop_settings").first("defect_margin_mm", "min_offcut_z_mm"))!;
    let text = await open(`/plans/new?jobs=${jobId}`, /^New plan/);
    expect(text).toContain("Size (in)");
    expect(text).toContain("50 × 30 × 20");
    await page.getByLabel("Face trim (in)").fill("0.25");
    await page.getByRole("button", { name: "Start nesting" }).click();
    await page.waitForURL(/\/plans\/\d+$/);
    const started = Number(page.url().split("/").pop());
    expect(started).not.toBe(runId);
    const run = (await k("nesting_runs").where({ id: started }).first("settings")) as {
      settings: { trim: number; defectMargin: number; minOffcut: number[] };
    };
    expect(run.settings.trim).toBe(6.35);
    expect(run.settings.defectMargin).toBe(Number(shop.defect_margin_mm));
    expect(run.settings.minOffcut[2]).toBe(Number(shop.min_offcut_z_mm));
    // The first plan approved, so its block has steps at the machine.
    const api = client();
    await api.signIn(user.email, TEST_PASSWORD);
    expect((await api.post(`/api/runs/${runId}/approve`)).status).toBe(200);

    // The plan page: the block, the parts and the settings in inches.
    text = await open(`/plans/${runId}`, /^Plan #/);
    expect(text).toContain("50 × 30 × 20 in");
    expect(text).not.toContain("1270 × 762 × 508 mm");
    expect(text).toMatch(/kerf [\d.]+ in · trim [\d.]+ in/);
    // The part may lie turned: its three sides, in inches, whichever way round.
    const part = text.match(/Inch plinth: ([\d.]+) × ([\d.]+) × ([\d.]+) in at x/);
    expect(part, "the part's size in inches in the plan's words").not.toBeNull();
    expect(
      part!
        .slice(1, 4)
        .map(Number)
        .sort((a, b) => a - b),
    ).toEqual([5, 10, 20]);
    await screenshot(page, "inch-plan-tablet");

    // The cut sheet: millimetres, the inches beside them, and why.
    text = await open(`/plans/${runId}/sheet`, /^Cut sheet/);
    expect(text).toContain("1270 × 762 × 508 mm (50 × 30 × 20 in)");
    // The parts' row (count 2): millimetres, then inches, the part whichever way round it lies.
    const row = text.match(/Inch plinth2([\d.]+) × ([\d.]+) × ([\d.]+) mm \(([\d.]+) × ([\d.]+) × ([\d.]+) in\)/);
    expect(row, "the parts' size in mm and inches on the cut sheet").not.toBeNull();
    const sorted = (xs: string[]) => xs.map(Number).sort((a, b) => a - b);
    expect(sorted(row!.slice(1, 4))).toEqual([127, 254, 508]);
    expect(sorted(row!.slice(4, 7))).toEqual([5, 10, 20]);
    expect(text).toContain("every position stays in millimetres");

    // At the machine: the block and each step's piece the same way.
    text = await open(`/plans/${runId}/cut`, /^At the machine/);
    await page.getByRole("heading", { name: /^Step 1 of \d+/ }).waitFor();
    text = await main();
    expect(text).toContain("1270 × 762 × 508 mm (50 × 30 × 20 in)");
    expect(text).toMatch(/Step 1 of \d+: place piece A · 1270 × 762 × 508 mm \(50 × 30 × 20 in\)/);
    await screenshot(page, "inch-at-the-machine-tablet");

    await page.context().close();
  });
});
