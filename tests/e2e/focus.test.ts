import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { FlagDefectPage } from "./pages/flag-defect";
import { closeTestDb, makeBlock } from "../support/db";
import { makePlannedBlock } from "../support/planning-fixtures";

// WCAG 2.1 success criteria 2.4.3 (focus order) and 3.3.1 (error identification): after a submit
// the focus is moved on purpose — to the first field in error (one summary announced above it), or
// to the result — never left on the page body because the pressed button was disabled.
let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

const focused = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    return {
      tag: el?.tagName ?? "",
      invalid: el?.getAttribute("aria-invalid") === "true",
      text: el?.textContent ?? "",
      body: el === document.body,
    };
  });

describe("focus after a submit, on a tablet", () => {
  it("the delivery form moves focus to the first field in error, with one alert", async () => {
    const page = await signedInPage(browser, "buyer", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/deliveries/new`);
    await page.getByRole("button", { name: "Receive 1 block" }).click();
    await expect.poll(async () => (await focused(page)).invalid, { timeout: 10_000 }).toBe(true);
    expect(await page.locator("main [role=alert]").count()).toBe(1); // one summary (Next adds its own route announcer outside main)
    await screenshot(page, "focus-delivery-error-tablet");
    await page.context().close();
  });

  it("the defect form moves focus to the first field in error, with one alert", async () => {
    const block = await makeBlock();
    const page = await signedInPage(browser, "cutter", VIEWPORTS.tablet);
    const flag = new FlagDefectPage(page);
    await flag.open();
    await flag.findBlock(block.code);
    await page.getByRole("button", { name: "Save the zone" }).click();
    await expect.poll(async () => (await focused(page)).invalid, { timeout: 10_000 }).toBe(true);
    expect(await page.locator("main [role=alert]").count()).toBe(1); // one summary (Next adds its own route announcer outside main)
    await page.context().close();
  });

  it("approving a plan moves focus to the result", async () => {
    const { runId } = await makePlannedBlock();
    const page = await signedInPage(browser, "planner", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/plans/${runId}`);
    await page.getByRole("button", { name: "Approve and earmark the stock" }).click();
    await expect
      .poll(async () => (await focused(page)).text, { timeout: 10_000 })
      .toContain("Approved: the blocks are earmarked");
    expect((await focused(page)).body).toBe(false);
    await page.context().close();
  });
});
