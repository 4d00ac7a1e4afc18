// The map of the demo (163 components): it opens on the team-to-team view with readable labels,
// a team expands in place and collapses, a hub's marker opens the list of what needs it, the export
// carries its title block, and ?chain=a,b highlights why a needs b. Timings printed, never asserted.
import { readFileSync } from "node:fs";
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

/** A label is readable when it is drawn at least 9 px high on screen (common practice for small labels). */
async function readableLabels(selector: string): Promise<number> {
  return page.locator(selector).evaluateAll((els) => els.filter((e) => e.getBoundingClientRect().height >= 9 && (e.textContent ?? "").trim().length > 0).length);
}

async function setTheme(theme: "dark" | "light"): Promise<void> {
  await page.evaluate((t) => (document.documentElement.dataset.theme = t), theme);
}

describe("map", () => {
  it("opens the demo on the team view with readable labels; a team expands in place and collapses", async () => {
    const started = Date.now();
    await page.goto(`${baseUrl()}/environments/production/map`);
    await page.getByTestId("team-box").first().waitFor({ timeout: 60_000 });
    const firstView = Date.now() - started;
    const expected = await countFromApi();
    expect(Number(await page.getByTestId("map-count").getAttribute("data-count"))).toBe(expected);
    const teams = await page.getByTestId("team-box").count();
    expect(teams).toBeGreaterThan(5);
    expect(await readableLabels(".pp-team-name")).toBe(teams);
    console.log(`[e2e] map of ${expected} components: team view of ${teams} teams drawn in ${firstView} ms`);
    await screenshot(page, "map-163-first-view-dark");
    await setTheme("light");
    await screenshot(page, "map-163-first-view-light");
    await setTheme("dark");

    const team = await page.getByTestId("team-box").first().getAttribute("data-team");
    await page.getByTestId("team-box").first().click();
    await page.locator(`[data-testid="team-group"][data-team="${team}"]`).waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("team-box").count()).toBe(teams - 1);
    expect(await readableLabels(".pp-node-name")).toBeGreaterThan(0);
    await screenshot(page, "map-163-team-expanded");
    await page.getByRole("button", { name: /^Collapse team / }).first().click();
    await expect.poll(() => page.getByTestId("team-box").count(), { timeout: 30_000 }).toBe(teams);
  });

  it("bundles a hub's dependents into a marker that opens their list", async () => {
    await page.goto(`${baseUrl()}/environments/production/map`);
    await page.getByTestId("team-box").first().waitFor({ timeout: 60_000 });
    await page.getByRole("button", { name: "Expand all teams", exact: true }).click();
    await page.getByTestId("hub-marker").first().waitFor({ timeout: 60_000 });
    // The whole expanded demo is wider than the screen at a readable zoom: go to the hub first.
    const hubKey = await page.getByTestId("hub-marker").first().evaluate((el) => el.closest(".react-flow__node")?.getAttribute("data-id") ?? "");
    await page.getByLabel(/^Find a component by key or name/).fill(hubKey);
    await page.getByRole("button", { name: "Go to component" }).click();
    const marker = page.locator(`.react-flow__node[data-id="${hubKey}"] [data-testid="hub-marker"]`);
    await expect.poll(() => marker.evaluate((el) => { const r = el.getBoundingClientRect(); return r.top > 0 && r.bottom < window.innerHeight && r.left > 0 && r.right < window.innerWidth; }), { timeout: 10_000 }).toBe(true);
    await marker.click();
    const list = page.getByTestId("hub-list");
    await list.waitFor({ timeout: 10_000 });
    expect(await list.locator("li").count()).toBeGreaterThanOrEqual(12);
    await screenshot(page, "map-163-hub-list");
  });

  it("exports the view with a title block naming environment, snapshot, time and legend", async () => {
    await page.goto(`${baseUrl()}/environments/production/map`);
    await page.getByTestId("team-box").first().waitFor({ timeout: 60_000 });
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Export the current view as SVG" }).click()]);
    const svg = readFileSync(await download.path(), "utf8");
    expect(svg).toContain('class="pp-title-block"');
    expect(svg).toContain("Pinchpoint map: production");
    expect(svg).toMatch(/Environment production · snapshot #\d+, pushed \d{4}-\d{2}-\d{2}/);
    expect(svg).toMatch(/Exported \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC/);
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

  it("highlights why one component needs another from ?chain=a,b", async () => {
    const chain = await page.evaluate(async () => {
      const graph = (await (await fetch("/api/v1/environments/production/graph")).json()) as { edges: { from: string; to: string; strength: string }[] };
      // A two-hop chain of runtime needs: a → b → c.
      const runtime = graph.edges.filter((e) => e.strength !== "startup");
      for (const e of runtime) {
        const next = runtime.find((f) => f.from === e.to && f.to !== e.from);
        if (next) return { from: e.from, to: next.to };
      }
      return null;
    });
    expect(chain).not.toBeNull();
    await page.goto(`${baseUrl()}/environments/production/map?chain=${chain!.from},${chain!.to}`);
    const banner = page.getByTestId("chain-banner");
    await banner.waitFor({ timeout: 60_000 });
    await expect.poll(() => banner.textContent(), { timeout: 10_000 }).toContain(`Why ${chain!.from} needs ${chain!.to}`);
    // A straight vertical path has a zero-width box, which Playwright calls hidden: wait for it to exist.
    await page.locator(".react-flow__edges .pp-edge-chain").first().waitFor({ state: "attached", timeout: 60_000 });
    expect(await page.locator(".pp-node[data-chain]").count()).toBeGreaterThanOrEqual(2);
    await screenshot(page, "map-163-chain");
  });
});
