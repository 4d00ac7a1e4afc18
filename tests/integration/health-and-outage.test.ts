// GET /api/health and what every route answers while PostgreSQL is unreachable: 503 with
// Retry-After (RFC 9110 §15.6.4 503 Service Unavailable, §10.2.3 Retry-After) and a message that says
// so, never a 500 that looks like a bug; pages get the same from the proxy.
import { createServer } from "node:net";
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { NextRequest } from "next/server";
import { GET as health } from "@/app/api/health/route";
import { GET as listEnvironments } from "@/app/api/v1/environments/route";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { closeDb, db } from "@/models";
import { pushInventory } from "@/lib/data/push";
import { recordWorkerHeartbeat } from "@/lib/data/worker-heartbeats";
import { isDatabaseUnavailable } from "@/lib/errors";
import { forgetDatabaseProbe } from "@/lib/outage";
import { proxy } from "@/proxy";
import { authOptions } from "@/lib/auth/options";
import { SIGN_IN_ERRORS } from "@/lib/auth/messages";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

let viewer: TestUser;
let writeToken: string;

beforeAll(async () => {
  const admin = await createUser("admin");
  viewer = await createUser("viewer");
  writeToken = await createApiToken({ scopes: ["inventory:write"], createdBy: admin.id });
  await pushInventory({
    environment: "production",
    format: "pinchpoint",
    body: "pinchpoint: 1\nsource: s\ncomponents:\n  - { key: a, kind: service, needs: [b] }\n  - { key: b, kind: datastore }\n",
    dryRun: false,
    actor: { type: "system", label: "test", canCreateEnvironments: true },
  });
});

/** A port nothing listens on: bound, then released. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
  const { port } = server.address() as { port: number };
  await new Promise((r) => server.close(r));
  return port;
}

async function withDatabaseGone<T>(run: () => Promise<T>): Promise<T> {
  const real = process.env.DATABASE_URL!;
  await closeDb();
  forgetDatabaseProbe();
  const url = new URL(real);
  url.port = String(await closedPort());
  process.env.DATABASE_URL = url.toString();
  try {
    return await run();
  } finally {
    await closeDb();
    forgetDatabaseProbe();
    process.env.DATABASE_URL = real;
  }
}

describe("GET /api/health", () => {
  afterEach(async () => {
    await db().sequelize.query("DELETE FROM worker_heartbeats");
  });

  it("answers without a sign-in: database ok, queue depth, and degraded while no worker has ever reported", async () => {
    const res = await call(health, { url: "/api/health" });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({
      status: "degraded",
      database: { status: "ok", latencyMs: expect.any(Number) },
      worker: { status: "never", live: 0 },
      queue: { analysisQueued: 1, analysisRunning: 0, mailQueued: expect.any(Number) },
    });
    expect(res.headers.get("cache-control")).toBe("no-store");
  });

  it("is ok while a worker reports, and says when none has been seen for over a minute", async () => {
    await recordWorkerHeartbeat({ workerId: "host:1", host: "host", pid: 1, startedAt: new Date(), jobId: null });
    expect((await call(health, { url: "/api/health" })).json).toMatchObject({ status: "ok", worker: { status: "ok", live: 1 } });
    await db().sequelize.query("UPDATE worker_heartbeats SET last_seen_at = now() - interval '90 seconds'");
    const stale = await call(health, { url: "/api/health" });
    expect(stale.json).toMatchObject({ status: "degraded", worker: { status: "missing", live: 0, secondsSinceSeen: expect.any(Number) } });
    expect((stale.json as { worker: { secondsSinceSeen: number } }).worker.secondsSinceSeen).toBeGreaterThanOrEqual(89);
  });
});

describe("while the database is unreachable", () => {
  it("/api/health answers 503 with Retry-After and says the database is unreachable", async () => {
    const res = await withDatabaseGone(() => call(health, { url: "/api/health" }));
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBe("5");
    expect(res.json).toMatchObject({ status: "unavailable", database: { status: "unreachable" } });
  });

  it("a signed-in read and a CI push answer 503 with Retry-After and a clear message, not 500", async () => {
    const [read, pushed] = await withDatabaseGone(async () => [
      await call(listEnvironments, { url: "/api/v1/environments", as: viewer }),
      await call(push, { url: "/api/v1/environments/production/inventory", method: "POST", params: { env: "production" }, as: { token: writeToken }, body: "pinchpoint: 1\nsource: t\ncomponents: []\n", headers: { "content-type": "application/yaml" } }),
    ]);
    for (const res of [read, pushed]) {
      expect(res.status).toBe(503);
      expect(res.headers.get("retry-after")).toBe("5");
      expect(res.json).toMatchObject({ error: "unavailable", message: expect.stringContaining("cannot reach its database") });
    }
  });

  it("pages answer 503 with Retry-After from the proxy, signed in or not", async () => {
    const res = await withDatabaseGone(() => proxy(new NextRequest("http://127.0.0.1:3000/environments/production", { headers: { cookie: viewer.cookie } })));
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBe("5");
    expect(await res.text()).toContain("cannot reach its database");
    const signin = await withDatabaseGone(() => proxy(new NextRequest("http://127.0.0.1:3000/signin")));
    expect(signin.status).toBe(503);
  });

  it("a sign-in says the database is unreachable, not the driver's error", async () => {
    const credentials = authOptions.providers.find((p) => p.id === "credentials") as unknown as {
      options: { authorize: (raw: Record<string, string>, req: { headers: Record<string, string> }) => Promise<unknown> };
    };
    const attempt = withDatabaseGone(() => credentials.options.authorize({ email: viewer.email, password: "correct horse battery" }, { headers: { "x-forwarded-for": "127.0.0.9" } }));
    await expect(attempt).rejects.toThrow(SIGN_IN_ERRORS.unavailable);
  });

  it("everything works again once it is back", async () => {
    forgetDatabaseProbe();
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: viewer })).status).toBe(200);
    expect((await proxy(new NextRequest("http://127.0.0.1:3000/environments/production", { headers: { cookie: viewer.cookie } }))).status).toBe(200);
  });
});

describe("isDatabaseUnavailable", () => {
  // SQLSTATE codes from the PostgreSQL manual, Appendix A (PostgreSQL Error Codes).
  it("knows a server shutting down or restarting and a dropped connection, and nothing else", () => {
    expect(isDatabaseUnavailable({ name: "SequelizeDatabaseError", parent: { code: "57P01", message: "terminating connection due to administrator command" } })).toBe(true);
    expect(isDatabaseUnavailable({ name: "SequelizeDatabaseError", parent: { code: "57P03", message: "the database system is starting up" } })).toBe(true);
    expect(isDatabaseUnavailable({ name: "SequelizeDatabaseError", parent: { code: "08006" } })).toBe(true);
    expect(isDatabaseUnavailable(new Error("Connection terminated unexpectedly"))).toBe(true);
    expect(isDatabaseUnavailable({ name: "SequelizeUniqueConstraintError", parent: { code: "23505" } })).toBe(false);
    expect(isDatabaseUnavailable({ name: "SequelizeDatabaseError", parent: { code: "22P05", message: "unsupported Unicode escape sequence" } })).toBe(false);
  });
});
