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

/**
 * The refusal is said once, in the page's one live region, and nothing in the page's content is a
 * live region of its own (an empty form used to fire one alert per field).
 */
async function expectOneSummary(page: Page) {
  await expect.poll(() => page.locator("#page-announcer").getAttribute("data-said"), { timeout: 5_000 }).toMatch(/\S/);
  await expectSaidInAccessibilityTree(page);
  expect(await page.locator("main [role=alert], main [role=status], main [aria-live]").count()).toBe(0);
  // The field that has focus names its own error through aria-describedby.
  const described = await page.evaluate(() => {
    const el = document.activeElement;
    const ids = el?.getAttribute("aria-describedby")?.split(" ") ?? [];
    return ids.map((id) => document.getElementById(id)?.textContent ?? "").join(" ");
  });
  expect(described.trim()).not.toBe("");
}

/**
 * What a screen reader gets: Chromium's accessibility tree holds one status region (the
 * announcer's, inside its closed shadow root) and in it the words the page said.
 */
async function expectSaidInAccessibilityTree(page: Page) {
  const said = (await page.locator("#page-announcer").getAttribute("data-said")) ?? "";
  const cdp = await page.context().newCDPSession(page);
  const { nodes } = (await cdp.send("Accessibility.getFullAXTree")) as {
    nodes: { nodeId: string; role?: { value: string }; name?: { value: string }; childIds?: string[] }[];
  };
  const byId = new Map(nodes.map((n) => [n.nodeId, n]));
  const text = (id: string): string => {
    const n = byId.get(id);
    if (!n) return "";
    return n.role?.value === "StaticText" ? (n.name?.value ?? "") : (n.childIds ?? []).map(text).join(" ");
  };
  const regions = nodes.filter((n) => n.role?.value === "status");
  expect(regions).toHaveLength(1);
  expect(text(regions[0]!.nodeId).replace(/\s+/g, " ").trim()).toBe(said);
  await cdp.detach();
}

describe("focus after a submit, on a tablet", () => {
  it("the delivery form moves focus to the first field in error, with one alert", async () => {
    const page = await signedInPage(browser, "buyer", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/deliveries/new`);
    await page.getByRole("button", { name: "Receive 1 block" }).click();
    await expect.poll(async () => (await focused(page)).invalid, { timeout: 10_000 }).toBe(true);
    await expectOneSummary(page);
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
    await expectOneSummary(page);
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
    await expect.poll(() => page.locator("#page-announcer").getAttribute("data-said")).toContain("Approved");
    expect((await focused(page)).body).toBe(false);
    await page.context().close();
  });
});
