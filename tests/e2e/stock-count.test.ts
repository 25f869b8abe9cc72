import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { VIEWPORTS, launch, screenshot } from "./pages/browser";
import { signedInPage } from "./pages/sign-in";
import { StockCountPage, labelPhoto } from "./pages/stock-count";
import { closeTestDb, makeBlock, testDb } from "../support/db";

const require = createRequire(import.meta.url);

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("a stock count by scanning on the tablet", () => {
  it("the buyer photographs a label (no barcode detector: jsQR), confirms the block, and reconciles the count in the ledger", async () => {
    const bay = `Scan bay ${Date.now().toString(36)}`;
    const found = await makeBlock({ location: bay, size: [2000, 1000, 500] });
    const lost = await makeBlock({ location: bay, size: [1200, 1000, 500] });

    const page = await signedInPage(browser, "buyer", VIEWPORTS.tablet);
    // The test browser has no BarcodeDetector: the photo below is read by jsQR.
    expect(await page.evaluate(() => "BarcodeDetector" in window)).toBe(false);
    const count = new StockCountPage(page);
    const main = count.main();
    await count.open();
    await count.start(bay);

    // A QR code that is not a label is named as such; a typed code not in the register is refused by name.
    await count.photograph(await labelPhoto("https://example.test/not-a-label"), "poster.jpg");
    await main.getByText("That QR code is not a Blockyard label.").waitFor();
    await count.type("NOPE-0404");
    await main.getByText("No block NOPE-0404 in the register.").first().waitFor();

    await count.photograph(await labelPhoto(found.code));
    await count.checkCard(found.code).waitFor();
    const check = page.getByTestId("count-check");
    expect(await check.textContent()).toMatch(/EPS-II/);
    expect(await check.textContent()).toContain(bay);
    await main.getByText(`Found ${found.code}: check its size and place, then confirm.`).waitFor();
    await screenshot(page, "stock-count-check-tablet");
    // The scanning view itself: 44 px targets (a radio counts its label) and no serious axe finding.
    const small = await main.locator("a, button, select, input:not([type=hidden])").evaluateAll((els) =>
      els
        .map((el) => {
          const radio = (el as HTMLInputElement).type === "radio";
          const r = (radio ? (el.closest("label") ?? el) : el).getBoundingClientRect();
          return { what: el.outerHTML.slice(0, 60), width: r.width, height: r.height };
        })
        .filter((b) => b.width > 0 && b.height > 0 && (b.width < 44 || b.height < 44)),
    );
    expect(small).toEqual([]);
    await page.addScriptTag({ path: require.resolve("axe-core/axe.min.js") });
    const serious = await page.evaluate(async () => {
      // @ts-expect-error axe is the global the script tag above defines
      const result = await window.axe.run(document, {
        runOnly: { type: "tag", values: ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"] },
      });
      return (result.violations as { id: string; impact: string }[])
        .filter((v) => v.impact === "serious" || v.impact === "critical")
        .map((v) => v.id);
    });
    expect(serious).toEqual([]);
    await page.getByRole("button", { name: "Confirm and scan the next" }).click();
    await main.getByText(`${found.code} counted. 1 block so far: scan the next label.`).waitFor();
    expect(await page.getByTestId("counted-list").textContent()).toContain(found.code);

    await page.getByRole("button", { name: "Finish the count" }).click();
    const review = page.getByTestId("count-review");
    await review.getByText("Not found: written off when you reconcile (1)").waitFor();
    expect(await review.textContent()).toContain(lost.code);
    expect((await testDb()("blocks").where({ id: lost.id }).first())!.status).toBe("in_stock"); // nothing yet
    await screenshot(page, "stock-count-review-tablet");

    await page.getByRole("button", { name: "Reconcile and write off 1 block" }).click();
    await main
      .getByText(`Count of ${bay} reconciled: 1 block confirmed, 0 moved, 0 re-measured, 1 written off.`)
      .waitFor();
    expect((await testDb()("blocks").where({ id: found.id }).first())!.status).toBe("in_stock");
    expect((await testDb()("blocks").where({ id: lost.id }).first())!.status).toBe("written_off");
    const entry = await testDb()("stock_ledger").where({ block_id: lost.id, kind: "scrapped" }).first();
    expect(entry!.ref).toMatch(/^count:\d+$/);
    expect(entry!.reason).toBe(`Not found at stock count at ${bay}`);
    await page.context().close();
  });
});
