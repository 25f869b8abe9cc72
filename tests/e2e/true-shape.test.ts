/**
 * A planner runs a true-shape plan from the new-plan form (issue #20, item 2): the checkbox, the
 * plan page with its slabs listed by their members and the comparison with box nesting, then the
 * cutter's page with the slab as one piece. Screenshots at 820 px (tablet) and wide.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { closeTestDb, makeBlock, makeGrade, testDb } from "../support/db";
import { makeJob } from "../support/job-fixtures";
import { makeProfilePart } from "../support/profile-fixtures";
import { lProfile } from "../support/shapes";
import type { Profile } from "@/lib/profiles";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

const signedIn = (role: string, viewport: { width: number; height: number }): Promise<Page> =>
  signedInPage(browser, role, viewport);

/** The hand-drawn L of tests/support/shapes.ts, 60 mm thick: two interlock where their boxes cannot. */
const ELL: Profile = lProfile(60);
const PANEL: Profile = { kind: "naca", code: "0012", chordMm: 200, spanMm: 60 };

describe("a true-shape plan in the browser", () => {
  it("starts from the form's checkbox, shows the slabs and the comparison, and the cutter sees each slab as one piece", async () => {
    const jobId = await makeJob({ name: `True-shape sign ${Date.now().toString(36)}` });
    const { code: grade } = await makeGrade("TRUE");
    const parts = [
      await makeProfilePart(jobId, ELL, { name: "Letter L", quantity: 6, gradeCode: grade }),
      await makeProfilePart(jobId, PANEL, { name: "Wing 0012", quantity: 2, gradeCode: grade }),
    ];
    // Turnable in the slab's face: upright-only Ls cannot interlock, and no slab would beat their boxes.
    await testDb()("job_parts").whereIn("id", parts).update({ rotate: "any" });
    const block = await makeBlock({ size: [800, 700, 500], gradeCode: grade });

    const planner = await signedIn("planner", VIEWPORTS.wide);
    await planner.goto(`${BASE_URL}/plans/new?jobs=${jobId}`);
    await planner.getByRole("button", { name: "None" }).click();
    await planner.getByLabel(`Use ${block.code}`).check();
    await planner.getByLabel("Time budget (seconds)").fill("3");
    const box = planner.getByRole("checkbox", { name: /Nest profiles by their true shape/ });
    expect(await box.isChecked()).toBe(false); // off by default
    // The seeded profile cutter: 1000 mm wire, 1250 × 650 travel, table 1200 × 1000 × 600 (db/seeds/06_machines.ts).
    expect(await planner.getByTestId("slab-cutter").textContent()).toBe(
      "Each slab is sized for Bay 2 profile cutter: a face of at most 1200 × 600 mm (across × up), 1000 mm along the wire.",
    );
    await box.check();
    await planner.getByRole("button", { name: "Start nesting" }).click();
    await planner.waitForURL(/\/plans\/\d+$/);
    const runId = Number(new URL(planner.url()).pathname.split("/").pop());
    const saved = await (await planner.request.get(`${BASE_URL}/api/runs/${runId}`)).json();
    expect(saved.run.settings.trueShape).toBe(true);

    await planner.getByRole("button", { name: "Approve and earmark the stock" }).waitFor({ timeout: 60_000 });
    const comparison = await planner.getByTestId("shape-comparison").textContent();
    expect(comparison).toMatch(
      /^Foam used: [\d.]+ m³ nested by true shape \(\d+ slabs?\), [\d.]+ m³ with the same parts as boxes: [\d.]+ % (less|more) by true shape\.$/,
    );
    // Yield by the parts' true shapes: over the same stock as the plan's yield (used less offcuts kept), so never above it —
    // the members' true volume lies inside their slab's box (hand-worked: a member's outline is inside its part's box).
    const figures = (await planner.getByTestId("plan-figures").textContent()) ?? "";
    const [, boxYield, trueYield] = figures.match(/Yield([\d.]+) %([\d.]+) % by the parts' true shapes/) ?? [];
    expect(Number(trueYield)).toBeGreaterThan(0);
    expect(Number(trueYield)).toBeLessThanOrEqual(Number(boxYield));
    expect(Number(trueYield)).toBeGreaterThan(Number(boxYield) / 4);
    // The slab's face is drawn: one outline per member, one corridor each.
    const face = planner.getByRole("img", { name: /^Face of .+ with \d+ profiles and their lead-ins$/ });
    await face.waitFor();
    const members = Number((await face.getAttribute("aria-label"))?.match(/with (\d+) profiles/)?.[1]);
    expect(await face.locator("path").count()).toBe(members);
    expect(await face.locator("line").count()).toBe(members);
    const slabs = await planner.getByTestId(`slabs-${block.code}`).textContent();
    expect(slabs).toMatch(/slab for \d+ parts/);
    expect(slabs).toContain("Letter L");
    expect(slabs).toContain("Each was sized for the profile cutter: a face of at most 1200 × 600 mm (across × up)");
    expect(await planner.getByTestId(`profile-programs-${block.code}`).textContent()).toContain("Letter L");
    await planner.getByTestId(`slabs-${block.code}`).scrollIntoViewIfNeeded();
    await screenshot(planner, "true-shape-plan-wide");

    const tablet = await signedIn("planner", VIEWPORTS.tablet);
    await tablet.goto(`${BASE_URL}/plans/${runId}`);
    await tablet.getByTestId(`slabs-${block.code}`).waitFor();
    await screenshot(tablet, "true-shape-plan-tablet");

    // The job's runs side by side: foam used, the same figure as the comparison, and the saving against boxes.
    await planner.goto(`${BASE_URL}/jobs/${jobId}`);
    const row = planner
      .getByTestId("job-runs")
      .locator("tr", { has: planner.getByRole("link", { name: `#${runId}` }) });
    const rowText = (await row.textContent()) ?? "";
    expect(rowText).toContain("true shape");
    expect(rowText).toMatch(/\d+\.\d % (less|more) than boxes/);
    const foam = comparison?.match(/^Foam used: ([\d.]+) m³/)?.[1];
    expect(rowText).toContain(Number(foam).toFixed(3));
    await planner.goto(`${BASE_URL}/plans/${runId}`);

    await planner.getByRole("button", { name: "Approve and earmark the stock" }).click();
    await planner.getByText("Approved: the blocks are earmarked").waitFor();
    // The cut sheet lists the slab as one piece with its members, for the profile cutter.
    await planner.goto(`${BASE_URL}/plans/${runId}/sheet`);
    await planner.getByRole("heading", { name: `Cut sheet · plan #${runId}` }).waitFor();
    expect(await planner.getByText(/to the profile cutter: 6 × Letter L, 2 × Wing 0012/).count()).toBeGreaterThan(0);
    await screenshot(planner, "true-shape-cut-sheet-wide");

    const cutter = await signedIn("cutter", VIEWPORTS.tablet);
    await cutter.goto(`${BASE_URL}/plans/${runId}/cut`);
    await cutter.getByRole("heading", { name: `At the machine · plan #${runId}` }).waitFor();
    // The form lists the slab's members, each to be counted good or rejected.
    expect(await cutter.locator("main").textContent()).toMatch(/Letter L\s*6/);
    expect(await cutter.locator("main").textContent()).not.toMatch(/NaN/);
    await screenshot(cutter, "true-shape-at-the-machine-tablet");
    // The step that frees the slab sends it on to the profile cutter; a reject there is one of its members.
    const steps = await (await cutter.request.get(`${BASE_URL}/api/runs/${runId}/blocks/${block.id}/steps`)).json();
    const frees = (steps.procedure.steps as { n: number; next: { what: { kind: string; part?: string } }[] }[]).find(
      (st) => st.next.some((x) => x.what.kind === "part" && x.what.part?.startsWith("slab-")),
    )!;
    await cutter.getByRole("button", { name: String(frees.n), exact: true }).click();
    await cutter
      .getByText(/slab for \d+ parts → profile cutter/)
      .first()
      .waitFor();
    await cutter.getByText("A part from this step is bad…").click();
    const options = await cutter.getByRole("combobox", { name: "Part" }).locator("option").allTextContents();
    expect(options).toContain("Letter L (6 in this step)");
    expect(options).toContain("Wing 0012 (2 in this step)");
    await screenshot(cutter, "true-shape-slab-step-tablet");
  });
});
