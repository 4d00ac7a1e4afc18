// Page object: the sign-in screen.
import type { Page } from "playwright-core";
import { baseUrl } from "../browser";

export const DEMO_PASSWORD = "pinchpoint-demo";

export class SignInPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${baseUrl()}/signin`);
  }

  async signIn(email: string, password = DEMO_PASSWORD): Promise<void> {
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }

  error() {
    return this.page.locator("#signin-error");
  }
}
