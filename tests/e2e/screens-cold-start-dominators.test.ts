// The cold-start runbook, dominators and ties on screen, against the API's own answers.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, SCREENSHOT_DIR, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
let page: Page;
const ENV = () => `${baseUrl()}/environments/production`;
const api = <T>(p: Page, path: string) => p.evaluate(async (u) => (await fetch(u)).json(), path) as Promise<T>;

beforeAll(async () => {
  page = await signedInPage(browser(), "viewer", { width: 1366, height: 900 });
});

describe("cold start", () => {
  it("shows the stages, the cycle that blocks a clean start and the need to break, with its snapshot", async () => {
    await page.goto(`${ENV()}/boot-order`);
    const boot = await api<{ snapshot: { number: number }; stages: string[][]; cycles: Array<{ members: string[]; breaks: Array<{ from: string; to: string }> }> }>(
      page,
      "/api/v1/environments/production/boot-order",
    );
    await expect.poll(() => page.getByTestId("runbook-provenance").textContent(), { timeout: 15_000 }).toContain(`snapshot #${boot.snapshot.number}`);
    expect(await page.locator('[data-testid^="stage-"]').count()).toBe(boot.stages.length);
    // The demo's one cycle (DESIGN §8): both members named, one need to break first.
    expect(boot.cycles).toHaveLength(1);
    const cycles = (await page.getByTestId("boot-cycles").textContent()) ?? "";
    for (const k of boot.cycles[0]!.members) expect(cycles).toContain(k);
    const breaks = (await page.getByTestId("boot-breaks").textContent()) ?? "";
    expect(breaks).toContain(`${boot.cycles[0]!.breaks[0]!.from} needs ${boot.cycles[0]!.breaks[0]!.to}`);
    await screenshot(page, "screens-cold-start");
  });

  it("prints as a runbook: light paper, no navigation, snapshot on it", async () => {
    await page.emulateMedia({ media: "print" });
    expect(await page.locator("header nav[aria-label=Main]").isVisible()).toBe(false);
    const background = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    expect(background).toBe("rgb(255, 255, 255)");
    const pdf = await page.pdf({ path: `${SCREENSHOT_DIR}/cold-start-runbook.pdf`, format: "A4" });
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    await page.emulateMedia({ media: "screen" });
  });
});

describe("dominators on screen", () => {
  it("the component page says which entry points' every path passes through it", async () => {
    const detail = await api<{ metrics: { dominators: { fromEntries: Array<{ entry: string }> } } }>(page, "/api/v1/environments/production/components/session-service");
    const entry = detail.metrics.dominators.fromEntries[0]?.entry;
    expect(entry).toBeTruthy();
    await page.goto(`${ENV()}/components/session-service`);
    await expect.poll(() => page.getByTestId("dominated-from").textContent(), { timeout: 15_000 }).toContain(`every path from ${entry} passes through this`);
  });

  it("an entry point lists what every path from it passes through", async () => {
    await page.goto(`${ENV()}/components/web-frontend`);
    await expect.poll(() => page.getByTestId("passes-through").textContent(), { timeout: 15_000 }).toContain("every path from web-frontend");
    await screenshot(page, "screens-entry-point");
  });

  it("the pinch-point table has an entry-points column and marks shared ranks", async () => {
    await page.goto(`${ENV()}/pinch-points`);
    await expect.poll(() => page.getByRole("button", { name: /^Entry points/ }).count(), { timeout: 15_000 }).toBe(1);
    const ranks = await api<{ items: Array<{ position: { rank: number; tied: number } }> }>(page, "/api/v1/environments/production/rankings?limit=25");
    const tied = ranks.items.find((i) => i.position.tied > 1);
    if (tied) {
      await expect.poll(() => page.getByTestId("rank").allTextContents()).toContain(`=${tied.position.rank}`);
      expect(await page.getByTestId("ties-note").textContent()).toContain("1, 2, 2, 4");
    }
  });

  it("the map colours by entry points dominated", async () => {
    await page.goto(`${ENV()}/map?colour=entriesDominated&focus=session-service`);
    await expect.poll(() => page.getByLabel("Colour components by").inputValue(), { timeout: 20_000 }).toBe("entriesDominated");
  });
});
