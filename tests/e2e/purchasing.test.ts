import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { ReorderPage, ReportsPage } from "./pages/purchasing";
import { closeTestDb, testDb } from "../support/db";
import { seed as seedPurchasing } from "@/db/seeds/04_purchasing";

let browser: Browser;
beforeAll(async () => {
  // Start from the demo shop's purchasing state (other test files send orders and set overrides).
  await seedPurchasing(testDb());
  // Other files add EPS-II test blocks by the hundred; a forecast that outruns them keeps EPS-II due.
  const epsII = await testDb()("grades").where({ code: "EPS-II" }).first("id");
  await testDb()("grade_reorder").where({ grade_id: epsII!.id }).update({ daily_demand_m3: 500 });
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

async function signedIn(role: string, viewport: { width: number; height: number }): Promise<Page> {
  return signedInPage(browser, role, viewport);
}

describe("the manager's reports", () => {
  for (const [size, viewport] of Object.entries(VIEWPORTS)) {
    it(`shows every report with a chart and its numbers (${size})`, async () => {
      const page = await signedIn("manager", viewport);
      await page.getByTestId("manager-figures").waitFor();
      await screenshot(page, `home-manager-figures-${size}`);
      const reports = new ReportsPage(page);
      await reports.open();
      await reports.chartsDrawn(5);
      for (const title of ["Material yield", "Losses by kind", "Offcuts", "Supplier quality", "Stock value"]) {
        const section = reports.section(title);
        expect(await section.count(), title).toBe(1);
        expect(await section.getByRole("link", { name: "Export CSV" }).count(), title).toBe(1);
        expect(await section.locator("table").count(), title).toBeGreaterThan(0);
      }
      expect(await page.getByText(/bounding box|profile/).count()).toBeGreaterThan(0);
      const file = await screenshot(page, `reports-manager-${size}`);
      expect(fs.statSync(file).size).toBeGreaterThan(40_000);
      await page.context().close();
    });
  }

  it("filters by period through the form", async () => {
    const page = await signedIn("manager", VIEWPORTS.wide);
    const reports = new ReportsPage(page);
    await reports.open();
    await reports.setPeriod("2019-01-01", "2019-01-31");
    expect(await page.getByText("No figures in this period.").count()).toBeGreaterThan(0);
    await page.context().close();
  });
});

describe("the buyer's reorder list", () => {
  for (const [size, viewport] of Object.entries(VIEWPORTS)) {
    it(`lists the grades at or under their reorder point with the reasons (${size})`, async () => {
      const page = await signedIn("buyer", viewport);
      await page.getByTestId("buyer-figures").waitFor();
      await screenshot(page, `home-buyer-figures-${size}`);
      const reorder = new ReorderPage(page);
      await reorder.open();
      await reorder.dueHeading().waitFor();
      const dueCount = Number((await reorder.dueHeading().textContent())!.match(/\((\d+)\)/)![1]);
      expect(dueCount).toBeGreaterThan(0);
      const first = (await page.locator('[data-testid^="reorder-"]').first().getAttribute("data-testid"))!.replace(
        "reorder-",
        "",
      );
      const why = await reorder.explain(first);
      expect(await why.getByText(/SS = z·√\(L·σd² \+ d²·σL²\)/).count()).toBe(1);
      expect(await why.getByText(/Lead-time demand = max\(d·L, booked\)/).count()).toBe(1);
      expect(await why.getByText(/never the two added/).count()).toBe(1);
      expect(await why.getByText(/EOQ = √\(2DS\/H\)|set by the buyer/).count()).toBeGreaterThan(0);
      expect(await page.getByText("Stored foam is a fire load").count()).toBe(1);
      const file = await screenshot(page, `reorder-buyer-${size}`);
      expect(fs.statSync(file).size).toBeGreaterThan(30_000);
      await page.context().close();
    });
  }

  it("drafts orders from the list and shows the new order", async () => {
    const page = await signedIn("buyer", VIEWPORTS.tablet);
    const reorder = new ReorderPage(page);
    await reorder.open();
    await reorder.draftOrders();
    await page
      .getByRole("link", { name: /^PO-\d{4}-\d{4}/ })
      .first()
      .click();
    await page.getByRole("heading", { level: 1, name: /^PO-/ }).waitFor();
    expect(await page.getByText("Draft", { exact: true }).count()).toBeGreaterThan(0);
    await screenshot(page, "po-draft-tablet");
    await page.context().close();
  });

  it("receives against a sent order on the tablet, with the ±10 % tally", async () => {
    const page = await signedIn("buyer", VIEWPORTS.tablet);
    await page.goto(`${BASE_URL}/purchasing/orders?status=sent`);
    await page.getByRole("link", { name: /^PO-/ }).first().click();
    await page.getByRole("link", { name: "Receive against this order" }).click();
    await page.getByTestId("tally").waitFor();
    await page.getByLabel("Lot").fill("E2E-LOT-1");
    await screenshot(page, "po-receive-tablet");
    await page.getByRole("button", { name: /^Receive \d+ blocks into stock/ }).click();
    await page.waitForURL(/\/purchasing\/orders\/\d+$/);
    expect(await page.getByText(/Closed|Partly received/).count()).toBeGreaterThan(0);
    await screenshot(page, "po-received-tablet");
    await page.context().close();
  });
});

describe("the admin's outbox", () => {
  it("lists the mails sent, with their attachments", async () => {
    const page = await signedIn("admin", VIEWPORTS.wide);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox", exact: true }).click();
    await page.getByRole("heading", { name: "Outbox", level: 1 }).waitFor();
    expect(await page.locator('[data-testid^="mail-"]').count()).toBeGreaterThanOrEqual(2);
    expect(await page.getByText(/^PO-\d{4}-\d{4}\.csv$/).count()).toBeGreaterThan(0);
    await screenshot(page, "outbox-admin-wide");
    await page.goto(`${BASE_URL}/purchasing/orders`);
    await page.getByRole("heading", { name: "Purchase orders", level: 1 }).waitFor();
    await screenshot(page, "po-list-admin-wide");
    await page.context().close();
  });
});

describe("the safety page", () => {
  it("lists the cautions with their sources for everyone", async () => {
    const page = await signedIn("cutter", VIEWPORTS.tablet);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Safety", exact: true }).click();
    await page.getByRole("heading", { name: "Safety cautions and their sources" }).waitFor();
    expect(await page.getByTestId("osha-pel").textContent()).toBe("100");
    expect(await page.getByTestId("niosh-rel").textContent()).toBe("50");
    expect(await page.getByTestId("idlh").textContent()).toBe("700");
    expect(await page.getByText(/International Fire Code \(2018\), chapter 32/).count()).toBeGreaterThan(0);
    await screenshot(page, "safety-tablet");
    await page.context().close();
  });
});
