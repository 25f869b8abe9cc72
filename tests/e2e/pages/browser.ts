import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";

export const BASE_URL = process.env.APP_URL ?? "http://127.0.0.1:3199";
export const SHOTS = path.join(process.cwd(), "test-results", "screenshots");

// Flags that work on this kind of machine (see ../shared/toolchain.md); Playwright makes its own profile.
const ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: ARGS,
  });
}

export const VIEWPORTS = {
  wide: { width: 1366, height: 900 },
  tablet: { width: 820, height: 1180 },
} as const;

/**
 * The whole page as a PNG under SHOTS. A full-page capture of a long page can take long on a busy
 * two-core machine: it is given a minute, and if that is not enough the visible part is taken.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(SHOTS, { recursive: true });
  const file = path.join(SHOTS, `${name}.png`);
  try {
    await page.screenshot({ path: file, fullPage: true, timeout: 60_000 });
  } catch (e) {
    console.warn(
      `[screenshot] ${name}: full page not taken (${e instanceof Error ? e.message.split("\n")[0] : e}); taking the viewport`,
    );
    await page.screenshot({ path: file, timeout: 60_000 });
  }
  return file;
}
