import type { Page } from "playwright-core";
import { BASE_URL } from "./browser";

/** The buyer's reorder list. */
export class ReorderPage {
  constructor(private page: Page) {}

  async open() {
    await this.page.goto(`${BASE_URL}/purchasing`);
    await this.page.getByRole("heading", { name: "Reorder list", level: 1 }).waitFor();
  }

  dueHeading() {
    return this.page.getByRole("heading", { name: /At or under the reorder point/ });
  }

  row(gradeCode: string) {
    return this.page.getByTestId(`reorder-${gradeCode}`);
  }

  /** Opens the "why" panel of a grade: every input and every step of the arithmetic. */
  async explain(gradeCode: string) {
    await this.row(gradeCode).getByRole("button", { name: "Why?" }).click();
    await this.page.getByTestId(`why-${gradeCode}`).waitFor();
    return this.page.getByTestId(`why-${gradeCode}`);
  }

  async draftOrders() {
    await this.page.getByRole("button", { name: /^Draft orders for/ }).click();
    await this.page.getByText(/^Drafted \d+ order/).waitFor();
  }
}

/** The manager's reports page. */
export class ReportsPage {
  constructor(private page: Page) {}

  async open(period?: { from: string; to: string }) {
    await this.page.goto(`${BASE_URL}/reports${period ? `?from=${period.from}&to=${period.to}` : ""}`);
    await this.page.getByRole("heading", { name: "Reports", level: 1 }).waitFor();
  }

  async setPeriod(from: string, to: string) {
    await this.page.getByLabel("From", { exact: true }).fill(from);
    await this.page.getByLabel("To", { exact: true }).fill(to);
    await this.page.getByRole("button", { name: "Show period" }).click();
    await this.page.waitForURL(new RegExp(`from=${from}&to=${to}`));
  }

  /** Waits until every chart has drawn its SVG. */
  async chartsDrawn(count: number) {
    await this.page.waitForFunction((n) => document.querySelectorAll("figure .recharts-surface").length >= n, count);
  }

  section(title: string) {
    return this.page.locator("section").filter({ has: this.page.getByRole("heading", { name: title, level: 2 }) });
  }
}
