import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { JobsPage } from "./pages/jobs";
import { closeTestDb, makeBlock, makeGrade, testDb } from "../support/db";
import { makeJobWithParts, makePinwheelRun } from "../support/planning-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

async function signedIn(role: string, viewport: { width: number; height: number } = VIEWPORTS.wide): Promise<Page> {
  return signedInPage(browser, role, viewport);
}

describe("the planner's and the cutter's loop", () => {
  it("imports a part list, nests it with live progress, approves, cuts, and finds the offcuts in stock", async () => {
    // Planner: a job and its part list from CSV.
    const planner = await signedIn("planner");
    const jobs = new JobsPage(planner);
    await jobs.openList();
    await jobs.createJob(`Foyer letters ${Date.now().toString(36)}`, "Copperleaf Signs", "2026-12-20");
    const { code: grade } = await makeGrade("FOYER");
    await jobs.importCsv(
      "letters.csv",
      `${[
        "name,quantity,length_mm,width_mm,height_mm,grade,rotate",
        `Letter O,5,1000,1000,300,${grade},z`,
        `Letter K,2,600,480,100,${grade},z`,
        `Backing strip,4,1200,80,40,${grade},any`,
      ].join("\n")}\n`,
    );
    await jobs.confirmImport();
    await expect.poll(() => jobs.partRows().count(), { timeout: 10_000 }).toBe(3);

    // Plan it into one fresh block: it holds two of the five big letters, so the search cannot prove
    // it is done early and uses its whole budget (the bar is seen); the room they leave comes back as offcuts.
    const block = await makeBlock({ size: [2440, 1220, 610], gradeCode: grade });
    await planner.getByRole("link", { name: "Plan this job" }).click();
    await planner.waitForURL(/\/plans\/new\?jobs=/);
    await planner.getByRole("button", { name: "None" }).click();
    await planner.getByLabel(`Use ${block.code}`).check();
    await planner.getByLabel("Time budget (seconds)").fill("4");
    await planner.getByRole("button", { name: "Start nesting" }).click();
    await planner.waitForURL(/\/plans\/\d+$/);
    const runId = Number(new URL(planner.url()).pathname.split("/").pop());
    // Typed in seconds on the form, kept in milliseconds by the API.
    const saved = await (await planner.request.get(`${BASE_URL}/api/runs/${runId}`)).json();
    expect(saved.run.settings.timeLimitMs).toBe(4000);
    // The live bar shows while a worker searches, then the plan replaces it.
    await planner.getByRole("progressbar", { name: "Nesting progress" }).waitFor({ timeout: 15_000 });
    await planner.getByRole("button", { name: "Approve and earmark the stock" }).waitFor({ timeout: 60_000 });
    expect(await planner.getByTestId("plan-figures").textContent()).toMatch(/Yield\s*\d+(\.\d)? %/);
    await planner.getByText("Not everything fits").waitFor();
    expect(await planner.locator("svg[aria-label^='Top (length × width) of']").count()).toBeGreaterThan(0);
    await screenshot(planner, "plan-view-wide");
    await planner.getByRole("button", { name: "Approve and earmark the stock" }).click();
    await planner.getByText("Approved: the blocks are earmarked").waitFor();
    await planner.goto(`${BASE_URL}/plans/${runId}/sheet`);
    await planner.getByRole("heading", { name: `Cut sheet · plan #${runId}` }).waitFor();
    expect(await planner.getByText("Before you heat the wire").count()).toBe(1);
    await screenshot(planner, "cut-sheet-wide");

    // Cutter, on a tablet: marks each block cut and sees its offcuts come into stock.
    const cutter = await signedIn("cutter", VIEWPORTS.tablet);
    await cutter.goto(`${BASE_URL}/plans/${runId}/cut`);
    // The page streams in after its loading skeleton: wait for it before counting.
    await cutter.getByRole("heading", { name: `At the machine · plan #${runId}` }).waitFor();
    await cutter
      .getByRole("button", { name: /^Finish .+…$/ })
      .first()
      .waitFor();
    await screenshot(cutter, "at-the-machine-tablet");
    const buttons = cutter.getByRole("button", { name: /^Finish .+…$/ });
    const n = await buttons.count();
    expect(n).toBeGreaterThan(0);
    let offcutCodes: string[] = [];
    for (let i = 0; i < n; i++) {
      // Finishing a block asks first; nothing is recorded until the cutter says yes.
      await cutter
        .getByRole("button", { name: /^Finish .+…$/ })
        .first()
        .click();
      await cutter.getByRole("button", { name: /^Yes, finish / }).click();
      await expect
        .poll(() => cutter.getByRole("button", { name: /^Finish .+…$/ }).count(), { timeout: 15_000 })
        .toBe(n - i - 1);
    }
    await expect.poll(() => cutter.getByText(/ is cut$/).count(), { timeout: 15_000 }).toBe(n);
    const notes = await cutter.getByText(/Offcuts now in stock: /).allTextContents();
    // Offcuts are numbered after their block: CODE.1, CODE.2, …
    const ours = new RegExp(`${block.code.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\.\\d+`, "g");
    offcutCodes = notes.flatMap((t) => [...t.matchAll(ours)].map((m) => m[0]));
    expect(offcutCodes.length).toBeGreaterThan(0);
    await cutter.goto(`${BASE_URL}/stock?offcuts=only&q=${encodeURIComponent(offcutCodes[0]!)}`);
    await cutter.getByRole("link", { name: offcutCodes[0]!, exact: true }).waitFor();
    await screenshot(cutter, "offcuts-in-stock-tablet");

    // The plan is closed once every block is cut.
    await planner.goto(`${BASE_URL}/plans/${runId}`);
    await planner.getByText("Cut and closed").first().waitFor();
  });

  it("chooses two jobs on the new-plan page and plans them together", async () => {
    const a = await makeJobWithParts([
      { name: "Arch segment", quantity: 2, size: [900, 300, 200], gradeCode: "EPS-II" },
    ]);
    const b = await makeJobWithParts([{ name: "Plinth", quantity: 1, size: [600, 600, 300], gradeCode: "EPS-II" }]);
    // Due before any other job, so they head the chooser (soonest due first) however many jobs
    // other test files have left open; the chooser's search is tested below.
    await testDb()("jobs").whereIn("id", [a.jobId, b.jobId]).update({ due_on: "2001-01-01" });
    const names = await testDb()("jobs").whereIn("id", [a.jobId, b.jobId]).orderBy("id").pluck("name");
    for (const viewport of [VIEWPORTS.tablet, VIEWPORTS.wide]) {
      const planner = await signedIn("planner", viewport);
      await planner.goto(`${BASE_URL}/plans`);
      await planner.getByRole("link", { name: "New plan" }).click();
      await planner.waitForURL(/\/plans\/new$/);
      for (const name of names) await planner.getByRole("checkbox", { name: new RegExp(name) }).check();
      await screenshot(planner, `new-plan-choose-jobs-${viewport.width}`);
      await planner.getByRole("button", { name: "Choose stock for these jobs" }).click();
      await planner.waitForURL(/\/plans\/new\?job=\d+&job=\d+/);
      const lead = await planner.getByText(/^Nest the parts still owed on/).textContent();
      for (const name of names) expect(lead).toContain(name);
      await planner.close();
    }
    // The chooser's search finds a job by name, and only the jobs that match.
    const planner = await signedIn("planner", VIEWPORTS.tablet);
    await planner.goto(`${BASE_URL}/plans/new`);
    await planner.getByLabel("Find a job by name or customer").fill(names[1]!);
    await planner.getByRole("button", { name: "Find", exact: true }).click();
    await planner.waitForURL(/\/plans\/new\?q=/);
    await planner.getByRole("checkbox", { name: new RegExp(names[1]!) }).waitFor();
    expect(await planner.getByRole("checkbox").count()).toBe(1);
    await planner.close();
  });
});

describe("a plan no cutter can follow", () => {
  it("is flagged on the plan page without an approve button, and on the cut sheet per block", async () => {
    // A free-layout plan whose pieces no cutter can free (see makePinwheelRun).
    const { runId, block } = await makePinwheelRun();

    for (const [size, viewport] of Object.entries(VIEWPORTS)) {
      const page = await signedIn("planner", viewport);
      await page.goto(`${BASE_URL}/plans/${runId}`);
      await page.getByText("This plan cannot be cut").waitFor();
      expect(await page.getByText("Not cuttable", { exact: true }).count()).toBe(1);
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
