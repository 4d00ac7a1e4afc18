// The map at 2,000 components in headless Chromium (timings printed, never asserted; npm run bench
// measures the worker's layouts): it opens on the team-to-team view from positions the worker stored,
// a team expands in place and collapses, a hub's marker opens its list, and focus lays out a neighbourhood.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { generateGraph } from "../../scripts/bench/generate";
import { inventoryYaml } from "../../scripts/bench/push";
import { baseUrl, browserForFile, ownOrigin, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const ENV = "e2e-large";
let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "admin", { width: 1366, height: 900 });
  // A seeded 2,000-component estate (the benchmark's generator), pushed as the admin creating the environment.
  const body = inventoryYaml(generateGraph({ n: 2000, seed: 7 }), "e2e-large-repo", ENV);
  const res = await page.request.post(`${baseUrl()}/api/v1/environments/${ENV}/inventory`, { data: body, headers: { "content-type": "application/yaml", ...ownOrigin() } });
  expect(res.status()).toBe(200);
  // Wait for the worker to analyse it and lay it out.
  const deadline = Date.now() + 120_000;
  for (;;) {
    const layouts = await page.request.get(`${baseUrl()}/api/v1/environments/${ENV}/map/layouts`);
    if (layouts.status() === 200 && Object.keys(((await layouts.json()) as { views: object }).views).length > 0) break;
    if (Date.now() > deadline) throw new Error("the 2,000-component snapshot was not analysed and laid out within 120 s");
    await new Promise((r) => setTimeout(r, 500));
  }
});

async function setTheme(theme: "dark" | "light"): Promise<void> {
  await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
}

describe("map at 2,000 components", () => {
  it("opens on the team view from stored positions; a team expands in place and collapses; a hub lists its dependents", async () => {
    let t0 = Date.now();
    await page.goto(`${baseUrl()}/environments/${ENV}/map`);
    await page.getByTestId("team-box").first().waitFor({ timeout: 60_000 });
    const opening = Date.now() - t0;
    expect(await page.getByTestId("layout-source").isVisible()).toBe(true);
    expect(Number(await page.getByTestId("map-count").getAttribute("data-count"))).toBe(2000);
    const teams = await page.getByTestId("team-box").count();
    const readable = await page.locator(".pp-team-name").evaluateAll((els) => els.filter((e) => e.getBoundingClientRect().height >= 9).length);
    expect(readable).toBe(teams);
    await screenshot(page, "map-2000-first-view-dark");
    await setTheme("light");
    await screenshot(page, "map-2000-first-view-light");
    await setTheme("dark");

    t0 = Date.now();
    const box = page.getByTestId("team-box").first();
    await box.click();
    await page.getByTestId("team-group").first().waitFor({ timeout: 30_000 });
    const expand = Date.now() - t0;
    await screenshot(page, "map-2000-team-expanded");
    expect(await page.getByTestId("team-box").count()).toBe(teams - 1);
    await page.getByRole("button", { name: /^Collapse team / }).first().click();
    await expect.poll(() => page.getByTestId("team-box").count(), { timeout: 30_000 }).toBe(teams);

    await page.getByTestId("hub-marker").first().click();
    await page.getByTestId("hub-list").waitFor({ timeout: 10_000 });

    t0 = Date.now();
    await page.getByRole("button", { name: "Expand all teams", exact: true }).click();
    await expect.poll(() => page.getByTestId("team-box").count(), { timeout: 60_000 }).toBe(0);
    await page.locator(".react-flow__node").first().waitFor({ timeout: 60_000 });
    const all = Date.now() - t0;
    await screenshot(page, "map-2000-expanded");

    t0 = Date.now();
    await page.goto(`${baseUrl()}/environments/${ENV}/map?focus=svc-1000`);
    await page.getByText(/laid out in/).waitFor({ timeout: 60_000 });
    const focus = Date.now() - t0;
    await screenshot(page, "map-2000-focus");

    // Moving the focus on an open map (the graph already loaded): select a neighbour, focus on it.
    const neighbour = page.locator(".react-flow__node:has(.pp-node:not([data-focus]))").first();
    const key = ((await neighbour.locator(".pp-node").getAttribute("title")) ?? "").split(":")[0]!;
    await neighbour.click();
    t0 = Date.now();
    await page.getByRole("button", { name: "Focus on the selected component's neighbourhood" }).click();
    await page.locator(`.pp-node[data-focus][title^="${key}:"]`).waitFor({ timeout: 30_000 });
    const refocus = Date.now() - t0;
    console.log(`[e2e] map 2,000 components: team view drawn in ${opening} ms; one team expanded in ${expand} ms; every team expanded in ${all} ms; focus on svc-1000 (2 hops) opened in ${focus} ms (page load); focus moved to ${key} on the open map in ${refocus} ms`);
  });
});
