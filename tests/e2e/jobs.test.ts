import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInAs, signedInPage } from "./pages/sign-in";
import { TEST_PASSWORD, closeTestDb, makeUser, testDb } from "../support/db";
import { JobsPage } from "./pages/jobs";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

async function signedIn(role: string, viewport: { width: number; height: number }): Promise<Page> {
  return signedInPage(browser, role, viewport);
}

const HEADER =
  "name,quantity,length_mm,width_mm,height_mm,grade,rotate,naca,chord_mm,tip_chord_mm,span_mm,polygon,extrude_mm";
const GOOD = [
  HEADER,
  "Inner wing panel,8,,,,EPS-I,none,2412,230,200,420,,",
  "Outer wing panel,8,,,,EPS-I,none,2412,200,130,380,,",
  "Former F1,4,,,,EPS-I,,,,,,0 0; 70 0; 70 80; 35 95; 0 80,12",
  "Fuselage core,4,820,80,90,EPS-I,z,,,,,,",
].join("\n");

describe("a planner imports a part list into a job", () => {
  it("creates a job, sees a bad file refused by row and column, imports a good one and sees the parts", async () => {
    const page = await signedIn("planner", VIEWPORTS.wide);
    const jobs = new JobsPage(page);
    await jobs.openList();
    const jobId = await jobs.createJob("Swallow kits — trial batch", "Larkspur Model Flyers", "2026-12-18");

    await jobs.importCsv("swallow-bad.csv", GOOD.replace("Former F1,4,", "Former F1,four,"));
    await expect(jobs.problems().textContent()).resolves.toMatch(/4\s*quantity\s*“four” is not a number/);
    expect(await jobs.partRows().count()).toBe(0);

    await jobs.importCsv("swallow.csv", GOOD);
    await jobs.confirmImport();
    await page.getByText("Inner wing panel").first().waitFor();
    await expect.poll(() => jobs.partRows().count()).toBe(4);
    const text = await page.getByTestId("job-parts").textContent();
    expect(text).toMatch(/NACA 2412, chord 230→200 mm, span 420 mm \(4-axis\)/);
    expect(text).toMatch(/Polygon, 5 points × 12 mm/);
    await expect(page.getByTestId("job-totals").textContent()).resolves.toMatch(/4 lines · 24 pieces/);
    expect(await page.locator("#runs").getByRole("link", { name: "Plan this job" }).getAttribute("href")).toBe(
      `/plans/new?jobs=${jobId}`,
    );

    // A tapered NACA panel by hand: the preview draws root and tip, and shows the computed box.
    await jobs.addNacaPart("Tailplane", 4, "0009", 120, 90, 320);
    await expect
      .poll(async () => (await page.getByTestId("computed-box").textContent()) ?? "")
      .toMatch(/Box 320 × 120(\.\d)? × 10\.8 mm/);
    expect(await jobs.preview().locator("path").count()).toBe(2);
    await screenshot(page, "job-part-form-naca-wide");
    await jobs.submitPart();
    await expect.poll(() => jobs.partRows().count()).toBe(5);

    for (const [size, viewport] of Object.entries(VIEWPORTS)) {
      await page.setViewportSize(viewport);
      await page.reload();
      await page.getByTestId("job-parts").waitFor();
      const file = await screenshot(page, `job-page-${size}`);
      expect(fs.statSync(file).size).toBeGreaterThan(20_000);
    }
    await page.context().close();
  });

  it("a planner who works in inches types inches; the part is stored in mm (25.4 mm to the inch, exact)", async () => {
    // 1 in = 25.4 mm exactly: international yard and pound agreement (1959).
    const u = await makeUser(["planner"]);
    await testDb()("users").where({ id: u.id }).update({ display_units: "in" });
    const page = await signedInAs(browser, u.email, TEST_PASSWORD, VIEWPORTS.tablet);
    const jobs = new JobsPage(page);
    await jobs.openList();
    const jobId = await jobs.createJob("Shop-front letters", "Marrow Lane Bakery", "2026-12-20");
    await jobs.addBoxPart("Letter M", 2, [24, 18, 2], "in");
    await jobs.submitPart();
    await expect.poll(() => jobs.partRows().count()).toBe(1);
    const row = await testDb()("job_parts").where({ job_id: jobId }).first("size_x", "size_y", "size_z", "quantity");
    expect([Number(row!.size_x), Number(row!.size_y), Number(row!.size_z)]).toEqual([609.6, 457.2, 50.8]);
    expect(await page.getByTestId("job-parts").textContent()).toMatch(/24 × 18 × 2 in/);
    // A wing panel typed in inches: the computed box is shown in inches too.
    await jobs.addNacaPart("Stabiliser", 2, "0012", 6, 6, 16, "in");
    await expect
      .poll(async () => (await page.getByTestId("computed-box").textContent()) ?? "")
      .toMatch(/Box 16 × 6 × 0\.72 in/);
    await screenshot(page, "job-part-form-inches-tablet");
    await page.context().close();
  });

  it("a planner edits a library part in place; a bad size is named and nothing changes", async () => {
    const [made] = await testDb()("library_parts")
      .insert({
        kit: "Test kit",
        name: "Plinth blank",
        size_x: 600,
        size_y: 400,
        size_z: 300,
        rotate: "any",
        default_quantity: 1,
      })
      .returning("id");
    const page = await signedIn("planner", VIEWPORTS.wide);
    await page.goto(`${BASE_URL}/library`);
    await page.getByRole("button", { name: "Edit Plinth blank" }).click();
    const form = page.getByRole("form", { name: "Edit Plinth blank" });
    await form.getByLabel("Length mm").fill("-5");
    await form.getByRole("button", { name: "Save the part" }).click();
    await form
      .getByText(/must be more than 0/)
      .first()
      .waitFor();
    await screenshot(page, "library-edit-refused-wide");
    expect(Number((await testDb()("library_parts").where({ id: made!.id }).first("size_x"))!.size_x)).toBe(600);

    await form.getByLabel("Length mm").fill("650");
    await form.getByLabel("Part name").fill("Plinth blank, tall");
    await form.getByLabel("Usual quantity").fill("3");
    await form.getByRole("button", { name: "Save the part" }).click();
    await page.getByText("Plinth blank, tall").waitFor();
    const row = await testDb()("library_parts").where({ id: made!.id }).first("name", "size_x", "default_quantity");
    expect([row!.name, Number(row!.size_x), row!.default_quantity]).toEqual(["Plinth blank, tall", 650, 3]);
    await screenshot(page, "library-edited-wide");
    await page.context().close();
  });

  it("shows the part library by kit to a cutter, read-only", async () => {
    for (const [size, viewport] of Object.entries(VIEWPORTS)) {
      const page = await signedIn(size === "wide" ? "planner" : "cutter", viewport);
      await page.goto(`${BASE_URL}/library`);
      await page.getByRole("heading", { name: "Kestrel 1.6 m glider" }).waitFor();
      expect(await page.getByTestId("section-preview").count()).toBeGreaterThan(5);
      expect(await page.getByRole("button", { name: "Add to the library" }).count()).toBe(size === "wide" ? 1 : 0);
      const file = await screenshot(page, `library-${size}`);
      expect(fs.statSync(file).size).toBeGreaterThan(20_000);
      await page.context().close();
    }
  });

  it("lists the seeded jobs, soonest due first, and shows a cutter a job without edit controls", async () => {
    const page = await signedIn("cutter", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/jobs`);
    await page.getByTestId("job-list").waitFor(); // the list streams in after its skeleton
    const rows = page.getByTestId("job-list").locator("tbody tr");
    expect(await rows.count()).toBeGreaterThanOrEqual(3);
    expect(await page.getByRole("button", { name: "Create the job" }).count()).toBe(0);
    await screenshot(page, "jobs-list-cutter-tablet");
    await page.getByRole("link", { name: "Kestrel kits — batch 3" }).click();
    await page.getByTestId("job-parts").waitFor();
    expect(await page.getByRole("button", { name: /Remove/ }).count()).toBe(0);
    expect(await page.getByRole("link", { name: "Plan this job" }).count()).toBe(0);
    await screenshot(page, "job-page-cutter-tablet");
    await page.context().close();
  });
});
