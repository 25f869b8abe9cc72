import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, VIEWPORTS, launch, screenshot } from "./pages/browser";
import { SignInPage } from "./pages/sign-in";
import { ROLES } from "@/lib/roles";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const NAV_EXPECTED: Record<string, { sees: string[]; doesNotSee: string[] }> = {
  admin: { sees: ["Today", "People", "Shop settings"], doesNotSee: [] },
  buyer: { sees: ["Today"], doesNotSee: ["People", "Shop settings"] },
  cutter: { sees: ["Today"], doesNotSee: ["People", "Shop settings"] },
  planner: { sees: ["Today"], doesNotSee: ["People", "Shop settings"] },
  manager: { sees: ["Today"], doesNotSee: ["People", "Shop settings"] },
};

describe("each demo role signs in and sees its own home page", () => {
  for (const role of ROLES) {
    it(`${role}: signs in through the form and gets a home page with its navigation`, async () => {
      for (const [size, viewport] of Object.entries(VIEWPORTS)) {
        const context = await browser.newContext({ viewport });
        const page = await context.newPage();
        const signIn = new SignInPage(page);
        await signIn.open();
        await signIn.signIn(`${role}@demo.blockyard.test`, "blockyard-demo");
        await page.waitForURL(`${BASE_URL}/`);
        await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/Good to see you/);
        const nav = page.getByRole("navigation", { name: "Main" });
        for (const label of NAV_EXPECTED[role]!.sees)
          expect(await nav.getByRole("link", { name: label, exact: true }).count()).toBe(1);
        for (const label of NAV_EXPECTED[role]!.doesNotSee)
          expect(await nav.getByRole("link", { name: label, exact: true }).count()).toBe(0);
        if (role === "cutter") expect(await page.getByText("Never leave a hot wire unattended").count()).toBe(1);
        const file = await screenshot(page, `home-${role}-${size}`);
        expect(fs.statSync(file).size).toBeGreaterThan(10_000);
        await context.close();
      }
    });
  }

  it("shows one message for a wrong password and stays on the sign-in page", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.tablet });
    const page = await context.newPage();
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.signIn("admin@demo.blockyard.test", "wrong-password");
    await page.getByText("do not match an active account").waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "sign-in-refused-tablet");
    await context.close();
  });

  it("sends a buyer who opens an admin page back home with a notice, and a stranger to sign-in", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.wide });
    const page = await context.newPage();
    await page.goto(`${BASE_URL}/admin/users`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    const signIn = new SignInPage(page);
    await signIn.signIn("buyer@demo.blockyard.test", "blockyard-demo");
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/admin/users`);
    await page.waitForURL(`${BASE_URL}/?denied=1`);
    await page.getByText("That page belongs to another role").waitFor();
    await context.close();
  });

  it("lets the admin add a person and change shop settings through the forms", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.wide });
    const page = await context.newPage();
    const signIn = new SignInPage(page);
    await signIn.open();
    await signIn.signIn("admin@demo.blockyard.test", "blockyard-demo");
    await page.waitForURL(`${BASE_URL}/`);
    await page.goto(`${BASE_URL}/admin/users`);
    const email = `e2e-${Date.now()}@test.blockyard.test`;
    await page.getByLabel("Name", { exact: true }).fill("Pim Ashgrove");
    await page.getByLabel("E-mail", { exact: true }).fill(email);
    await page.getByLabel("Temporary password", { exact: true }).fill("short");
    await page.getByRole("button", { name: "Add person" }).click();
    await page.getByText("Use at least 10 characters.").waitFor();
    await page.getByLabel("Temporary password", { exact: true }).fill("long-enough-1");
    await page.locator("form").filter({ hasText: "Add person" }).getByLabel("Planner").check();
    await page.getByRole("button", { name: "Add person" }).click();
    await page.getByTestId(`person-${email}`).waitFor();
    await screenshot(page, "people-wide");

    await page.goto(`${BASE_URL}/admin/settings`);
    await page.getByLabel("Kerf", { exact: true }).fill("-3");
    await page.getByRole("button", { name: "Save settings" }).click();
    await page.getByText("Kerf must be at least 0 mm.").waitFor();
    await page.getByLabel("Kerf", { exact: true }).fill("1.5");
    await page.getByRole("button", { name: "Save settings" }).click();
    await page.getByText("Shop settings saved").waitFor();
    await screenshot(page, "settings-wide");
    await context.close();
  });
});
