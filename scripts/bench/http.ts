// HTTP load on the production build (npm run bench -- --only http): a generated 20,000-component
// environment pushed and analysed by the same code as the API and the worker, served as `npm start`
// serves it (scripts/serve.ts), and autocannon (npm) as the load generator, with 50 concurrent clients signed in by a real
// session cookie. Latency percentiles are computed from every response time autocannon reports
// (its own histogram has no 95th percentile). The goals are the issue's: p95 under 100 ms for the
// default rankings page and under 300 ms for limit=1000.
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { createServer } from "node:net";
import { resolve } from "node:path";
import autocannon from "autocannon";
import { encode } from "next-auth/jwt";
import { generateGraph } from "./generate";
import { inventoryYaml, withBenchDatabase } from "./push";

const root = resolve(__dirname, "../..");

export async function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const srv = createServer();
    srv.once("error", rej);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => res(port));
    });
  });
}

export async function waitFor(url: string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      if ((await fetch(url)).status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

const percentile = (sorted: number[], p: number): number => Math.round((sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN) * 10) / 10;

export interface LoadResult {
  label: string;
  requests: number;
  perSecond: number;
  p50: number;
  p95: number;
  p99: number;
  non2xx: number;
  errors: number;
}

async function load(label: string, url: string, headers: Record<string, string>, seconds: number): Promise<LoadResult> {
  const times: number[] = [];
  let non2xx = 0;
  const result = await new Promise<autocannon.Result>((res, rej) => {
    const instance = autocannon({ url, connections: 50, duration: seconds, headers }, (err, r) => (err ? rej(err) : res(r)));
    instance.on("response", (_client, status, _bytes, responseTime) => {
      times.push(responseTime);
      if (status < 200 || status >= 300) non2xx++;
    });
  });
  times.sort((a, b) => a - b);
  return {
    label,
    requests: times.length,
    perSecond: Math.round(times.length / seconds),
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    non2xx,
    errors: result.errors + result.timeouts,
  };
}

export async function benchHttp({ n = 20_000, seconds = 10 }: { n?: number; seconds?: number } = {}): Promise<LoadResult[]> {
  const secret = randomBytes(24).toString("base64url");
  return withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../../models");
    const { migrateToLatest } = await import("../../models/migrate");
    const { pushInventory } = await import("../../lib/data/push");
    const { drainAnalysisQueue } = await import("../../lib/jobs/analysis");
    const { stopAnalysisThread } = await import("../../lib/analysis/thread");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    const t0 = performance.now();
    await pushInventory({ environment: "bench", format: "pinchpoint", body: inventoryYaml(generateGraph({ n, seed: 42 }), "bench-repo"), contentType: "application/yaml", dryRun: false, actor });
    await drainAnalysisQueue("bench");
    await stopAnalysisThread();
    const viewer = await db().models.User.create({ email: "viewer@bench.example", name: "Bench viewer", role: "viewer", passwordHash: null, oidcSubject: null });
    await closeDb();
    console.log(`http: ${n / 1000}k-component environment pushed and analysed in ${Math.round(performance.now() - t0)} ms`);

    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    // Served as npm start serves it: scripts/serve.ts in front of the production build.
    const server: ChildProcess = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "scripts/serve.ts", "-H", "127.0.0.1", "-p", String(port)], {
      cwd: root,
      env: { ...process.env, DATABASE_URL: url, NEXTAUTH_URL: base, NEXTAUTH_SECRET: secret, NEXT_TELEMETRY_DISABLED: "1", NODE_ENV: "production" },
      stdio: ["ignore", "ignore", "inherit"],
    });
    try {
      await waitFor(`${base}/signin`, 60_000);
      const jwt = await encode({ token: { sub: viewer.id, email: viewer.email, name: viewer.name, role: "viewer", sv: viewer.sessionVersion }, secret });
      const headers = { cookie: `next-auth.session-token=${jwt}` };
      const pages = [
        { label: "rankings, default page (50)", path: "/api/v1/environments/bench/rankings" },
        { label: "rankings, limit=1000 sort=pagerank", path: "/api/v1/environments/bench/rankings?limit=1000&sort=pagerank" },
      ];
      // One request each first: the page cache fills once per analysis, then serves every reader.
      for (const p of pages) {
        const res = await fetch(`${base}${p.path}`, { headers });
        if (res.status !== 200) throw new Error(`${p.path}: ${res.status} ${await res.text()}`);
      }
      const results: LoadResult[] = [];
      for (const p of pages) results.push(await load(p.label, `${base}${p.path}`, headers, seconds));
      return results;
    } finally {
      server.kill("SIGTERM");
      await new Promise((r) => (server.exitCode !== null ? r(null) : server.once("exit", r)));
    }
  });
}
