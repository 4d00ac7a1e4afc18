// The map at 2,000 components, measured in headless Chromium (timings printed, never asserted):
// it opens on a view it can lay out quickly (the teams, or the top pinch points when even that is too tangled), and focus mode lays out a neighbourhood.
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
  // Wait for the worker to analyse it.
  const deadline = Date.now() + 60_000;
  while ((await page.request.get(`${baseUrl()}/api/v1/environments/${ENV}/rankings?limit=1`)).status() !== 200) {
    if (Date.now() > deadline) throw new Error("the 2,000-component snapshot was not analysed within 60 s");
    await new Promise((r) => setTimeout(r, 500));
  }
});

describe("map at 2,000 components", () => {
  it("opens on a readable view instead of laying out everything, and focuses a component", async () => {
    let t0 = Date.now();
    await page.goto(`${baseUrl()}/environments/${ENV}/map`);
    await page.getByText(/laid out in/).waitFor({ timeout: 60_000 });
    const opening = Date.now() - t0;
    // The generator's teams all need each other, so the team view is too tangled: the map opens on
    // the 150 components with the highest betweenness and says so.
    await expect.poll(() => page.getByText(/too tangled to/).isVisible()).toBe(true);
    expect(Number(await page.getByTestId("map-count").getAttribute("data-count"))).toBe(150);
    await screenshot(page, "map-2000-opening");

    t0 = Date.now();
    await page.goto(`${baseUrl()}/environments/${ENV}/map?focus=svc-1000`);
    await page.getByText(/laid out in/).waitFor({ timeout: 60_000 });
    const focus = Date.now() - t0;
    await screenshot(page, "map-2000-focus");
    console.log(`[e2e] map 2,000 components: opening view drawn in ${opening} ms; focus on svc-1000 (2 hops) drawn in ${focus} ms`);
  });
});
