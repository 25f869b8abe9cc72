import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, SHOTS, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { closeTestDb, makeBlock, makeGrade } from "../support/db";
import { LETTER_O, WING } from "../support/profile-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

/** A JSON request from the page's own session, as the app's forms send it (same Origin). */
async function post(page: Page, path: string, data: unknown) {
  const res = await page.request.post(`${BASE_URL}${path}`, { data, headers: { Origin: BASE_URL } });
  expect(res.status(), await res.text()).toBe(201);
  return res.json();
}

/** The text of a download started by clicking `link`. */
async function download(page: Page, link: ReturnType<Page["getByRole"]>): Promise<{ name: string; text: string }> {
  const [file] = await Promise.all([page.waitForEvent("download"), link.click()]);
  return { name: file.suggestedFilename(), text: fs.readFileSync((await file.path())!, "utf8") };
}

describe("profiles to the wire", () => {
  it("a planner plans a job of profile parts and downloads the programs from the plan and from the part", async () => {
    const planner = await signedInPage(browser, "planner", VIEWPORTS.wide);
    // The shop's profile cutter is a 4-axis machine: its second tower's letters on the machines page.
    await planner.goto(`${BASE_URL}/machines`);
    const towers = planner.getByText(/4-axis: second tower U V, 1000 mm apart/).first();
    await towers.scrollIntoViewIfNeeded();
    // Other tests add many machines to this database: the view around the profile cutter, not the whole page.
    await planner.screenshot({ path: path.join(SHOTS, "profile-programs-machines-wide.png") });
    // A job with a sign letter (a counter to reach by a slit) and a tapered, swept wing panel (4-axis),
    // in a grade of the test's own: parts of no grade are offered every ready block, the oldest 500
    // only, and the suite's database holds more than that by the time this runs.
    const grade = await makeGrade("PROF");
    const { job } = await post(planner, "/api/jobs", {
      name: `Shop-front letters ${Date.now().toString(36)}`,
      customer: "Brightwater Signs",
    });
    await post(planner, `/api/jobs/${job.id}/parts`, {
      name: "Letter O",
      quantity: 2,
      gradeId: grade.id,
      profile: LETTER_O,
      rotate: "none",
    });
    await post(planner, `/api/jobs/${job.id}/parts`, {
      name: "Wing panel",
      quantity: 1,
      gradeId: grade.id,
      profile: WING,
      rotate: "none",
    });

    // Plan it into a fresh block, through the planning page.
    const block = await makeBlock({ size: [1000, 600, 400], gradeCode: grade.code });
    await planner.goto(`${BASE_URL}/jobs/${job.id}`);
    await planner.getByRole("link", { name: "Plan this job" }).click();
    await planner.waitForURL(/\/plans\/new\?jobs=/);
    await planner.getByRole("button", { name: "None" }).click();
    await planner.getByLabel(`Use ${block.code}`).check();
    await planner.getByLabel("Time budget (seconds)").fill("2");
    await planner.getByRole("button", { name: "Start nesting" }).click();
    await planner.waitForURL(/\/plans\/\d+$/);
    const runId = Number(new URL(planner.url()).pathname.split("/").pop());
    await planner.getByRole("button", { name: "Approve and earmark the stock" }).waitFor({ timeout: 60_000 });

    // The plan page: the profile cuts in the cut time, the yield by true shapes, and the block's slab programs.
    const figures = await planner.getByTestId("plan-figures").textContent();
    expect(figures).toMatch(/profiles \d+ min \(\d+ slabs?\) on Bay 2 profile cutter/);
    expect(figures).toMatch(/\d+(\.\d)? % by the parts' true shapes/);
    const programs = planner.getByTestId(`profile-programs-${block.code}`);
    await programs.waitFor();
    expect(await programs.textContent()).toMatch(/Profile programs for Bay 2 profile cutter:/);
    await expect.poll(() => programs.getByRole("link", { name: "G-code" }).count()).toBeGreaterThanOrEqual(2);
    await programs.scrollIntoViewIfNeeded();
    await screenshot(planner, "profile-programs-plan-wide");

    const slab = await download(planner, programs.getByRole("link", { name: "G-code" }).first());
    expect(slab.name).toMatch(new RegExp(`^plan-${runId}-.+-slab-\\d+\\.nc$`));
    expect(slab.text).toMatch(/^\(BLOCKYARD PROFILE PROGRAM: PLAN \d+, BLOCK .+, SLAB \d+ OF \d+\)$/m);
    expect(slab.text).toMatch(/^N\d+ G71$/m); // the seeded profile cutter's DIN dialect
    expect(slab.text).toMatch(/^N\d+ M64 P0$/m);
    expect(slab.text).toMatch(/\(CAUTION: NEVER HOT-WIRE POLYURETHANE/);
    // The letters' slab: two parts, each with a counter reached by a slit.
    const letters = programs.getByRole("listitem").filter({ hasText: "Letter O" });
    const drawingHref = await letters.getByRole("link", { name: "path drawing" }).getAttribute("href");
    const drawing = await browser.newPage({ viewport: VIEWPORTS.wide });
    /** The drawing as served, then shown as a page fits it (an SVG document alone has no page to scroll). */
    const showDrawing = async (href: string | null, name: string) => {
      const res = await planner.request.get(`${BASE_URL}${href}`);
      expect(res.headers()["content-type"]).toMatch(/^image\/svg\+xml/);
      const svg = await res.text();
      expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="[\d.]+mm" height="[\d.]+mm"/);
      await drawing.setContent(
        `<!doctype html><html><body style="margin:16px;background:#fff">${svg.replace(/ width="[\d.]+mm" height="[\d.]+mm"/, ' width="100%"')}</body></html>`,
      );
      await screenshot(drawing, name);
      return svg;
    };
    const slabSvg = await showDrawing(drawingHref, "profile-programs-slab-drawing");
    expect(slabSvg).toMatch(/<title>Wire path: plan \d+, block .+, slab \d+ of \d+<\/title>/);
    expect(slabSvg).toMatch(/slit to a hole/);

    // The part row on the job: the wing's own program (4-axis: X Y U V) and its drawing.
    await planner.goto(`${BASE_URL}/jobs/${job.id}`);
    const wingRow = planner.getByRole("row").filter({ hasText: "Wing panel" });
    const wing = await download(planner, wingRow.getByRole("link", { name: "G-code" }));
    expect(wing.name).toMatch(/^job-\d+-part-\d+-wing-panel\.nc$/);
    expect(wing.text).toMatch(/\(BAY 2 PROFILE CUTTER, HORIZONTAL WIRE, 4-AXIS, X Y U V\)/);
    expect(wing.text).toMatch(/^N\d+ G1 X[\d.]+ Y[\d.]+ U[\d.]+ V[\d.]+ F[\d.]+$/m);
    await screenshot(planner, "profile-programs-job-wide");
    const wingDrawing = await wingRow.getByRole("link", { name: "Path drawing" }).getAttribute("href");
    expect(await showDrawing(wingDrawing, "profile-programs-wing-drawing")).toMatch(/root solid|tip section/);
    await drawing.close();

    // The same at the machine's tablet, as the cutter.
    const cutter = await signedInPage(browser, "cutter", VIEWPORTS.tablet);
    await cutter.goto(`${BASE_URL}/plans/${runId}`);
    await cutter.getByTestId(`profile-programs-${block.code}`).scrollIntoViewIfNeeded();
    await screenshot(cutter, "profile-programs-plan-tablet");
    const letterRow = async () => {
      await cutter.goto(`${BASE_URL}/jobs/${job.id}`);
      return cutter.getByRole("row").filter({ hasText: "Letter O" });
    };
    const letter = await download(cutter, (await letterRow()).getByRole("link", { name: "G-code" }));
    expect(letter.text).toMatch(/\(PART 1: LETTER O\. LEAD-IN FROM THE \w+ FACE, ANTICLOCKWISE, 1 HOLE SLIT\)/);
    await screenshot(cutter, "profile-programs-job-tablet");
    await cutter.context().close();
    await planner.context().close();
  }, 240_000);
});
