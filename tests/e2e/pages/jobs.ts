import type { Page } from "playwright-core";
import { BASE_URL } from "./browser";

/** The jobs list and a job's page, as a planner uses them. */
export class JobsPage {
  constructor(private page: Page) {}

  async openList() {
    await this.page.goto(`${BASE_URL}/jobs`);
    await this.page.getByRole("heading", { name: "Jobs", level: 1 }).waitFor();
  }

  async createJob(name: string, customer: string, dueOn: string) {
    await this.page.getByLabel("Job name").fill(name);
    await this.page.getByLabel("Customer or project").fill(customer);
    await this.page.getByLabel("Due").fill(dueOn);
    await this.page.getByRole("button", { name: "Create the job" }).click();
    await this.page.getByRole("heading", { name, level: 1 }).waitFor();
    return Number(new URL(this.page.url()).pathname.split("/").pop());
  }

  async open(jobId: number) {
    await this.page.goto(`${BASE_URL}/jobs/${jobId}`);
  }

  /** Chooses a part-list file, checks it, then imports it. */
  async importCsv(name: string, csv: string) {
    await this.page
      .locator('input[type="file"]')
      .setInputFiles({ name, mimeType: "text/csv", buffer: Buffer.from(csv) });
    await this.page.getByRole("button", { name: "Check the file" }).click();
    await this.page.getByText(/rows are fine|nothing will be imported/).waitFor();
  }

  async confirmImport() {
    await this.page.getByRole("button", { name: /^Import \d+ rows$/ }).click();
    await this.page.getByText(/part lines added to the job/).waitFor();
  }

  problems() {
    return this.page.getByTestId("import-problems");
  }

  partRows() {
    return this.page.getByTestId("job-parts").locator("tbody tr[data-testid^='part-']");
  }

  async addNacaPart(name: string, qty: number, code: string, chord: number, tip: number, span: number, unit = "mm") {
    await this.page.getByLabel("Part name").fill(name);
    await this.page.getByLabel("Quantity", { exact: true }).fill(String(qty));
    await this.page.getByLabel("NACA wing panel").check();
    await this.page.getByLabel("NACA code").fill(code);
    await this.page.getByLabel(`Root chord ${unit}`).fill(String(chord));
    await this.page.getByLabel(`Tip chord ${unit}`).fill(String(tip));
    await this.page.getByLabel(`Span ${unit} (along the wire)`).fill(String(span));
  }

  async addBoxPart(name: string, qty: number, size: [number, number, number], unit = "mm") {
    await this.page.getByLabel("Part name").fill(name);
    await this.page.getByLabel("Quantity", { exact: true }).fill(String(qty));
    await this.page.getByLabel(`Length ${unit}`).fill(String(size[0]));
    await this.page.getByLabel(`Width ${unit}`).fill(String(size[1]));
    await this.page.getByLabel(`Height ${unit}`).fill(String(size[2]));
  }

  preview() {
    return this.page.getByTestId("section-preview").first();
  }

  async submitPart() {
    await this.page.getByRole("button", { name: "Add the part" }).click();
  }
}
