// Risk reviews in the browser: an architect accepts the risk of legacy-ftp-drop (a component no
// other test reads) with a date and sees the badge; a viewer sees reviews but no form.
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

describe("risk reviews", () => {
  it("lets an architect accept a pinch point with a date and shows the badge", async () => {
    const page = await signedIn("architect");
    await page.goto(`${baseUrl()}/environments/production/reviews`);
    const form = page.getByRole("form", { name: "Review a pinch point" });
    await form.getByLabel("Component").fill("legacy-ftp-drop");
    await form.getByLabel("Decision").selectOption("accepted");
    await form.getByLabel("Look again by").fill(inDays(60));
    // No rationale yet: the form's own check (the route's schema) stops it, beside the field.
    await page.getByRole("button", { name: "Save review" }).click();
    await expect.poll(async () => (await form.getByTestId("error-rationale").textContent()) ?? "").not.toBe("");
    await form.getByLabel("Rationale").fill("Supplier moves to the feed API next quarter; until then the drop box stays single-zone.");
    await page.getByRole("button", { name: "Save review" }).click();
    const row = page.getByTestId("review-legacy-ftp-drop");
    await row.waitFor({ timeout: 10_000 });
    const badge = row.getByTestId("review-badge");
    expect(await badge.getAttribute("data-status")).toBe("accepted");
    expect(await badge.getAttribute("data-overdue")).toBe("false");
    expect(await badge.textContent()).toContain("Risk accepted");
    await screenshot(page, "reviews-accepted");
    await page.context().close();
  });

  it("shows a viewer the reviews and weights without any way to change them", async () => {
    const page = await signedIn("viewer");
    await page.goto(`${baseUrl()}/environments/production/reviews`);
    await page.getByTestId("review-legacy-ftp-drop").waitFor({ timeout: 15_000 });
    expect(await page.getByRole("button", { name: "Save review" }).count()).toBe(0);
    expect(await page.getByRole("button", { name: "Save and re-analyse" }).count()).toBe(0);
    expect(await page.getByLabel("B · betweenness").isDisabled()).toBe(true);
    await screenshot(page, "reviews-viewer");
    await page.context().close();
  });
});
