// The audit screen in the browser: an admin filters the log and reads before/after; a viewer is
// turned away on the server.
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

const count = async (page: Page) => Number((await page.getByTestId("audit-total").textContent())?.match(/\d+/)?.[0] ?? -1);

describe("audit log", () => {
  it("lets an admin open the log and filter it by action and environment", async () => {
    const page = await signedIn("admin");
    await page.goto(`${baseUrl()}/admin/audit`);
    await expect.poll(() => count(page), { timeout: 15_000 }).toBeGreaterThan(0);
    const all = await count(page);
    await screenshot(page, "audit-all");
    // The seed's first push created production: that event is always there.
    await page.locator("#f-action").selectOption("environment");
    await page.getByLabel("Environment").fill("production");
    await page.getByRole("button", { name: "Filter" }).click();
    await expect.poll(() => new URL(page.url()).searchParams.get("action")).toBe("environment");
    await expect.poll(() => count(page), { timeout: 10_000 }).toBeLessThan(all);
    const events = page.getByTestId("audit-events");
    expect(await events.textContent()).toContain("environment.create");
    const actions = await events.getByTestId("audit-action").allTextContents();
    expect(actions.length).toBeGreaterThan(0);
    for (const text of actions) expect(text.startsWith("environment.")).toBe(true);
    await screenshot(page, "audit-filtered");
    // The filtered view has a stable URL: opening it again shows the same.
    await page.reload();
    await expect.poll(() => page.getByTestId("audit-events").textContent(), { timeout: 10_000 }).toContain("environment.create");
    await page.context().close();
  });

  it("turns a viewer away from the page", async () => {
    const page = await signedIn("viewer");
    await page.goto(`${baseUrl()}/admin/audit`);
    expect(new URL(page.url()).pathname).toBe("/forbidden");
    await page.context().close();
  });
});
