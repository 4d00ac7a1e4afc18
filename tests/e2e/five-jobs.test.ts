// The five jobs, each followed as a person would from the overview, asserting what that person needs
// to see at the end; each prints how long it took in the headless browser. Each job's key screen is
// photographed at 1280×720 and 1440×900 in both themes (test-results/screenshots/jobs-*).
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile, ownOrigin, screenshot } from "./browser";
import { SignInPage } from "./pages/signin";

const browser = browserForFile();
const contexts: BrowserContext[] = [];
afterAll(async () => {
  for (const c of contexts) await c.close();
});

async function signedIn(who: string, options: { colorScheme?: "light" | "dark"; clipboard?: boolean } = {}): Promise<Page> {
  const context = await browser().newContext({ viewport: { width: 1280, height: 720 }, colorScheme: options.colorScheme ?? "dark" });
  contexts.push(context);
  if (options.clipboard) await context.grantPermissions(["clipboard-read", "clipboard-write"], { origin: baseUrl() });
  const page = await context.newPage();
  const signin = new SignInPage(page);
  await signin.open();
  await signin.signIn(`${who}@harbor-pantry.example`);
  await page.waitForURL((u) => u.pathname === "/");
  return page;
}

/** The key screen of a job in both sizes and both themes. */
async function shoot(page: Page, name: string): Promise<void> {
  const theme = await page.evaluate(() => document.documentElement.dataset.theme);
  // From the top: a sticky header photographs mid-page in a full-page shot of a scrolled page.
  await page.evaluate(() => window.scrollTo(0, 0));
  for (const size of [{ width: 1280, height: 720 }, { width: 1440, height: 900 }]) {
    await page.setViewportSize(size);
    for (const t of ["dark", "light"]) {
      await page.evaluate((x) => (document.documentElement.dataset.theme = x), t);
      await screenshot(page, `jobs-${name}-${size.width}x${size.height}-${t}`);
    }
  }
  await page.evaluate((x) => (document.documentElement.dataset.theme = x ?? "dark"), theme);
  await page.setViewportSize({ width: 1280, height: 720 });
}

function timed(job: string) {
  const started = performance.now();
  return () => console.log(`[five jobs] ${job}: ${((performance.now() - started) / 1000).toFixed(1)} s in the headless browser`);
}

describe("the five jobs, from the overview", () => {
  it("on-call: payments-db is down — what else, whom to page first, why payment-orchestrator is down, a summary to paste", async () => {
    const page = await signedIn("engineer", { clipboard: true });
    const done = timed("on-call");
    await page.getByRole("combobox", { name: /What is down/ }).fill("payments-db");
    await page.getByRole("combobox", { name: /What is down/ }).press("Enter");
    await page.waitForURL((u) => u.pathname.endsWith("/drills") && u.searchParams.get("fail") === "payments-db" && u.searchParams.get("down") === "1");
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("payments-db is down");
    await page.getByTestId("drill-team").first().waitFor({ timeout: 15_000 });
    // The owners of what failed are paged first.
    const first = (await page.getByTestId("drill-team").first().textContent()) ?? "";
    expect(first).toContain("owns what failed");
    expect(first).toContain("payments-db");
    // Why is payment-orchestrator down? The chain of needs to payments-db.
    await page.getByRole("button", { name: "Why is payment-orchestrator down?" }).first().click();
    const chain = page.getByTestId("dependency-chain").first();
    await expect.poll(() => chain.textContent(), { timeout: 15_000 }).toContain("when payments-db fails, payment-orchestrator goes down");
    await page.getByRole("button", { name: "Copy incident summary" }).click();
    await expect.poll(() => page.getByText("Copied to the clipboard.").count()).toBe(1);
    const text = await page.evaluate(() => navigator.clipboard.readText());
    expect(text).toMatch(/^Pinchpoint outage view, production, \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC: component payments-db is down/);
    expect(text).toMatch(/Tier 1 down with it: .*payment-orchestrator/);
    expect(text).toMatch(/From snapshot #\d+, pushed \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC/);
    expect(text.trimEnd().split("\n").at(-1)).toContain("/environments/production/drills?fail=payments-db&down=1");
    done();
    await shoot(page, "oncall-outage");
  });

  it("architect: the worst failure points by one ranking, all measures on request, a decision started from the row", async () => {
    const page = await signedIn("architect");
    const done = timed("architect");
    await page.getByRole("link", { name: "All pinch points" }).first().click();
    await page.waitForURL((u) => u.pathname.endsWith("/pinch-points"));
    const rows = page.locator('[data-testid="rankings-table"] tbody tr');
    await expect.poll(() => rows.count(), { timeout: 15_000 }).toBe(25);
    const expected = (await (await page.request.get(`${baseUrl()}/api/v1/environments/production/rankings?sort=pinchScore&order=desc&limit=1`)).json()) as { items: Array<{ key: string }> };
    // The same ranking as the overview's first list: pinch score, # is the position.
    expect(await rows.first().locator("td").nth(1).textContent()).toContain(expected.items[0]!.key);
    expect(await rows.first().getByTestId("rank").textContent()).toBe("1");
    expect(await page.locator('th[aria-sort="descending"]').textContent()).toContain("Pinch score");
    expect(await page.getByRole("button", { name: /^PageRank/ }).count()).toBe(0);
    await shoot(page, "architect-pinch-points");
    // The box follows the URL, which updates a moment after the click.
    await page.getByLabel(/All measures/).click();
    await expect.poll(() => page.getByRole("button", { name: /^PageRank/ }).count()).toBe(1);
    expect(await page.getByRole("link", { name: "Pinch-score weights" }).getAttribute("href")).toBe("/environments/production/reviews#weights");
    const key = expected.items[0]!.key;
    await page.getByRole("link", { name: `decide on ${key}` }).click();
    await page.waitForURL((u) => u.pathname.endsWith("/reviews") && u.searchParams.get("decide") === key);
    const form = page.getByRole("form", { name: "Review a pinch point" });
    const field = form.getByLabel(/^Component/);
    expect(await field.inputValue()).toBe(key);
    await form.getByLabel(/Rationale/).fill("Accepted for this quarter: a second region is planned; the runbook covers a manual failover.");
    await page.getByRole("button", { name: "Save review" }).click();
    await expect.poll(() => page.getByText(`Saved the review of ${key}`).count(), { timeout: 15_000 }).toBe(1);
    // The form starts empty for the next decision.
    expect(await page.getByRole("form", { name: "Review a pinch point" }).getByLabel(/^Component/).inputValue()).toBe("");
    await page.getByTestId(`review-${key}`).waitFor();
    done();
    await page.request.delete(`${baseUrl()}/api/v1/environments/production/reviews/${key}`, { headers: ownOrigin() });
  });

  it("lead: what nobody owns in production, claimed for my team, with an undo", async () => {
    const page = await signedIn("lead");
    const done = timed("lead");
    await page.getByTestId("unowned-tile").click();
    await page.waitForURL((u) => u.pathname === "/teams");
    const count = page.getByTestId("unowned-count");
    await count.waitFor({ timeout: 15_000 });
    const before = Number(((await count.textContent()) ?? "").match(/\d+/)?.[0]);
    expect(await page.getByText("Unowned · production").count()).toBe(1);
    // A lead of checkout is offered only checkout: no choice of team, a Claim button per row named for it.
    const claim = page.getByRole("button", { name: /^Claim / }).first();
    const name = ((await claim.getAttribute("aria-label")) ?? "").replace(/^Claim /, "");
    expect(await page.getByText("for Checkout").count()).toBeGreaterThan(0);
    await claim.click();
    await expect.poll(() => page.getByTestId("claim-done").textContent(), { timeout: 15_000 }).toContain(`${name} now belongs to Checkout`);
    await expect.poll(async () => Number(((await count.textContent()) ?? "").match(/\d+/)?.[0])).toBe(before - 1);
    await shoot(page, "lead-claimed");
    await page.getByRole("button", { name: `Undo: make ${name} unowned again` }).click();
    await expect.poll(async () => Number(((await count.textContent()) ?? "").match(/\d+/)?.[0]), { timeout: 15_000 }).toBe(before);
    done();
  });

  it("engineer: a file with a typo, fixed and checked again, pushed after a confirmation with what it changes", async () => {
    const typo = `pinchpoint: 1
source: e2e-five-jobs-repo
defaults:
  team: checkout
components:
  - key: five-jobs-web
    kind: service
    tier: 2
    needs: [five-jobs-apl]
  - key: five-jobs-api
    kind: service
    tier: 2
`;
    const fixed = typo.replace("five-jobs-apl", "five-jobs-api");
    const context = await browser().newContext({ viewport: { width: 1280, height: 720 }, colorScheme: "dark" });
    contexts.push(context);
    // Chromium's file picker cannot be driven headless: this stands in for it, handing out a handle
    // whose file the test changes on "disk" (window.__fileText), as an editor would.
    await context.addInitScript(() => {
      const w = window as unknown as { __fileText: string; showOpenFilePicker: () => Promise<Array<{ getFile(): Promise<File> }>> };
      w.showOpenFilePicker = async () => [{ getFile: async () => new File([w.__fileText], "checkout-inventory.yaml", { type: "application/yaml" }) }];
    });
    const page = await context.newPage();
    const signin = new SignInPage(page);
    await signin.open();
    await signin.signIn("engineer@harbor-pantry.example");
    await page.waitForURL((u) => u.pathname === "/");
    const done = timed("engineer");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Imports" }).click();
    await page.waitForURL((u) => u.pathname.endsWith("/imports"));
    expect(await page.getByRole("link", { name: "Read the file format reference" }).getAttribute("href")).toBe("/format");
    expect(await page.getByRole("link", { name: "download a sample file" }).getAttribute("href")).toBe("/samples/pinchpoint-sample.yaml");
    await page.evaluate((t) => ((window as unknown as { __fileText: string }).__fileText = t), typo);
    await page.getByRole("button", { name: "choose one" }).click();
    await page.getByTestId("preview-title").waitFor({ timeout: 15_000 });
    await expect.poll(() => page.getByText('did you mean "five-jobs-api"?', { exact: false }).count()).toBeGreaterThan(0);
    // Fixed in the editor; Check again reads the file again.
    await page.evaluate((t) => ((window as unknown as { __fileText: string }).__fileText = t), fixed);
    await page.getByRole("button", { name: "Check again" }).click();
    await expect.poll(() => page.getByText("did you mean", { exact: false }).count(), { timeout: 15_000 }).toBe(0);
    await page.getByTestId("push-button").click();
    const confirmation = page.getByTestId("push-confirmation");
    expect(await confirmation.textContent()).toMatch(/Changes: \+2 \/ −0 \/ ~0 components; \+1 \/ −0 needs/);
    await shoot(page, "engineer-confirm");
    await page.getByTestId("push-confirm").click();
    await expect.poll(() => page.getByTestId("push-result").textContent(), { timeout: 15_000 }).toMatch(/Pushed\. production is now at snapshot #\d+/);
    done();
    // Leave production as it was: the same source with nothing in it.
    const res = await page.request.post(`${baseUrl()}/api/v1/environments/production/inventory`, { headers: { ...ownOrigin(), "content-type": "application/yaml" }, data: "pinchpoint: 1\nsource: e2e-five-jobs-repo\ncomponents: []\n" });
    expect(res.status()).toBe(200);
  });

  it("viewer: the environment switcher, a header that fits at 1280 px, the OS theme, a skip link, an export", async () => {
    const page = await signedIn("viewer", { colorScheme: "light" });
    const done = timed("viewer");
    // The theme follows the operating system until chosen.
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe("light");
    await page.keyboard.press("Tab");
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe("Skip to content");
    const switcher = page.getByTestId("environment-switcher");
    await expect.poll(() => switcher.locator("option").allTextContents()).toContain("production");
    // Nothing in the header is cut off or scrolls at 1280 px, nor at 1024 px.
    for (const width of [1280, 1024]) {
      await page.setViewportSize({ width, height: 720 });
      const overflow = await page.evaluate(() => [...document.querySelectorAll("header, header nav, header > div")].some((e) => e.scrollWidth > e.clientWidth + 1));
      expect(overflow, `header overflows at ${width} px`).toBe(false);
    }
    await page.setViewportSize({ width: 1280, height: 720 });
    await page.getByRole("navigation", { name: "Main" }).getByText("More").click();
    await page.getByRole("link", { name: "History" }).click();
    await page.waitForURL((u) => u.pathname.endsWith("/history"));
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Pinch points" }).click();
    const exportLink = page.getByTestId("csv-export");
    await expect.poll(() => exportLink.textContent(), { timeout: 15_000 }).toMatch(/Export CSV \(\d+ rows\)/);
    const csv = await page.evaluate(async (u) => (await fetch(u!)).text(), await exportLink.getAttribute("href"));
    expect(csv.split("\r\n")[0]).toMatch(/^rank,key/);
    await page.getByRole("button", { name: "Switch to dark theme" }).click();
    expect(await page.evaluate(() => localStorage.getItem("pp-theme"))).toBe("dark");
    done();
    await shoot(page, "viewer-pinch-points");
  });
});
