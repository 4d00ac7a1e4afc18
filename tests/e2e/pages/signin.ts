// Page object: the sign-in screen.
import type { Browser, Page } from "playwright-core";
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

/** A new browser context signed in as a demo account (`admin`, `lead`, … or a full e-mail), on the overview. */
export async function signedInPage(browser: Browser, who: string, viewport = { width: 1366, height: 900 }): Promise<Page> {
  // The theme follows the operating system's preference; these screens were written against dark.
  const context = await browser.newContext({ viewport, colorScheme: "dark" });
  const page = await context.newPage();
  const signin = new SignInPage(page);
  await signin.open();
  await signin.signIn(who.includes("@") ? who : `${who}@harbor-pantry.example`);
  await page.waitForURL((url) => url.pathname === "/");
  return page;
}
