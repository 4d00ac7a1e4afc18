// Headless Chromium from Debian, driven by playwright-core (no browser download).
import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";

export const baseUrl = () => {
  const url = process.env.PINCHPOINT_E2E_URL;
  if (!url) throw new Error("PINCHPOINT_E2E_URL is not set: the e2e global setup starts the app");
  return url;
};

/**
 * page.request shares the page's cookies but, unlike the page's own fetch(), sends no Origin: a
 * cookie-authenticated write must say it comes from the app's own pages (lib/auth/same-origin.ts).
 */
export const ownOrigin = () => ({ origin: baseUrl() });

export const SCREENSHOT_DIR = path.resolve(__dirname, "../../test-results/screenshots");

async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.PINCHPOINT_CHROMIUM ?? "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/**
 * One browser for a test file: launched before its tests (and before the file's own beforeAll
 * hooks registered after this call), closed after them. Returns a getter.
 */
export function browserForFile(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error("the browser is launched in beforeAll; use it inside hooks and tests");
    return browser;
  };
}
