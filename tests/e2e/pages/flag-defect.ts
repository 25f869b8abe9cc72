import type { Page } from "playwright-core";
import { BASE_URL } from "./browser";

type ViewName = "top" | "front" | "side";

/** The "Flag a defect" page, as a cutter at the tablet uses it. */
export class FlagDefectPage {
  constructor(private page: Page) {}

  async open(code?: string) {
    await this.page.goto(`${BASE_URL}/defects/new${code ? `?code=${encodeURIComponent(code)}` : ""}`);
  }

  async findBlock(code: string) {
    await this.page.getByLabel("Block code").fill(code);
    await this.page.getByRole("button", { name: "Find block" }).click();
    await this.page.getByRole("heading", { name: code, level: 2, exact: true }).waitFor();
  }

  view(name: ViewName) {
    return this.page.locator(`svg[data-view="${name}"]`);
  }

  /** Drags across a face from one point to another, given as fractions of the drawing's box. */
  async drawOn(name: ViewName, from: [number, number], to: [number, number]) {
    const box = await this.view(name).boundingBox();
    if (!box) throw new Error(`the ${name} view is not on screen`);
    const at = ([fx, fy]: [number, number]) => [box.x + box.width * fx, box.y + box.height * fy] as const;
    const [x0, y0] = at(from);
    const [x1, y1] = at(to);
    await this.page.mouse.move(x0, y0);
    await this.page.mouse.down();
    await this.page.mouse.move((x0 + x1) / 2, (y0 + y1) / 2, { steps: 4 });
    await this.page.mouse.move(x1, y1, { steps: 4 });
    await this.page.mouse.up();
  }

  coordinate(end: "min" | "max", axis: 0 | 1 | 2) {
    return this.page.locator(`input[name="${end}.${axis}"]`);
  }

  async chooseKind(label: string) {
    await this.page.getByLabel("Kind of defect").selectOption({ label });
  }

  async attachPhoto(name: string, buffer: Buffer, mimeType = "image/jpeg") {
    await this.page.locator('input[name="photos"]').setInputFiles({ name, mimeType, buffer });
  }

  async save() {
    await this.page.getByRole("button", { name: "Save the zone" }).click();
  }

  zones() {
    return this.page.locator('[data-testid^="zone-"]');
  }
}
