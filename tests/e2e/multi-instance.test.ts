// More than one instance (README, "Running more than one instance"): two app servers and two
// supervised analysis workers, each its own process as npm start runs them, against one PostgreSQL
// database. Pushes through both instances land in one history; no snapshot is analysed twice and
// the newest is analysed (older ones a newer push superseded in the queue are marked so); an
// e-mail is sent once though two workers deliver; a session made on one instance is valid on the
// other, and signing out on either ends it on both; a killed worker is started again.
// It lives with the end-to-end tests because it runs the built app.
import { execFileSync } from "node:child_process";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startMailSink, type MailSink } from "@/lib/mail/sink";
import { dropDatabase, urlFor, withAdmin } from "../support/test-db";
import { http, signInOverHttp, signOutOverHttp } from "./http";
import { Children, freePort, until } from "./processes";

const DB = "pp_multi_instance";
const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");
const children = new Children();
let sink: MailSink;
let mailDir = "";
let client: pg.Client;
let a = "";
let b = "";

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
  children.startTsx({ name: "app-a", cwd: root, args: ["scripts/serve.ts", "-H", "127.0.0.1", "-p", String(pa)], env: { ...base, NEXTAUTH_URL: a } });
  children.startTsx({ name: "app-b", cwd: root, args: ["scripts/serve.ts", "-H", "127.0.0.1", "-p", String(pb)], env: { ...base, NEXTAUTH_URL: b } });
  children.startTsx({ name: "worker-1", cwd: root, args: ["scripts/supervise-worker.ts"], env: base });
  children.startTsx({ name: "worker-2", cwd: root, args: ["scripts/supervise-worker.ts"], env: base });
  for (const url of [a, b]) {
    await until(`${url}/api/health says ok with two workers`, async () => {
      const res = await http(url, "/api/health");
      const body = JSON.parse(res.body) as { status: string; worker: { live: number } | null };
      return res.status === 200 && body.status === "ok" && body.worker?.live === 2;
    }, 90_000);
  }
}, 240_000);

afterAll(async () => {
  await children.stopAll();
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
