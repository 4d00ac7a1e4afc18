// Admin → Environments in the browser: an admin creates a scratch environment, renames it inline,
// and deletes it only after typing its slug; the default environment offers no delete; other roles
// are turned away on the server. Uses its own environment so no other test's data changes.
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const SLUG = "e2e-scratch";

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

describe("admin environments screen", () => {
  it("creates, renames and deletes an environment, the delete asking for the slug", async () => {
    const page = await signedIn("admin");
    await page.goto(`${baseUrl()}/admin/environments`);
    expect(await page.getByRole("navigation", { name: "Admin" }).getByRole("link", { name: "Environments" }).getAttribute("aria-current")).toBe("page");

    // The seeded default: listed with its graph, and not deletable from here.
    const production = page.getByTestId("environment-row-production");
    await production.waitFor({ timeout: 15_000 });
    expect(await production.textContent()).toContain("default");
    expect(await production.getByRole("button", { name: /^Delete/ }).count()).toBe(0);

    await page.getByLabel("Slug").fill(SLUG);
    await page.getByLabel("Display name").fill("E2E scratch");
    await page.getByRole("button", { name: "Create environment" }).click();
    const row = page.getByTestId(`environment-row-${SLUG}`);
    await row.waitFor({ timeout: 15_000 });
    await expect.poll(async () => (await row.textContent()) ?? "").toContain("E2E scratch");
    expect(await row.textContent()).toContain("no push yet");

    // A taken slug is refused with the server's issue beside the slug field.
    await page.getByLabel("Slug").fill(SLUG);
    await page.getByRole("button", { name: "Create environment" }).click();
    await expect.poll(async () => (await page.getByTestId("error-slug").textContent()) ?? "").toContain("already taken");
    await page.getByLabel("Slug").fill("");

    await row.getByRole("button", { name: `Rename ${SLUG}` }).click();
    const nameField = row.getByLabel(`New name for ${SLUG}`);
    await nameField.fill("Scratch for drills");
    await row.getByRole("button", { name: "Save name" }).click();
    await expect.poll(async () => (await row.textContent()) ?? "", { timeout: 15_000 }).toContain("Scratch for drills");
    await screenshot(page, "admin-environments");

    await row.getByRole("button", { name: `Delete ${SLUG}` }).click();
    const dialog = page.getByRole("dialog", { name: `Delete ${SLUG} for good?` });
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain("API token");
    const confirmField = dialog.getByLabel(`Type ${SLUG} to confirm`);
    const confirmButton = dialog.getByRole("button", { name: `Delete ${SLUG}` });
    await confirmField.fill("e2e-scratc");
    expect(await confirmButton.isDisabled()).toBe(true);
    await confirmField.fill(SLUG);
    expect(await confirmButton.isDisabled()).toBe(false);
    await screenshot(page, "admin-environments-delete");
    await confirmButton.click();

    await expect.poll(async () => row.count(), { timeout: 15_000 }).toBe(0);
    expect(await page.getByRole("status").allTextContents()).toEqual(expect.arrayContaining([expect.stringContaining(`Deleted ${SLUG}`)]));
    const gone = await page.request.get(`${baseUrl()}/api/v1/environments/${SLUG}`);
    expect(gone.status()).toBe(404);
    await page.context().close();
  });

  it("sends an architect (who may open the audit log) to /forbidden here, and shows no Environments tab", async () => {
    const page = await signedIn("architect");
    await page.goto(`${baseUrl()}/admin/environments`);
    expect(new URL(page.url()).pathname).toBe("/forbidden");
    await page.goto(`${baseUrl()}/admin/audit`);
    expect(await page.getByRole("navigation", { name: "Admin" }).getByRole("link", { name: "Environments" }).count()).toBe(0);
    await page.context().close();
  });
});
