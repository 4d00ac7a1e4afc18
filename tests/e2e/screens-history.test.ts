// History: the snapshot list, a diff between two picked snapshots, and the rank chart.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "architect", { width: 1366, height: 768 });
});

describe("history", () => {
  it("lists the snapshots and compares the two newest by default", async () => {
    await page.goto(`${baseUrl()}/environments/production/history`);
    const list = (await page.evaluate(async () => (await fetch("/api/v1/environments/production/snapshots?limit=100")).json())) as { total: number; items: Array<{ number: number }> };
    expect(list.total).toBeGreaterThan(2);
    await expect.poll(() => page.locator('[data-testid="snapshots-table"] tbody tr').count(), { timeout: 15_000 }).toBe(list.total);
    const newest = list.items[0]!.number;
    await expect.poll(() => page.getByRole("heading", { name: `From #${newest - 1} to #${newest}` }).count()).toBe(1);
    await expect.poll(() => page.getByTestId("diff-summary").count(), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => page.locator('[data-testid="rank-chart"] .recharts-line').count(), { timeout: 15_000 }).toBe(8);
    await screenshot(page, "screens-history");
  });

  it("compares snapshot #1 with the newest when #1 is picked as From", async () => {
    const list = (await page.evaluate(async () => (await fetch("/api/v1/environments/production/snapshots?limit=1")).json())) as { items: Array<{ number: number }> };
    const newest = list.items[0]!.number;
    await page.getByRole("radio", { name: "Compare from snapshot #1", exact: true }).click();
    await page.waitForURL((u) => u.searchParams.get("from") === "1" && u.searchParams.get("to") === String(newest));
    const diff = (await page.evaluate(async (n) => (await fetch(`/api/v1/environments/production/snapshots/1/diff/${n}`)).json(), newest)) as { componentsAdded: unknown[]; dependenciesAdded: unknown[] };
    await expect.poll(() => page.getByTestId("diff-summary").textContent(), { timeout: 15_000 }).toContain(`${diff.componentsAdded.length} added`);
    expect(diff.componentsAdded.length).toBeGreaterThan(0);
    expect(await page.getByRole("heading", { name: `Components added (${diff.componentsAdded.length})` }).count()).toBe(1);
    await screenshot(page, "screens-history-diff");
  });
});
