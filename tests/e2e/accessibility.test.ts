// axe-core (npm axe-core 4.x, injected into Debian's Chromium) on every screen, in both themes: no
// serious or critical violation (axe's impact levels: deque.com/axe, "impact" of a rule result).
import { readFileSync } from "node:fs";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile } from "./browser";
import { SignInPage } from "./pages/signin";

const browser = browserForFile();
const AXE = readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");
const ENV = "/environments/production";

const SCREENS = [
  `${ENV}`,
  `${ENV}/map`,
  `${ENV}/pinch-points`,
  `${ENV}/drills`,
  `${ENV}/drills?fail=payments-db&down=1`,
  `${ENV}/incidents`,
  `${ENV}/boot-order`,
  `${ENV}/components`,
  `${ENV}/components/payments-db`,
  `${ENV}/imports`,
  `${ENV}/history`,
  `${ENV}/drift`,
  `${ENV}/reviews`,
  `${ENV}/policies`,
  "/teams",
  "/teams/checkout",
  "/format",
  "/admin",
  "/admin/users",
  "/admin/environments",
  "/admin/tokens",
  "/admin/audit",
  "/admin/mail",
];

interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: Array<{ target: string[] }>;
}

async function axe(page: Page): Promise<Violation[]> {
  // Runtime evaluation, not a <script> element: the page's Content-Security-Policy admits only nonced scripts.
  await page.evaluate(AXE);
  const result = await page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: Violation[] }> } };
    return w.axe.run(document, { resultTypes: ["violations"] });
  });
  return result.violations.filter((v) => v.impact === "serious" || v.impact === "critical");
}

let context: BrowserContext;
let page: Page;
beforeAll(async () => {
  context = await browser().newContext({ viewport: { width: 1280, height: 720 } });
  page = await context.newPage();
  const signin = new SignInPage(page);
  await signin.open();
  // The sign-in screen, before anyone is signed in.
  const anonymous = await axe(page);
  expect(anonymous.map((v) => `${v.id}: ${v.help}`), "sign-in screen").toEqual([]);
  await signin.signIn("admin@harbor-pantry.example");
  await page.waitForURL((u) => u.pathname === "/");
});
afterAll(async () => {
  await context?.close();
});

describe("accessibility (axe-core): no serious or critical violation", () => {
  for (const theme of ["dark", "light"] as const) {
    it(`every screen in the ${theme} theme`, async () => {
      await page.evaluate((t) => localStorage.setItem("pp-theme", t), theme);
      const found: string[] = [];
      for (const screen of SCREENS) {
        await page.goto(`${baseUrl()}${screen}`);
        // Let the client fetches settle: axe should see the screen people see, not its loading state.
        await page.waitForLoadState("networkidle").catch(() => undefined);
        await page.waitForTimeout(300);
        for (const v of await axe(page)) found.push(`${screen} [${theme}] ${v.impact} ${v.id}: ${v.help} — ${v.nodes.slice(0, 3).map((n) => n.target.join(" ")).join(", ")}`);
      }
      console.log(`[axe] ${SCREENS.length} screens in the ${theme} theme: ${found.length} serious or critical violations${found.map((f) => `\n  ${f}`).join("")}`);
      expect(found).toEqual([]);
    }, 300_000);
  }
});
