import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { closeTestDb, testDb } from "../support/db";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("finding a part in the library", () => {
  it("searches by pressing Enter in the box, and by the Search button (tablet)", async () => {
    const tag = `Qx${Date.now().toString(36)}`;
    await testDb()("library_parts").insert([
      { kit: `${tag} kit`, name: `${tag} nose cone`, size_x: 300, size_y: 120, size_z: 120, rotate: "any" },
      { kit: `${tag} kit`, name: `${tag} tail boom`, size_x: 900, size_y: 40, size_z: 40, rotate: "any" },
    ]);
    const page = await signedInPage(browser, "planner", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/library`);
    const box = page.getByRole("searchbox", { name: "Find a part" });
    await box.fill(`${tag} nose`);
    await box.press("Enter");
    await page.waitForURL(/\/library\?q=/);
    await page.getByTestId("library-search-result").waitFor();
    expect(await page.getByText(`${tag} nose cone`).count()).toBe(1);
    expect(await page.getByText(`${tag} tail boom`).count()).toBe(0);

    await box.fill(`${tag} boom`);
    await page.getByRole("button", { name: "Search", exact: true }).click();
    await page.waitForURL(/q=.*boom/);
    await page.getByText(`${tag} tail boom`).waitFor();
    expect(await page.getByText(`${tag} nose cone`).count()).toBe(0);
    await screenshot(page, "library-search-tablet");
    await page.getByRole("link", { name: "Show all" }).click();
    await page.waitForURL(/\/library$/);
    await page.context().close();
  });
});

describe("reading the ledger", () => {
  it("goes to older movements with the Older link and back to the newest", async () => {
    const page = await signedInPage(browser, "manager", VIEWPORTS.wide);
    await page.goto(`${BASE_URL}/ledger`);
    const firstRow = await page.locator("tbody tr").first().textContent();
    await page.getByRole("link", { name: "Older", exact: true }).click();
    await page.waitForURL(/\/ledger\?before=\d+/);
    expect(await page.locator("tbody tr").count()).toBeGreaterThan(0);
    expect(await page.locator("tbody tr").first().textContent()).not.toBe(firstRow);
    await page.getByRole("link", { name: "Newest", exact: true }).click();
    await page.waitForURL(/\/ledger$/);
    expect(await page.locator("tbody tr").first().textContent()).toBe(firstRow);
    await page.context().close();
  });
});
