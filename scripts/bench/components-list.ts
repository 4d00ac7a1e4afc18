// The components list on a large estate (npm run bench -- --only components-list): a generated
// 45,000-component environment pushed through the API's push code, the production build served as
// `npm start` serves it (scripts/serve.ts), then
//   - the list API's first page (the screen's own request: 50 rows, default sort), the first call
//     after start and the median of the next ten;
//   - the screen in Debian's headless Chromium (playwright-core): first contentful paint (the
//     browser's Paint Timing entry) and the time until the first page of rows is in the table,
//     both from navigation start, the first visit and the median of the next five.
// The goal (issue 17): rows on screen in under 1 s at any estate size.
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { resolve } from "node:path";
import { encode } from "next-auth/jwt";
import { chromium } from "playwright-core";
import { generateGraph } from "./generate";
import { freePort, waitFor } from "./http";
import { inventoryYaml, withBenchDatabase } from "./push";

const root = resolve(__dirname, "../..");
const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const round = (v: number): number => Math.round(v);

export interface ComponentsListResult {
  n: number;
  pushMs: number;
  api: { firstMs: number; medianMs: number; bytes: number };
  screen: { firstFcpMs: number; firstRowsMs: number; medianFcpMs: number; medianRowsMs: number; rows: number };
}

export async function benchComponentsList(n = 45_000): Promise<ComponentsListResult> {
  const secret = randomBytes(24).toString("base64url");
  return withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../../models");
    const { migrateToLatest } = await import("../../models/migrate");
    const { pushInventory } = await import("../../lib/data/push");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    const t0 = performance.now();
    // The list reads the stored components, not the analysis: the queued analysis is left unrun.
    await pushInventory({ environment: "bench", format: "pinchpoint", body: inventoryYaml(generateGraph({ n, seed: 42 }), "bench-repo"), contentType: "application/yaml", dryRun: false, actor });
    const pushMs = round(performance.now() - t0);
    const viewer = await db().models.User.create({ email: "viewer@bench.example", name: "Bench viewer", role: "viewer", passwordHash: null, oidcSubject: null });
    await closeDb();

    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    const server: ChildProcess = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "scripts/serve.ts", "-H", "127.0.0.1", "-p", String(port)], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: url, NEXTAUTH_URL: base, NEXTAUTH_SECRET: secret, NEXT_TELEMETRY_DISABLED: "1", NODE_ENV: "production" },
      stdio: ["ignore", "ignore", "inherit"],
    });
    const browser = await chromium.launch({
      executablePath: process.env.PINCHPOINT_CHROMIUM ?? "/usr/bin/chromium",
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    });
    try {
      await waitFor(`${base}/signin`, 60_000);
      const jwt = await encode({ token: { sub: viewer.id, email: viewer.email, name: viewer.name, role: "viewer", sv: viewer.sessionVersion }, secret });
      const cookie = `next-auth.session-token=${jwt}`;

      // The screen's own first request (components/components/ComponentList.tsx: 50 rows, default sort).
      const apiUrl = `${base}/api/v1/environments/bench/components?limit=50`;
      const timeApi = async (): Promise<{ ms: number; bytes: number }> => {
        const t = performance.now();
        const res = await fetch(apiUrl, { headers: { cookie } });
        const body = await res.text();
        if (res.status !== 200) throw new Error(`${apiUrl}: ${res.status} ${body.slice(0, 300)}`);
        return { ms: performance.now() - t, bytes: body.length };
      };
      const first = await timeApi();
      const warm: number[] = [];
      for (let i = 0; i < 10; i++) warm.push((await timeApi()).ms);

      const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
      await context.addCookies([{ name: "next-auth.session-token", value: jwt, url: base, httpOnly: true }]);
      const visit = async (): Promise<{ fcp: number; rows: number; count: number }> => {
        const page = await context.newPage();
        try {
          await page.goto(`${base}/environments/bench/components`, { waitUntil: "commit" });
          const row = page.locator('[data-testid="components-table"] tbody tr a[href*="/components/"]').first();
          await row.waitFor({ state: "visible", timeout: 60_000 });
          // Both from the navigation's start, read in the page so no round trip is counted.
          const times = await page.evaluate(() => ({
            rows: performance.now(),
            fcp: performance.getEntriesByName("first-contentful-paint")[0]?.startTime ?? NaN,
          }));
          const count = await page.locator('[data-testid="components-table"] tbody tr').count();
          return { fcp: times.fcp, rows: times.rows, count };
        } finally {
          await page.close();
        }
      };
      const firstVisit = await visit();
      const visits: Array<{ fcp: number; rows: number; count: number }> = [];
      for (let i = 0; i < 5; i++) visits.push(await visit());
      await context.close();
      return {
        n,
        pushMs,
        api: { firstMs: round(first.ms), medianMs: round(median(warm)), bytes: first.bytes },
        screen: {
          firstFcpMs: round(firstVisit.fcp),
          firstRowsMs: round(firstVisit.rows),
          medianFcpMs: round(median(visits.map((v) => v.fcp))),
          medianRowsMs: round(median(visits.map((v) => v.rows))),
          rows: firstVisit.count,
        },
      };
    } finally {
      await browser.close();
      server.kill("SIGTERM");
      await new Promise((r) => (server.exitCode !== null ? r(null) : server.once("exit", r)));
    }
  });
}
