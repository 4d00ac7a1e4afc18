// Teams in the browser: a team page shows its people and who to page; a lead claims an unowned
// component for their own team from the queue. Writes use demo data no other test reads
// (print-spooler, claimed by the lead of checkout).
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

describe("teams", () => {
  it("shows a team's people, leads and on-call contact", async () => {
    const page = await signedIn("viewer");
    await page.goto(`${baseUrl()}/teams/checkout`);
    const members = page.getByTestId("team-members");
    await expect.poll(() => members.textContent(), { timeout: 15_000 }).toContain("lead@harbor-pantry.example");
    expect(await members.textContent()).toContain("engineer@harbor-pantry.example");
    expect(await page.getByTestId("team-contact").textContent()).toContain("rota checkout-primary");
    // A viewer is not a lead of checkout: no edit control.
    expect(await page.getByRole("button", { name: "Edit" }).count()).toBe(0);
    await screenshot(page, "team-checkout");
    await page.context().close();
  });

  it("lists every team and the unowned queue; a lead claims print-spooler for checkout", async () => {
    const page = await signedIn("lead");
    await page.goto(`${baseUrl()}/teams`);
    await expect.poll(() => page.getByTestId("teams-table").locator("tbody tr").count(), { timeout: 15_000 }).toBe(12);
    const row = page.getByTestId("unowned-production-print-spooler");
    await row.waitFor({ timeout: 15_000 });
    // The lead leads only checkout: a claim button, no team choice.
    expect(await row.getByRole("combobox").count()).toBe(0);
    await screenshot(page, "teams-unowned-queue");
    await row.getByRole("button", { name: "Claim print-spooler" }).click();
    await expect.poll(() => page.getByTestId("unowned-production-print-spooler").count(), { timeout: 10_000 }).toBe(0);
    await page.goto(`${baseUrl()}/teams/checkout`);
    await expect.poll(() => page.getByText("print-spooler").count(), { timeout: 15_000 }).toBeGreaterThan(0);
    await screenshot(page, "team-checkout-after-claim");
    await page.context().close();
  });

  it("gives an architect a team choice in the queue", async () => {
    const page = await signedIn("architect");
    await page.goto(`${baseUrl()}/teams`);
    const rows = page.locator('[data-testid^="unowned-production-"]');
    await rows.first().waitFor({ timeout: 15_000 });
    expect(await rows.first().getByRole("combobox").count()).toBe(1);
    await page.context().close();
  });
});
