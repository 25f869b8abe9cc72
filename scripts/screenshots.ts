/**
 * Looks at pages the way people do: signs in as a role and saves full-page screenshots at tablet
 * and wide sizes.   npx tsx scripts/screenshots.ts planner /plans/3 /jobs ...
 * (BASE_URL defaults to http://localhost:3000; files go to test-results/screenshots/manual-*.png)
 */
import fs from "node:fs";
import path from "node:path";
import { chromium } from "playwright-core";

async function main() {
  const [role = "admin", ...pages] = process.argv.slice(2);
  const base = process.env.SHOT_URL ?? "http://localhost:3000";
  const dir = path.join("test-results", "screenshots");
  fs.mkdirSync(dir, { recursive: true });
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
  for (const [size, viewport] of [
    ["tablet", { width: 820, height: 1180 }],
    ["wide", { width: 1366, height: 900 }],
  ] as const) {
    const ctx = await browser.newContext({ viewport });
    const page = await ctx.newPage();
    await page.goto(`${base}/sign-in`);
    await page.getByLabel("E-mail").fill(`${role}@demo.blockyard.test`);
    await page.getByLabel("Password").fill("blockyard-demo");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${base}/`);
    for (const p of pages.length ? pages : ["/"]) {
      await page.goto(`${base}${p}`);
      await page.waitForLoadState("networkidle");
      const file = path.join(dir, `manual-${role}-${p.replace(/[^\w]+/g, "_")}-${size}.png`);
      await page.screenshot({ path: file, fullPage: true });
      console.log(file);
    }
    await ctx.close();
  }
  await browser.close();
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
