/**
 * A plan made with the free layout rule may hold pieces no cutter can free. The planner is told
 * so on the plan page (and gets no approve button), the cutter on the cut sheet.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { closeTestDb, makeBlock, testDb } from "../support/db";
import { SETTINGS, makeDoneRun, makeJobWithParts } from "../support/planning-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("a plan no cutter can follow", () => {
  it("is flagged on the plan page without an approve button, and on the cut sheet per block", async () => {
    const block = await makeBlock({ size: [2000, 1000, 600] });
    const { jobId } = await makeJobWithParts([{ name: "Pinwheel piece", quantity: 5, size: [100, 100, 100], gradeCode: "EPS-II" }]);
    const { runId, plan } = await makeDoneRun(jobId, [block], { ...SETTINGS, layout: "free" });
    // Four oblongs turning around a lower middle piece (a pinwheel; common knowledge, no source).
    const key = plan.placements[0]!.part;
    const at = (origin: [number, number, number], size: [number, number, number]) => ({ part: key, block: block.code, origin, size });
    const pinwheel = { ...plan, offcuts: [], cuts: { [block.code]: [] }, placements: [at([10, 10, 10], [200, 100, 100]), at([210, 10, 10], [100, 200, 100]), at([110, 210, 10], [200, 100, 100]), at([10, 110, 10], [100, 200, 100]), at([110, 110, 10], [100, 100, 50])] };
    await testDb()("nesting_runs").where({ id: runId }).update({ plan: JSON.stringify(pinwheel) });

    for (const [size, viewport] of Object.entries(VIEWPORTS)) {
      const page = await signedInPage(browser, "planner", viewport);
      await page.goto(`${BASE_URL}/plans/${runId}`);
      await page.getByText("This plan cannot be cut").waitFor();
      expect(await page.getByText(`Block ${block.code} holds pieces that no through cut frees`).count()).toBe(1);
      expect(await page.getByRole("button", { name: "Approve and earmark the stock" }).count()).toBe(0);
      await screenshot(page, `plan-uncuttable-${size}`);
      await page.goto(`${BASE_URL}/plans/${runId}/sheet`);
      await page.getByText("Do not cut this block from this plan").waitFor();
      expect(await page.getByText("5 pieces of this block cannot be freed by through cuts").count()).toBe(1);
      await page.close();
    }
  });
});
