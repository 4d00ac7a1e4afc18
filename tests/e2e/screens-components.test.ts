// Components: the list with counts and the unowned toggle, then one component's page.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "lead", { width: 1366, height: 768 });
});

describe("components", () => {
  it("lists every component, then only the unowned ones", async () => {
    await page.goto(`${baseUrl()}/environments/production/components`);
    const counts = (await page.evaluate(async () => (await fetch("/api/v1/environments/production/components")).json())) as { counts: { components: number; unowned: number } };
    // The pager (components/ui/data-table/Pager.tsx) says how many rows the filters leave, of all.
    const pager = page.getByTestId("components-table-pages");
    const total = (n: number) => `of ${n.toLocaleString("en-US")} components`;
    await expect.poll(() => pager.textContent(), { timeout: 15_000 }).toContain(total(counts.counts.components));
    await screenshot(page, "screens-components");
    await page.getByRole("checkbox", { name: "Unowned only" }).click();
    await page.waitForURL((u) => u.searchParams.get("unowned") === "true");
    expect(counts.counts.unowned).toBeGreaterThan(0);
    await expect.poll(() => pager.textContent()).toContain(total(counts.counts.unowned));
    expect(await page.locator('[data-testid="components-table"] tbody tr').count()).toBe(Math.min(50, counts.counts.unowned));
    await screenshot(page, "screens-components-unowned");
  });

  it("opens a component with its measures, needs, dependents and history", async () => {
    await page.goto(`${baseUrl()}/environments/production/components?q=session`);
    await expect.poll(() => page.locator('[data-testid="components-table"] tbody tr').count(), { timeout: 15_000 }).toBeGreaterThan(0);
    const link = page.locator('[data-testid="components-table"] tbody tr td:first-child a').first();
    const key = (await link.textContent()) ?? "";
    await link.click();
    await page.waitForURL((u) => u.pathname.endsWith(`/components/${key}`));
    await expect.poll(() => page.getByTestId("measures").textContent(), { timeout: 15_000 }).toMatch(/Rank #\d+/);
    const detail = (await page.evaluate(async (k) => (await fetch(`/api/v1/environments/production/components/${k}`)).json(), key)) as { needs: unknown[]; dependents: unknown[]; metrics: { blastRadius: { down: number } } };
    expect(await page.getByRole("heading", { name: `Needed by (${detail.dependents.length})` }).count()).toBe(1);
    expect(await page.getByRole("heading", { name: `Needs (${detail.needs.length})` }).count()).toBe(1);
    expect(await page.getByTestId("measures").textContent()).toContain(`${detail.metrics.blastRadius.down} component`);
    await expect.poll(() => page.getByTestId("component-history").locator("> li").count(), { timeout: 15_000 }).toBeGreaterThan(0);
    expect(await page.getByTestId("component-history").textContent()).toContain("added");
    await screenshot(page, "screens-component-page");
    await page.getByRole("link", { name: "Blast radius", exact: true }).click();
    await page.waitForURL((u) => u.pathname.endsWith("/drills") && u.searchParams.get("fail") === key);
  });

  it("says so when a component does not exist", async () => {
    await page.goto(`${baseUrl()}/environments/production/components/no-such-thing`);
    await expect.poll(() => page.getByText("No such component in the current inventory").count(), { timeout: 15_000 }).toBe(1);
  });
});
