// Sign in through the page as each role and see the overview of the demo environment.
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { SignInPage } from "./pages/signin";
import { ROLES } from "@/lib/auth/roles";

const browser = browserForFile();

describe("sign-in", () => {
  it("refuses a wrong password with a readable message", async () => {
    const page = await browser().newPage();
    const signin = new SignInPage(page);
    await signin.open();
    await screenshot(page, "signin");
    await signin.signIn("viewer@harbor-pantry.example", "not-the-password");
    await expect.poll(async () => (await signin.error().textContent()) ?? "").toContain("do not match");
    expect(page.url()).toContain("/signin");
    await screenshot(page, "signin-wrong-password");
    await page.close();
  });

  it("sends an anonymous visitor of a page to sign-in", async () => {
    const page = await browser().newPage();
    await page.goto(`${baseUrl()}/environments/production`);
    expect(new URL(page.url()).pathname).toBe("/signin");
    await page.close();
  });

  for (const role of ROLES) {
    it(`signs in as ${role} and shows the overview with counts`, async () => {
      const context = await browser().newContext({ viewport: { width: 1366, height: 900 } });
      const page = await context.newPage();
      const signin = new SignInPage(page);
      await signin.open();
      await signin.signIn(`${role}@harbor-pantry.example`);
      await page.waitForURL((url) => url.pathname === "/");
      await expect.poll(() => page.getByTestId("signed-in-as").textContent()).toContain(`${role}@harbor-pantry.example`);
      // Counts come from the API through swr: wait for the real number, not the placeholder.
      const components = page.getByTestId("stat-components");
      await expect.poll(async () => Number((await components.textContent())?.match(/\d+/)?.[0] ?? 0), { timeout: 15_000 }).toBeGreaterThan(100);
      await screenshot(page, `overview-${role}`);
      await page.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL((url) => url.pathname === "/signin");
      await context.close();
    });
  }
});
