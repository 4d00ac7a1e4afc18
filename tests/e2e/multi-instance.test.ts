// More than one instance (README, "Running more than one instance"): two app servers and two
// supervised analysis workers, each its own process as npm start runs them, against one PostgreSQL
// database. Pushes through both instances land in one history; no snapshot is analysed twice and
// the newest is analysed (older ones a newer push superseded in the queue are marked so); an
// e-mail is sent once though two workers deliver; a session made on one instance is valid on the
// other, and signing out on either ends it on both; a killed worker is started again.
// It lives with the end-to-end tests because it runs the built app.
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startMailSink, type MailSink } from "@/lib/mail/sink";
import { dropDatabase, urlFor, withAdmin } from "../support/test-db";
import { http, signInOverHttp, signOutOverHttp } from "./http";

const DB = "pp_multi_instance";
const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");
const children: ChildProcess[] = [];
let sink: MailSink;
let mailDir = "";
let client: pg.Client;
let a = "";
let b = "";

async function freePort(): Promise<number> {
  const s = createServer();
  await new Promise<void>((r) => s.listen(0, "127.0.0.1", () => r()));
  const { port } = s.address() as { port: number };
  await new Promise((r) => s.close(r));
  return port;
}

function start(name: string, args: string[], env: NodeJS.ProcessEnv): ChildProcess {
  const child = spawn(process.execPath, [tsx, ...args], { cwd: root, env });
  const out = (chunk: Buffer) => {
    if (process.env.PINCHPOINT_E2E_VERBOSE) process.stderr.write(`[${name}] ${chunk}`);
  };
  child.stdout?.on("data", out);
  child.stderr?.on("data", out);
  children.push(child);
  return child;
}

async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe().catch(() => null);
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

const q = async <R extends pg.QueryResultRow>(sql: string, params: unknown[] = []) => (await client.query<R>(sql, params)).rows;
const ownPage = (base: string) => ({ "sec-fetch-site": "same-origin", origin: base });

beforeAll(async () => {
  await dropDatabase(DB);
  await withAdmin((c) => c.query(`CREATE DATABASE "${DB}"`));
  mailDir = await mkdtemp(path.join(tmpdir(), "pp-multi-mail-"));
  sink = await startMailSink({ port: 0, dir: mailDir });
  const base: NodeJS.ProcessEnv = {
    ...process.env,
    DATABASE_URL: urlFor(DB),
    NEXTAUTH_SECRET: "one-secret-for-every-instance",
    PINCHPOINT_DEMO: "1",
    PINCHPOINT_SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
    PINCHPOINT_OIDC_ISSUER: "",
    PINCHPOINT_WORKER_POLL_MS: "200",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  // Migrations and the demo, once, from one machine (README step 4).
  execFileSync(process.execPath, [tsx, "--conditions=react-server", "scripts/seed.ts"], { cwd: root, env: base, stdio: "ignore", timeout: 120_000 });
  client = new pg.Client({ connectionString: urlFor(DB) });
  await client.connect();
  const [pa, pb] = [await freePort(), await freePort()];
  a = `http://127.0.0.1:${pa}`;
  b = `http://127.0.0.1:${pb}`;
  start("app-a", ["scripts/serve.ts", "-H", "127.0.0.1", "-p", String(pa)], { ...base, NEXTAUTH_URL: a });
  start("app-b", ["scripts/serve.ts", "-H", "127.0.0.1", "-p", String(pb)], { ...base, NEXTAUTH_URL: b });
  start("worker-1", ["scripts/supervise-worker.ts"], base);
  start("worker-2", ["scripts/supervise-worker.ts"], base);
  for (const url of [a, b]) {
    await until(`${url}/api/health says ok with two workers`, async () => {
      const res = await http(url, "/api/health");
      const body = JSON.parse(res.body) as { status: string; worker: { live: number } | null };
      return res.status === 200 && body.status === "ok" && body.worker?.live === 2;
    }, 90_000);
  }
}, 240_000);

afterAll(async () => {
  for (const child of children) if (child.exitCode === null) child.kill("SIGTERM");
  await Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r)))));
  await client?.end();
  await sink?.close();
  await rm(mailDir, { recursive: true, force: true });
  await dropDatabase(DB);
}, 60_000);

describe("two app instances and two workers on one database", () => {
  let admin = "";

  it("a session made on one instance is valid on the other", async () => {
    const signedIn = await signInOverHttp(a, { email: "admin@harbor-pantry.example", password: "pinchpoint-demo" });
    expect(signedIn.session).not.toBeNull();
    admin = signedIn.session!;
    expect((await http(b, "/api/v1/environments", { headers: { cookie: admin } })).status).toBe(200);
  });

  it("pushes through both land in one history; no snapshot is analysed twice, and the newest is analysed", async () => {
    const created = await http(a, "/api/v1/tokens", {
      method: "POST",
      headers: { cookie: admin, "content-type": "application/json", ...ownPage(a) },
      body: JSON.stringify({ name: "multi-instance", scopes: ["inventory:write", "read"], environment: "production" }),
    });
    expect(created.status).toBe(201);
    const { token } = JSON.parse(created.body) as { token: string };
    const before = Number((await q<{ n: string }>("SELECT count(*) AS n FROM snapshots"))[0]!.n);
    const pushes = Array.from({ length: 6 }, (_, i) => {
      const via = i % 2 === 0 ? a : b;
      const body = `pinchpoint: 1\nsource: multi-${i % 2 === 0 ? "a" : "b"}-repo\ncomponents:\n  - { key: multi-${i}, kind: service, needs: [dns-resolver] }\n`;
      return http(via, "/api/v1/environments/production/inventory", { method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/yaml" }, body });
    });
    const answers = await Promise.all(pushes);
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200, 200, 200, 200]);
    const numbers = answers.map((r) => (JSON.parse(r.body) as { snapshot: { number: number } }).snapshot.number).sort((x, y) => x - y);
    expect(numbers).toEqual(Array.from({ length: 6 }, (_, i) => before + 1 + i));
    await until("every analysis finished", async () => Number((await q<{ n: string }>("SELECT count(*) AS n FROM analysis_runs WHERE status IN ('queued', 'running')"))[0]!.n) === 0, 120_000);
    const perSnapshot = await q<{ number: number; runs: string; status: string; attempts: number }>(
      `SELECT s.number, count(r.id) AS runs, min(r.status::text) AS status, min(r.attempts) AS attempts
         FROM snapshots s LEFT JOIN analysis_runs r ON r.snapshot_id = s.id GROUP BY s.id, s.number ORDER BY s.number`,
    );
    expect(perSnapshot.length).toBe(before + 6);
    // One run per snapshot; each analysed once (done in one attempt) or passed over for a newer one.
    expect(perSnapshot.every((r) => r.runs === "1" && ((r.status === "done" && r.attempts === 1) || (r.status === "superseded" && r.attempts === 0)))).toBe(true);
    expect(perSnapshot.at(-1)).toMatchObject({ number: before + 6, status: "done" });
  }, 180_000);

  it("an e-mail is sent once though both workers deliver", async () => {
    // nightly-batch-box is unowned in the demo: giving it to a team mails the team once.
    const res = await http(b, "/api/v1/environments/production/components/nightly-batch-box", {
      method: "PATCH",
      headers: { cookie: admin, "content-type": "application/json", ...ownPage(b) },
      body: JSON.stringify({ team: "data-platform" }),
    });
    expect(res.status).toBe(200);
    const subject = "[Pinchpoint] Data Platform now owns nightly-batch-box in production";
    await until("the notice was sent", async () => (await q<{ status: string }>("SELECT status FROM outbox_messages WHERE subject = $1", [subject]))[0]?.status === "sent", 60_000);
    // Both delivery loops turn every 2 s: give each a few more turns to send it twice, if they would.
    await new Promise((r) => setTimeout(r, 8_000));
    const rows = await q<{ attempts: number }>("SELECT attempts FROM outbox_messages WHERE subject = $1", [subject]);
    expect(rows).toEqual([{ attempts: 1 }]);
    const files = (await readdir(mailDir)).filter((f) => f.endsWith(".eml"));
    const matching = (await Promise.all(files.map((f) => readFile(path.join(mailDir, f), "utf8")))).filter((t) => t.includes("nightly-batch-box") && /now owns/.test(t));
    expect(matching).toHaveLength(1);
  }, 60_000);

  it("signing out on one instance ends the session on both", async () => {
    expect(await signOutOverHttp(b, admin)).toBeLessThan(400);
    expect((await http(a, "/api/v1/environments", { headers: { cookie: admin } })).status).toBe(401);
    expect((await http(b, "/api/v1/environments", { headers: { cookie: admin } })).status).toBe(401);
  });

  it("a killed worker is started again by its supervisor", async () => {
    const live = await q<{ pid: number; worker_id: string }>("SELECT pid, worker_id FROM worker_heartbeats WHERE last_seen_at > now() - interval '30 seconds' ORDER BY worker_id");
    expect(live).toHaveLength(2);
    // A worker process our supervisor started (its pid is in its heartbeat), ended without warning.
    process.kill(live[0]!.pid, "SIGKILL");
    const back = await until("a new worker reports", async () => {
      const rows = await q<{ pid: number }>("SELECT pid FROM worker_heartbeats WHERE last_seen_at > now() - interval '5 seconds' AND pid <> $1 AND pid <> $2", [live[0]!.pid, live[1]!.pid]);
      return rows[0];
    }, 60_000);
    expect(back.pid).toBeGreaterThan(0);
  }, 90_000);
});
