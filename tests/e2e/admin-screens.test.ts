// Admin → Tokens and Admin → Users in the browser: a token shown once then revoked, an invite
// link that works once, and the pages closed to everyone but admins (checked on the server).
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

describe("admin screens", () => {
  it("creates a token, shows it once, and revokes it after asking", async () => {
    const page = await signedIn("admin");
    await page.goto(`${baseUrl()}/admin/tokens`);
    await page.getByLabel("Name").fill("e2e-admin-token");
    await page.getByLabel("Only for environment").selectOption("production");
    await page.getByLabel("Only for source").fill("e2e-token-repo");
    await page.getByRole("button", { name: "Create token" }).click();
    const field = page.getByTestId("new-token");
    await field.waitFor({ timeout: 15_000 });
    const secret = await field.inputValue();
    expect(secret).toMatch(/^ppt_[A-Za-z0-9_-]{40}$/);
    expect(await page.getByText("you will not see it again", { exact: false }).count()).toBe(1);
    await screenshot(page, "admin-token-created");

    await page.getByRole("button", { name: /I have stored it/ }).click();
    await page.reload();
    const row = page.getByTestId("token-row-e2e-admin-token");
    await row.waitFor({ timeout: 15_000 });
    expect(await page.content()).not.toContain(secret);
    expect(await row.textContent()).toContain(secret.slice(0, 12));
    expect(await row.textContent()).toContain("production / e2e-token-repo");

    await row.getByRole("button", { name: "Revoke" }).click();
    await screenshot(page, "admin-token-revoke-confirm");
    await row.getByRole("button", { name: "Yes, revoke" }).click();
    await expect.poll(async () => (await row.textContent()) ?? "", { timeout: 15_000 }).toContain("revoked");
    // The revoked secret no longer authenticates.
    const res = await fetch(`${baseUrl()}/api/v1/environments`, { headers: { authorization: `Bearer ${secret}` } });
    expect(res.status).toBe(401);
    await screenshot(page, "admin-tokens");
    await page.context().close();
  });

  it("invites someone whose link sets a password once", async () => {
    const page = await signedIn("admin");
    await page.goto(`${baseUrl()}/admin/users`);
    const email = `e2e-invitee-${Date.now()}@harbor-pantry.example`;
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Name", { exact: true }).fill("Ines Varga");
    await page.locator('select[name="role"]').selectOption("lead");
    await page.getByRole("button", { name: "Invite" }).click();
    const linkField = page.getByTestId("invite-link");
    await linkField.waitFor({ timeout: 15_000 });
    const link = await linkField.inputValue();
    expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]{43}$/);
    await expect.poll(async () => (await page.getByTestId(`user-row-${email}`).textContent()) ?? "").toContain("invited");
    // The signed-in admin's own row offers no way to demote or deactivate themselves.
    const own = page.getByTestId("user-row-admin@harbor-pantry.example");
    expect(await own.getByRole("combobox").isDisabled()).toBe(true);
    expect(await own.getByRole("button", { name: "Deactivate" }).count()).toBe(0);
    await screenshot(page, "admin-users-invited");

    const invitee = await browser().newContext({ viewport: { width: 1366, height: 900 } });
    const invitePage = await invitee.newPage();
    const path = new URL(link).pathname;
    await invitePage.goto(`${baseUrl()}${path}`);
    await invitePage.getByLabel("New password").fill("harbour lights at dusk");
    await invitePage.getByLabel("Same password again").fill("harbour lights at dusk");
    await screenshot(invitePage, "invite-set-password");
    await invitePage.getByRole("button", { name: /Set password/ }).click();
    await invitePage.waitForURL((url) => url.pathname === "/", { timeout: 15_000 });
    await expect.poll(() => invitePage.getByTestId("signed-in-as").textContent()).toContain(email);
    await invitee.close();

    const again = await browser().newContext();
    const againPage = await again.newPage();
    await againPage.goto(`${baseUrl()}${path}`);
    await againPage.getByTestId("invite-invalid").waitFor();
    await screenshot(againPage, "invite-used");
    await again.close();
    await page.context().close();
  });

  it("sends a viewer who opens an admin page to /forbidden", async () => {
    const page = await signedIn("viewer");
    for (const target of ["/admin/tokens", "/admin/users"]) {
      await page.goto(`${baseUrl()}${target}`);
      expect(new URL(page.url()).pathname).toBe("/forbidden");
    }
    expect(await page.getByRole("link", { name: "Admin" }).count()).toBe(0);
    await page.context().close();
  });
});
