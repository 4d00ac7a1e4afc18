// The map: opens on the demo, lays out in the browser (ELK in a web worker), node count equals the
// filtered component count, focus mode from the URL, the inspector with measures.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "lead", { width: 1366, height: 900 });
});

async function countFromApi(): Promise<number> {
  return page.evaluate(async () => {
    const res = await fetch("/api/v1/environments/production/graph");
    const body = (await res.json()) as { nodes: unknown[] };
    return body.nodes.length;
  });
}

describe("map", () => {
  it("lays out the whole demo and shows every component", async () => {
    const started = Date.now();
    await page.goto(`${baseUrl()}/environments/production/map`);
    const count = page.getByTestId("map-count");
    await count.waitFor({ timeout: 60_000 });
    await page.locator(".react-flow__node").first().waitFor({ timeout: 60_000 });
    const expected = await countFromApi();
    await expect.poll(async () => Number(await count.getAttribute("data-count")), { timeout: 60_000 }).toBe(expected);
    await expect.poll(() => page.locator(".react-flow__node").count(), { timeout: 60_000 }).toBeGreaterThan(100);
    console.log(`[e2e] map of ${expected} components laid out and drawn in ${Date.now() - started} ms`);
    await screenshot(page, "map-production");
  });

  it("opens focused on a component from the URL and inspects it", async () => {
    await page.goto(`${baseUrl()}/environments/production/map?focus=session-service`);
    await page.locator(".react-flow__node").first().waitFor({ timeout: 60_000 });
    const all = await countFromApi();
    await expect.poll(async () => Number(await page.getByTestId("map-count").getAttribute("data-count")), { timeout: 30_000 }).toBeLessThan(all);
    await page.getByText(/laid out in/).waitFor({ timeout: 60_000 });
    await screenshot(page, "map-focus-session-service");
    await page.locator('.react-flow__node[data-id="session-service"]').click();
    await screenshot(page, "map-focus-inspector");
    await expect.poll(() => page.getByRole("complementary", { name: /^Inspector:/ }).getByText("Takes down", { exact: true }).isVisible(), { timeout: 10_000 }).toBe(true);
  });
});
