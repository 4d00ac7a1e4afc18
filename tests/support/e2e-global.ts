// Once per end-to-end run: a fresh database with the demo seeded, the analysis worker, and the
// built app served on its own port — the same processes `npm start` runs, on test data.
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import path from "node:path";
import { closeDb, db } from "@/models";
import { migrateToLatest } from "@/models/migrate";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { seedDemo } from "@/lib/data/seed";
import { dropDatabase, urlFor, withAdmin } from "./test-db";
import { startOidcStandIn } from "../../scripts/oidc-standin";
import { startMailSink } from "@/lib/mail/sink";

const DB = "pp_e2e";
const PORT = Number(process.env.PINCHPOINT_E2E_PORT ?? 3100);
const root = path.resolve(__dirname, "../..");

export function portFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = createServer();
    probe.once("error", () => resolve(false));
    probe.listen(port, "127.0.0.1", () => probe.close(() => resolve(true)));
  });
}

async function waitFor(url: string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

export default async function setup() {
  await dropDatabase(DB);
  await withAdmin((c) => c.query(`CREATE DATABASE "${DB}"`));
  const databaseUrl = urlFor(DB);
  process.env.DATABASE_URL = databaseUrl;
  await migrateToLatest(db().sequelize);
  await seedDemo({ examplesDir: path.join(root, "examples/harbor-pantry"), log: () => undefined, afterPush: () => drainAnalysisQueue() });
  await closeDb();

  const baseUrl = `http://127.0.0.1:${PORT}`;
  const sso = await startOidcStandIn({
    port: Number(process.env.PINCHPOINT_E2E_OIDC_PORT ?? 3111),
    clientId: "pinchpoint",
    clientSecret: "pinchpoint-stand-in-secret",
    redirectUris: [`${baseUrl}/api/auth/callback/oidc`],
  });
  const mailDir = path.join(root, ".data/mail-e2e");
  const sink = await startMailSink({ port: Number(process.env.PINCHPOINT_E2E_SMTP_PORT ?? 2535), dir: mailDir });
  const env = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    NEXTAUTH_URL: baseUrl,
    NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? "test-secret-not-for-production",
    PINCHPOINT_DEMO: "1",
    PINCHPOINT_OIDC_ISSUER: sso.issuer,
    PINCHPOINT_SMTP_URL: `smtp://127.0.0.1:${sink.port}`,
    PINCHPOINT_MAIL_DIR: mailDir,
    NEXT_TELEMETRY_DISABLED: "1",
  };
  const children: ChildProcess[] = [];
  const log = (name: string) => (chunk: Buffer) => {
    if (process.env.PINCHPOINT_E2E_VERBOSE) process.stderr.write(`[${name}] ${chunk}`);
  };
  if (!(await portFree(PORT))) throw new Error(`port ${PORT} on 127.0.0.1 is taken by another process; choose another with PINCHPOINT_E2E_PORT`);
  // The same server npm start runs (the caller's address from the socket, scripts/serve.ts).
  const server = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "scripts/serve.ts", "-H", "127.0.0.1", "-p", String(PORT)], { cwd: root, env });
  server.stdout?.on("data", log("next"));
  server.stderr?.on("data", (chunk: Buffer) => process.stderr.write(`[next] ${chunk}`));
  children.push(server);
  const worker = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", "scripts/analysis-worker.ts"], { cwd: root, env });
  worker.stdout?.on("data", log("worker"));
  worker.stderr?.on("data", (chunk: Buffer) => process.stderr.write(`[worker] ${chunk}`));
  children.push(worker);
  await waitFor(`${baseUrl}/signin`, 60_000);
  process.env.PINCHPOINT_E2E_URL = baseUrl;

  return async () => {
    for (const child of children) child.kill("SIGTERM");
    await Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r)))));
    await sso.close();
    await sink.close();
    await dropDatabase(DB);
  };
}
