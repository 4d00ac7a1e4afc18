// Single sign-on end to end: the sign-in page → the OpenID Connect stand-in → back signed in;
// the first sign-in creates a viewer, and an identity with a verified address links to that account.
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";

const browser = browserForFile();

async function signInThroughStandIn(login: string) {
  const context = await browser().newContext({ viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  await page.goto(`${baseUrl()}/signin`);
  await page.getByRole("button", { name: /Continue with/ }).click();
  // oidc-provider's development login and consent pages.
  await page.locator('input[name="login"]').waitFor({ timeout: 15_000 });
  await screenshot(page, "sso-stand-in-login");
  await page.locator('input[name="login"]').fill(login);
  await page.locator('input[name="password"]').fill("any");
  await page.locator('button[type="submit"]').click();
  const consent = page.locator('button[type="submit"]', { hasText: /continue/i });
  if (await consent.isVisible({ timeout: 5_000 }).catch(() => false)) await consent.click();
  await page.waitForURL((url) => url.origin === baseUrl() && url.pathname === "/", { timeout: 20_000 });
  return { context, page };
}

describe("single sign-on", () => {
  it("creates a viewer on first sign-in", async () => {
    const { context, page } = await signInThroughStandIn("sso-mara");
    await expect.poll(() => page.getByTestId("signed-in-as").textContent()).toContain("mara.tideway@harbor-pantry.example");
    expect(await page.getByTestId("signed-in-as").textContent()).toContain("Viewer");
    await screenshot(page, "sso-signed-in");
    await context.close();
  });

  it("links a verified address to the existing password account", async () => {
    const { context, page } = await signInThroughStandIn("sso-viewer");
    await expect.poll(() => page.getByTestId("signed-in-as").textContent()).toContain("viewer@harbor-pantry.example");
    await context.close();
  });
});
