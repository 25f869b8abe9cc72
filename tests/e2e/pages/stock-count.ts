import QRCode from "qrcode";
import sharp from "sharp";
import type { Page } from "playwright-core";
import { BASE_URL } from "./browser";

/**
 * A photo of a block label as a tablet's camera would take it: the label's QR code (error
 * correction M, as the labels page prints it) small on a grey background, saved as a JPEG.
 */
export async function labelPhoto(text: string): Promise<Buffer> {
  const qr = await QRCode.toBuffer(text, { errorCorrectionLevel: "M", margin: 2, scale: 8 });
  return sharp({ create: { width: 1600, height: 1200, channels: 3, background: "#8a8f90" } })
    .composite([{ input: qr, left: 600, top: 380 }])
    .jpeg({ quality: 85 })
    .toBuffer();
}

/** The stock count page, as the buyer walking the yard with the tablet uses it. */
export class StockCountPage {
  constructor(private page: Page) {}

  async open() {
    await this.page.goto(`${BASE_URL}/stock/count`);
  }

  async start(location: string) {
    await this.page.getByLabel("Place to count").selectOption({ label: location });
    await this.page.getByRole("button", { name: "Start counting" }).click();
    await this.main().getByText(`Counting ${location}.`).waitFor();
  }

  /** Takes a "photo" of a label through the page's file input (camera=environment on a tablet). */
  async photograph(photo: Buffer, name = "label.jpg") {
    await this.page
      .getByLabel("Take a photo of the label")
      .setInputFiles({ name, mimeType: "image/jpeg", buffer: photo });
  }

  async type(code: string) {
    await this.page.getByLabel("Or type the code").fill(code);
    await this.page.getByRole("button", { name: "Find block" }).click();
  }

  /** The page's content (the announcer outside it repeats each result, for screen readers). */
  main() {
    return this.page.getByRole("main");
  }

  checkCard(code: string) {
    return this.page.getByRole("heading", { name: `Check ${code}`, exact: true });
  }
}
