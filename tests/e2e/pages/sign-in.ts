import type { Page } from "playwright-core";
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
