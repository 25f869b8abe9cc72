import type { Browser, Page } from "playwright-core";
import { BASE_URL } from "./browser";

/** The sign-in page, as a person uses it. */
export class SignInPage {
  constructor(private page: Page) {}

  async open() {
    await this.page.goto(`${BASE_URL}/sign-in`);
  }

  async signIn(email: string, password: string) {
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }
}

/** A fresh browser context at `viewport`, signed in as the demo user of `role`, on its home page. */
export async function signedInPage(
  browser: Browser,
  role: string,
  viewport: { width: number; height: number },
): Promise<Page> {
  return signedInAs(browser, `${role}@demo.blockyard.test`, "blockyard-demo", viewport);
}

/** A fresh browser context at `viewport`, signed in with these credentials, on its home page. */
export async function signedInAs(
  browser: Browser,
  email: string,
  password: string,
  viewport: { width: number; height: number },
): Promise<Page> {
  const page = await (await browser.newContext({ viewport })).newPage();
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.signIn(email, password);
  await page.waitForURL(`${BASE_URL}/`);
  return page;
}
