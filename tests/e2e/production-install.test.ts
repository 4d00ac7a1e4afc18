// A production install starts (README, "Production install"): a copy of this checkout with the
// built app, installed with `npm ci --omit=dev` (no TypeScript compiler, no test tools, no build
// tools), migrates a new database, seeds it (pushed files parsed on the tsx-loaded parse threads,
// analyses on the analysis thread), serves the built app and runs the supervised worker, which
// analyses a snapshot pushed over HTTP and reports a heartbeat that /api/health shows.
// It lives with the end-to-end tests because it needs the built app (.next).
import { execFile } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { dropDatabase, urlFor, withAdmin } from "../support/test-db";
import { http, signInOverHttp } from "./http";
import { Children, freePort, until } from "./processes";

const run = promisify(execFile);
const DB = "pp_production_install";
const root = path.resolve(__dirname, "../..");
const dist = process.env.PINCHPOINT_DIST_DIR || ".next";
const children = new Children();
let copy = "";
let base = "";
let env: NodeJS.ProcessEnv = { NODE_ENV: "production" };
let client: pg.Client;

/** What git knows of the checkout (tracked files and new ones not ignored), then the build without its cache. */
async function copyCheckout(to: string): Promise<void> {
  const { stdout } = await run("git", ["ls-files", "-z", "--cached", "--others", "--exclude-standard"], { cwd: root, maxBuffer: 64 * 1024 * 1024 });
  for (const file of stdout.split("\0").filter(Boolean)) {
    if (!existsSync(path.join(root, file))) continue; // deleted in the working tree
    mkdirSync(path.dirname(path.join(to, file)), { recursive: true });
    cpSync(path.join(root, file), path.join(to, file));
  }
  cpSync(path.join(root, dist), path.join(to, dist), { recursive: true, filter: (src) => !src.startsWith(path.join(root, dist, "cache")) && !src.startsWith(path.join(root, dist, "dev")) });
}

beforeAll(async () => {
  if (!existsSync(path.join(root, dist, "BUILD_ID"))) throw new Error(`no build in ${dist}: run next build first (npm test does)`);
  copy = mkdtempSync(path.join(tmpdir(), "pp-production-"));
  await copyCheckout(copy);
  // The production install itself, from npm's cache where it can.
  await run("npm", ["ci", "--omit=dev", "--no-audit", "--no-fund", "--prefer-offline", "--loglevel=error"], { cwd: copy, timeout: 300_000, maxBuffer: 64 * 1024 * 1024 });
  await dropDatabase(DB);
  await withAdmin((c) => c.query(`CREATE DATABASE "${DB}"`));
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  env = {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    DATABASE_URL: urlFor(DB),
    NEXTAUTH_URL: base,
    NEXTAUTH_SECRET: "production-install-check",
    PINCHPOINT_DEMO: "1",
    PINCHPOINT_OIDC_ISSUER: "",
    // Nothing listens there: mail waits in the queue, which is all this check needs of it.
    PINCHPOINT_SMTP_URL: `smtp://127.0.0.1:${await freePort()}`,
    PINCHPOINT_WORKER_POLL_MS: "200",
    PINCHPOINT_DIST_DIR: dist,
    NEXT_TELEMETRY_DISABLED: "1",
    NODE_ENV: "production",
  };
  client = new pg.Client({ connectionString: urlFor(DB) });
  await client.connect();
}, 420_000);

afterAll(async () => {
  await children.stopAll();
  await client?.end();
  await dropDatabase(DB);
  if (copy) rmSync(copy, { recursive: true, force: true });
}, 60_000);

describe("a production install (npm ci --omit=dev)", () => {
  it("has what npm start runs and none of the development tools", () => {
    for (const present of ["tsx", "next", "pg-boss", "mailparser", "piscina"]) expect(existsSync(path.join(copy, "node_modules", present)), present).toBe(true);
    for (const absent of ["typescript", "vitest", "eslint", "tailwindcss", "playwright-core"]) expect(existsSync(path.join(copy, "node_modules", absent)), absent).toBe(false);
  });

  it("migrates a new database (npm run db:migrate), the queue's schema included", async () => {
    const { stdout } = await run("npm", ["run", "--silent", "db:migrate"], { cwd: copy, env, timeout: 120_000 });
    expect(stdout).toContain("0014-job-queue");
    expect((await client.query<{ version: number }>("SELECT version FROM pgboss.version")).rows).toEqual([{ version: 24 }]);
  }, 120_000);

  it("seeds the demo (npm run db:seed): files parsed on the parse threads, snapshots analysed on the analysis thread", async () => {
    await run("npm", ["run", "--silent", "db:seed"], { cwd: copy, env, timeout: 180_000 });
    const runs = (await client.query<{ status: string; thread: boolean }>("SELECT status::text AS status, (graph ->> 'thread')::boolean AS thread FROM analysis_runs")).rows;
    expect(runs.length).toBeGreaterThan(1);
    expect(runs.every((r) => r.status === "done" && r.thread)).toBe(true);
  }, 180_000);

  it("serves the built app and runs the supervised worker, which analyses a pushed snapshot", async () => {
    children.startTsx({ name: "app", cwd: copy, args: ["scripts/serve.ts", "-H", "127.0.0.1", "-p", new URL(base).port], env });
    children.startTsx({ name: "worker", cwd: copy, args: ["scripts/supervise-worker.ts"], env });
    await until(
      "/api/health says ok with one worker",
      async () => {
        const res = await http(base, "/api/health");
        const body = JSON.parse(res.body) as { status: string; worker: { live: number } | null };
        return res.status === 200 && body.status === "ok" && body.worker?.live === 1;
      },
      90_000,
    );
    const { session } = await signInOverHttp(base, { email: "admin@harbor-pantry.example", password: "pinchpoint-demo" });
    expect(session).not.toBeNull();
    const pushed = await http(base, "/api/v1/environments/production/inventory", {
      method: "POST",
      headers: { cookie: session!, "content-type": "application/yaml", "sec-fetch-site": "same-origin", origin: base },
      body: "pinchpoint: 1\nsource: production-install-check\ncomponents:\n  - { key: install-check, kind: service, needs: [dns-resolver] }\n",
    });
    expect(pushed.status).toBe(200);
    const { snapshot } = JSON.parse(pushed.body) as { snapshot: { number: number } };
    await until(
      "the worker analysed the pushed snapshot",
      async () =>
        (
          await client.query<{ status: string }>(
            "SELECT a.status::text AS status FROM analysis_runs a JOIN snapshots s ON s.id = a.snapshot_id JOIN environments e ON e.id = s.environment_id WHERE e.slug = 'production' AND s.number = $1",
            [snapshot.number],
          )
        ).rows[0]?.status === "done",
      90_000,
    );
    const health = JSON.parse((await http(base, "/api/health")).body) as { queue: { analysisQueued: number; analysisRunning: number } };
    expect(health.queue).toMatchObject({ analysisQueued: 0, analysisRunning: 0 });
  }, 240_000);
});
