// Drills: pick a component with the keyboard, see what goes down and who to page, copy the summary.
import type { BrowserContext, Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { SignInPage } from "./pages/signin";

const browser = browserForFile();

let context: BrowserContext;
let page: Page;
const downCount = async (p: Page) => Number((await p.getByTestId("down-count").textContent()) ?? 0);

beforeAll(async () => {
  context = await browser().newContext({ viewport: { width: 1366, height: 768 } });
  await context.grantPermissions(["clipboard-read", "clipboard-write"], { origin: baseUrl() });
  page = await context.newPage();
  const signin = new SignInPage(page);
  await signin.open();
  await signin.signIn("engineer@harbor-pantry.example");
  await page.waitForURL((u) => u.pathname === "/");
});

describe("drills", () => {
  it("starts empty and says what to do", async () => {
    await page.goto(`${baseUrl()}/environments/production/drills`);
    await expect.poll(() => page.getByText("Nothing failed yet").count()).toBe(1);
  });

  it("fails dns-resolver picked from the searchable list; more than 100 components go down", async () => {
    const box = page.getByRole("combobox", { name: "Components to fail" });
    await box.fill("dns-res");
    await expect.poll(() => page.getByRole("listbox", { name: "Components to fail: matches" }).getByRole("option").first().textContent()).toContain("dns-resolver");
    await box.press("Enter");
    await page.waitForURL((u) => u.searchParams.get("fail") === "dns-resolver");
    await expect.poll(() => downCount(page), { timeout: 15_000 }).toBeGreaterThan(100);
    const expected = (await page.evaluate(async () => {
      const res = await fetch("/api/v1/environments/production/drills", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ fail: { components: ["dns-resolver"] } }) });
      return res.json();
    })) as { down: string[]; teams: Array<{ team: string | null; contact: { email: string | null } | null }> };
    expect(await downCount(page)).toBe(expected.down.length);
    // Who to page: one card per team, the owners of what failed first, then biggest first, unowned last.
    await expect.poll(() => page.getByTestId("drill-team").count()).toBe(expected.teams.length);
    expect(await page.getByTestId("drill-team").first().textContent()).toContain("owns what failed");
    if (expected.teams.some((t) => !t.team)) expect(await page.getByTestId("drill-team").last().textContent()).toContain("Unowned — nobody is paged");
    expect(await page.getByRole("link", { name: /@harbor-pantry\.example$/ }).count()).toBeGreaterThan(5);
    await expect.poll(() => page.getByTestId("drill-minimap").count(), { timeout: 15_000 }).toBe(1);
    // Snapshot age and undeclared share beside the result, and the caution that a drill is no guarantee.
    await expect.poll(() => page.getByTestId("snapshot-meta").textContent()).toMatch(/Snapshot #\d+, pushed (just now|\d+ min ago).*undeclared: \d+\.\d%/);
    expect(await page.getByTestId("caution").textContent()).toContain("not a guarantee");
    await screenshot(page, "screens-drills-dns-resolver");
  });

  it("copies a plain-text incident summary with counts, teams and the caution", async () => {
    await page.getByRole("button", { name: "Copy incident summary" }).click();
    await expect.poll(() => page.getByText("Copied to the clipboard.").count()).toBe(1);
    const text = await page.evaluate(() => navigator.clipboard.readText());
    expect(text).toContain("if component dns-resolver fails");
    expect(text).toMatch(/Down \(incl\. what failed\): \d{3,} \(tier 1: \d+/);
    expect(text).toContain("not a guarantee");
    expect(text).toMatch(/From snapshot #\d+, pushed \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC; \d+\.\d% of its \d+ components are undeclared/);
    expect(text).toContain("/drills?fail=dns-resolver");
  });

  it("adds a zone; the URL holds both and a fresh load repeats the drill", async () => {
    const before = await downCount(page);
    // click, not check(): the box follows the URL, which updates a moment after the click.
    await page.getByRole("checkbox", { name: "harbor-east" }).click();
    await page.waitForURL((u) => u.searchParams.get("zones") === "harbor-east" && u.searchParams.get("fail") === "dns-resolver");
    await expect.poll(() => downCount(page), { timeout: 15_000 }).toBeGreaterThanOrEqual(before);
    const shared = page.url();
    const other = await context.newPage();
    await other.goto(shared);
    // Both pages settle on the same drill: the first page's own answer to the zone may still be on its way.
    await expect.poll(async () => (await downCount(other)) === (await downCount(page)) && (await downCount(page)) >= before, { timeout: 15_000 }).toBe(true);
    await screenshot(other, "screens-drills-zone");
    await other.close();
  });
});
