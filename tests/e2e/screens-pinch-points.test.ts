// The pinch-point table: sign in, open, sort by a header, filter, export; values match the API.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;
const ENV_URL = () => `${baseUrl()}/environments/production`;

interface Ranking {
  total: number;
  items: Array<{ key: string; team: string | null }>;
}
const api = (p: Page, path: string) => p.evaluate(async (u) => (await fetch(u)).json(), path) as Promise<Ranking>;
const firstKey = (p: Page) => p.locator('[data-testid="rankings-table"] tbody tr').first().locator("td").nth(1).locator("a.font-mono").textContent();

beforeAll(async () => {
  page = await signedInPage(browser(), "viewer", { width: 1366, height: 768 });
});

describe("pinch points", () => {
  it("opens on the pinch-score ranking, first row equal to the API's first item", async () => {
    await page.goto(`${ENV_URL()}/pinch-points`);
    const expected = await api(page, "/api/v1/environments/production/rankings?sort=pinchScore&order=desc&limit=1");
    await expect.poll(() => firstKey(page), { timeout: 15_000 }).toBe(expected.items[0]?.key);
    await expect.poll(() => page.locator('[data-testid="rankings-table"] tbody tr').count()).toBe(25);
    await expect.poll(() => page.getByTestId("snapshot-meta").textContent()).toMatch(/Snapshot #\d+, pushed .*undeclared: \d+\.\d%/);
    expect(await page.getByTestId("caution").textContent()).toContain("only as good as the inventory");
    await expect.poll(() => page.getByRole("img", { name: /^Rank over \d+ snapshots/ }).count(), { timeout: 15_000 }).toBeGreaterThan(0);
    // Other e2e files may push to production meanwhile: the demo's 163, or more, never fewer.
    const range = (await page.getByText(/\d+–\d+ of \d+/).first().textContent()) ?? "";
    expect(Number(/of (\d+)/.exec(range)?.[1])).toBeGreaterThanOrEqual(163);
    await screenshot(page, "screens-pinch-points");
  });

  it("sorts by a header click and keeps the sort in the URL", async () => {
    // PageRank is one of the raw measures shown on request.
    await page.getByLabel(/^All measures/).click();
    await page.getByRole("button", { name: /^PageRank/ }).click();
    await page.waitForURL((u) => u.searchParams.get("sort") === "pagerank" && u.searchParams.get("order") === "desc");
    const expected = await api(page, "/api/v1/environments/production/rankings?sort=pagerank&order=desc&limit=1");
    await expect.poll(() => firstKey(page)).toBe(expected.items[0]?.key);
    expect(await page.locator('th[aria-sort="descending"]').textContent()).toContain("PageRank");
    await page.getByRole("button", { name: /^PageRank/ }).click();
    await page.waitForURL((u) => u.searchParams.get("order") === "asc");
    const asc = await api(page, "/api/v1/environments/production/rankings?sort=pagerank&order=asc&limit=1");
    await expect.poll(() => firstKey(page)).toBe(asc.items[0]?.key);
    // The URL alone reproduces the view: open it fresh.
    await page.goto(page.url());
    await expect.poll(() => firstKey(page), { timeout: 15_000 }).toBe(asc.items[0]?.key);
  });

  it("filters by team in the URL and exports exactly the filtered rows as CSV", async () => {
    await page.goto(`${ENV_URL()}/pinch-points`);
    await page.getByLabel("Team").selectOption("platform-infra");
    await page.waitForURL((u) => u.searchParams.get("team") === "platform-infra");
    const expected = await api(page, "/api/v1/environments/production/rankings?team=platform-infra&sort=pinchScore&order=desc&limit=1000");
    await expect.poll(() => page.getByTestId("csv-export").textContent()).toBe(`Export CSV (${expected.total} rows)`);
    const teams = await page.locator('[data-testid="rankings-table"] tbody tr td:nth-child(3)').allTextContents();
    expect(new Set(teams)).toEqual(new Set(["platform-infra"]));
    const href = await page.getByTestId("csv-export").getAttribute("href");
    const csv = await page.evaluate(async (u) => (await fetch(u!)).text(), href);
    const lines = csv.trimEnd().split("\r\n");
    expect(lines).toHaveLength(expected.total + 1);
    expect(lines.slice(1).map((l) => l.split(",")[1])).toEqual(expected.items.map((i) => i.key));
    await screenshot(page, "screens-pinch-points-filtered");
  });

  it("reads in the light theme too", async () => {
    await page.goto(`${ENV_URL()}/pinch-points`);
    await page.getByRole("button", { name: "Switch to light theme" }).click();
    await expect.poll(() => page.locator('[data-testid="rankings-table"] tbody tr').count(), { timeout: 15_000 }).toBe(25);
    await screenshot(page, "screens-pinch-points-light");
    await page.getByRole("button", { name: "Switch to dark theme" }).click();
  });

  it("takes one click from a row to its blast radius", async () => {
    const link = page.getByRole("link", { name: /^Blast radius of / }).first();
    const label = (await link.getAttribute("aria-label")) ?? "";
    await link.click();
    await page.waitForURL((u) => u.pathname.endsWith("/drills") && u.searchParams.get("fail") === label.replace("Blast radius of ", ""));
  });
});
