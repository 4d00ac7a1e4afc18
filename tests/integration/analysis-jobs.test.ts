// Analysis off the request path: a push queues a run and its job (pg-boss, queue `analysis`), a
// worker runs it and stores results, the API serves them; a worker that dies mid-run leaves a run
// that the queue hands to another worker; a newer snapshot supersedes a queued older one; one
// environment is analysed by one worker at a time.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { GET as rankings } from "@/app/api/v1/environments/[env]/rankings/route";
import { GET as blast } from "@/app/api/v1/environments/[env]/components/[key]/blast-radius/route";
import { POST as drills } from "@/app/api/v1/environments/[env]/drills/route";
import { GET as bootOrder } from "@/app/api/v1/environments/[env]/boot-order/route";
import { GET as component } from "@/app/api/v1/environments/[env]/components/[key]/route";
import { db } from "@/models";
import { claimNextJob, drainAnalysisQueue, runJob } from "@/lib/jobs/analysis";
import { STALE_AFTER_S, type ClaimedRun } from "@/lib/data/analysis-runs";
import { jobQueue, QUEUES } from "@/lib/data/job-queue";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

// A small estate with a known shape: everything customer-facing goes through `gateway`, which
// needs `auth` (one instance, one zone); `db` has two replicas in two zones. `a` ⇄ `b` is a cycle.
const FILE = `pinchpoint: 1
source: core-repo
components:
  - { key: web, kind: service, tier: 1, replicas: 2, zones: [z1, z2], team: shop, needs: [gateway] }
  - { key: app, kind: service, tier: 1, replicas: 2, zones: [z1, z2], team: shop, needs: [gateway, { key: recs, strength: soft }] }
  - { key: gateway, kind: gateway, tier: 1, replicas: 2, zones: [z1, z2], team: edge, needs: [auth, db] }
  - { key: auth, kind: service, tier: 2, replicas: 1, zones: [z1], team: identity }
  - { key: db, kind: datastore, tier: 2, replicas: 2, zones: [z1, z2], team: data }
  - { key: recs, kind: service, tier: 3, team: shop, needs: [{ any_of: [a, b] }] }
  - { key: a, kind: service, tier: 4, zones: [z2], needs: [b] }
  - { key: b, kind: service, tier: 4, zones: [z2], needs: [a] }
`;

let viewer: TestUser;

/** Poll until `probe` gives something (the queue's retries wait out their backoff). */
async function until<T>(probe: () => Promise<T | null>, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`nothing within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}
const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };

beforeAll(async () => {
  viewer = await createUser("viewer");
  await db().models.Team.bulkCreate([{ slug: "shop", name: "Shop", email: "shop@example.test", oncall: "rota shop", description: null }]);
  await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE, dryRun: false, actor: system });
});

describe("analysis jobs", () => {
  it("answers 404 with a clear message until an analysis has finished", async () => {
    const res = await call(rankings, { url: "/api/v1/environments/prod/rankings", params: { env: "prod" }, as: viewer });
    expect(res.status).toBe(404);
    expect((res.json as { message: string }).message).toMatch(/queued|analysis/);
  });

  it("hands a run whose worker stopped sending heartbeats back to the queue, which retries the same job elsewhere", async () => {
    const job = await claimNextJob("worker-that-dies");
    expect(job).not.toBeNull();
    expect(await claimNextJob("second-worker")).toBeNull(); // held by the first: its queue job is active
    await db().sequelize.query(`UPDATE analysis_runs SET heartbeat_at = now() - make_interval(secs => :s)`, { replacements: { s: STALE_AFTER_S + 5 } });
    // The stale run's job is failed through pg-boss, which retries it after its backoff (1–2 s, lib/data/job-queue.ts).
    const taken = await until(() => claimNextJob("second-worker"));
    expect(taken).toMatchObject({ id: job!.id, job_id: job!.job_id, attempts: 2 });
    expect(await jobQueue().getJobById(QUEUES.analysis, job!.job_id, { includeArchive: false })).toMatchObject({ state: "active", retryCount: 1 });
    expect(await runJob(taken, "second-worker")).toBe("done");
    // The first worker coming back to life cannot overwrite the result, nor touch the job.
    expect(await runJob(job!, "worker-that-dies")).toBe("lost");
    const [run] = await db().sequelize.query<{ status: string; progress: number; exact: boolean }>("SELECT status, progress, exact FROM analysis_runs", { type: QueryTypes.SELECT });
    expect(run).toEqual({ status: "done", progress: 1, exact: true });
    expect(await jobQueue().getJobById(QUEUES.analysis, job!.job_id, { includeArchive: false })).toMatchObject({ state: "completed" });
  });

  it("serves rankings sorted by betweenness by default, with snapshot and analysis metadata", async () => {
    const res = await call(rankings, { url: "/api/v1/environments/prod/rankings", params: { env: "prod" }, as: viewer });
    expect(res.status).toBe(200);
    const body = res.json as { snapshot: { number: number; undeclaredShare: number }; analysis: { status: string; exact: boolean }; total: number; items: Array<{ key: string; betweenness: number; blastRadius: { down: number } }> };
    expect(body.snapshot.number).toBe(1);
    expect(body.analysis).toMatchObject({ status: "done", exact: true });
    expect(body.total).toBe(8);
    // gateway lies on every path from web/app to auth/db: 4 of the (n−1)(n−2) = 42 ordered pairs
    // (web→auth, web→db, app→auth, app→db), so 4/42 (Freeman 1977 definition, directed, normalised).
    expect(body.items[0]?.key).toBe("gateway");
    expect(body.items[0]?.betweenness).toBeCloseTo(4 / 42, 12);
    const sorted = await call(rankings, { url: "/api/v1/environments/prod/rankings?sort=blastDown&limit=2", params: { env: "prod" }, as: viewer });
    const top = (sorted.json as { items: Array<{ key: string; blastRadius: { down: number } }> }).items;
    // auth down → gateway, web, app down (hard chain): 3.
    expect(top.map((i) => [i.key, i.blastRadius.down])).toEqual([["auth", 3], ["db", 3]]);
    // A single point (common practice): one replica, or fewer than two zones — the S of the pinch score.
    const all = (await call(rankings, { url: "/api/v1/environments/prod/rankings?limit=50", params: { env: "prod" }, as: viewer })).json as { items: Array<{ key: string; singlePoint: boolean }> };
    const single = Object.fromEntries(all.items.map((i) => [i.key, i.singlePoint]));
    expect(single).toMatchObject({ auth: true, gateway: false, db: false, a: true });
  });

  it("answers single blast radius and multi-failure drills with teams to page", async () => {
    const one = await call(blast, { url: "/api/v1/environments/prod/components/auth/blast-radius", params: { env: "prod", key: "auth" }, as: viewer });
    expect(one.status).toBe(200);
    expect(one.json).toMatchObject({ down: expect.arrayContaining(["auth", "gateway", "web", "app"]), degraded: [] });
    const zone = await call(drills, { url: "/api/v1/environments/prod/drills", method: "POST", params: { env: "prod" }, as: viewer, body: { fail: { zones: ["z2"] } } });
    // z2 fails a and b (their only zone): the any_of group of recs is unmet, but recs is a soft
    // need of app, so recs is down and app only degraded.
    expect(zone.json).toMatchObject({ down: expect.arrayContaining(["a", "b", "recs"]), degraded: ["app"] });
    const teams = (zone.json as { teams: Array<{ team: string | null; contact: { oncall: string } | null }> }).teams;
    expect(teams.find((t) => t.team === "shop")?.contact?.oncall).toBe("rota shop");
    const unknown = await call(drills, { url: "/api/v1/environments/prod/drills", method: "POST", params: { env: "prod" }, as: viewer, body: { fail: { components: ["nope"] } } });
    expect(unknown.status).toBe(422);
    const empty = await call(drills, { url: "/api/v1/environments/prod/drills", method: "POST", params: { env: "prod" }, as: viewer, body: { fail: {} } });
    expect(empty.status).toBe(422);
  });

  it("reports boot order with the cycle that cannot cold-start and the need to break first", async () => {
    const res = await call(bootOrder, { url: "/api/v1/environments/prod/boot-order?components=true", params: { env: "prod" }, as: viewer });
    const body = res.json as { stages: string[][]; cycles: Array<{ members: string[]; startOrder: string[]; breaks: Array<{ strength: string }>; breakCount: number }>; components: Record<string, { team: string | null }> };
    expect(body.cycles.map((c) => [...c.members].sort())).toEqual([["a", "b"]]);
    // a ⇄ b by hard needs: whichever starts first, one hard need must be broken by hand.
    expect(body.cycles[0]).toMatchObject({ breakCount: 1, breaks: [{ strength: "hard" }] });
    expect([...body.cycles[0]!.startOrder].sort()).toEqual(["a", "b"]);
    expect(body.stages[0]).toEqual(expect.arrayContaining(["auth", "db"]));
    expect(body.components.web).toMatchObject({ team: "shop" });
    // The overview asks for the cycles only.
    const light = await call(bootOrder, { url: "/api/v1/environments/prod/boot-order?stages=false", params: { env: "prod" }, as: viewer });
    expect(light.json).not.toHaveProperty("stages");
    expect((light.json as { cycles: unknown[] }).cycles).toHaveLength(1);
  });

  it("gives the component page its measures, ranks with ties and dominators", async () => {
    const res = await call(component, { url: "/api/v1/environments/prod/components/gateway", params: { env: "prod", key: "gateway" }, as: viewer });
    expect(res.json).toMatchObject({ key: "gateway", needs: [{ key: "auth" }, { key: "db" }], dependents: [{ key: "app" }, { key: "web" }], metrics: { rank: 1, tied: 1, articulation: true } });
    // Entries are web and app (tier 1, nothing needs them). Every path from each to auth and db
    // passes through gateway; from both together too, while gateway itself is reached two ways.
    expect((res.json as { metrics: unknown }).metrics).toMatchObject({
      entry: false,
      dominators: { entriesReaching: 2, entriesDominated: 2, maxDominated: 2, dominatedAll: 2, idomAll: null, fromEntries: [{ entry: "app", dominated: 2 }, { entry: "web", dominated: 2 }] },
    });
    const web = await call(component, { url: "/api/v1/environments/prod/components/web", params: { env: "prod", key: "web" }, as: viewer });
    expect(web.json).toMatchObject({ metrics: { entry: true }, fromHere: { reached: 3, through: [{ key: "gateway", dominated: 2 }] } });
  });

  it("a new snapshot is analysed in turn and the old results stay until then", async () => {
    await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE.replace("tier: 4, zones: [z2], needs: [a]", "tier: 4, zones: [z1, z2], needs: [a]"), dryRun: false, actor: system });
    const before = await call(rankings, { url: "/api/v1/environments/prod/rankings", params: { env: "prod" }, as: viewer });
    expect(before.json).toMatchObject({ snapshot: { number: 1 }, latest: { number: 2, status: "queued" } });
    expect(await drainAnalysisQueue("w")).toBe(1);
    const after = await call(rankings, { url: "/api/v1/environments/prod/rankings", params: { env: "prod" }, as: viewer });
    expect(after.json).toMatchObject({ snapshot: { number: 2 }, latest: null });
  });

  it("a newer snapshot supersedes a queued older one: one job per environment, the newest analysed, the older marked", async () => {
    const version = (n: number) => FILE.replace("tier: 3, team: shop", `tier: 3, team: shop, tags: [v${n}]`);
    for (const n of [3, 4, 5]) await pushInventory({ environment: "prod", format: "pinchpoint", body: version(n), dryRun: false, actor: system });
    // The queue's singleton key (the environment) kept one waiting job for three pushes.
    expect(await jobQueue().getQueueSize(QUEUES.analysis)).toBe(1);
    expect(await drainAnalysisQueue("w")).toBe(1);
    const runs = await db().sequelize.query<{ number: number; status: string }>(
      "SELECT s.number, a.status::text AS status FROM analysis_runs a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.number >= 3 ORDER BY s.number",
      { type: QueryTypes.SELECT },
    );
    expect(runs).toEqual([{ number: 3, status: "superseded" }, { number: 4, status: "superseded" }, { number: 5, status: "done" }]);
  });

  it("analyses one environment at a time: a job for a busy environment waits for the run in hand, which sends the next", async () => {
    const version = (n: number) => FILE.replace("tier: 3, team: shop", `tier: 3, team: shop, tags: [v${n}]`);
    await pushInventory({ environment: "prod", format: "pinchpoint", body: version(6), dryRun: false, actor: system });
    const first = (await claimNextJob("w1")) as ClaimedRun;
    await pushInventory({ environment: "prod", format: "pinchpoint", body: version(7), dryRun: false, actor: system });
    // The new job finds the environment busy and ends; nothing else is claimed meanwhile.
    expect(await claimNextJob("w2")).toBeNull();
    expect(await runJob(first, "w1")).toBe("done");
    // Finishing, the first run saw snapshot 7 queued and sent it a job.
    const second = (await claimNextJob("w2")) as ClaimedRun;
    expect(second).not.toBeNull();
    expect(await runJob(second, "w2")).toBe("done");
    const [latest] = await db().sequelize.query<{ number: number; status: string }>(
      "SELECT s.number, a.status::text AS status FROM analysis_runs a JOIN snapshots s ON s.id = a.snapshot_id ORDER BY s.number DESC LIMIT 1",
      { type: QueryTypes.SELECT },
    );
    expect(latest).toEqual({ number: 7, status: "done" });
  });

  it("retries a failing analysis with the queue's backoff and fails it for good after three attempts", async () => {
    await pushInventory({ environment: "prod", format: "pinchpoint", body: FILE.replace("tier: 3, team: shop", "tier: 3, team: shop, tags: [broken]"), dryRun: false, actor: system });
    // Content the analysis cannot read: every attempt throws.
    await db().sequelize.query(`UPDATE snapshots SET content = '{"components": null, "dependencies": null}'::jsonb WHERE number = 8`);
    vi.spyOn(console, "error").mockImplementation(() => undefined);
    const outcomes: string[] = [];
    for (let attempt = 1; attempt <= 3; attempt++) {
      const run = await until(() => claimNextJob("w"));
      expect(run.attempts).toBe(attempt);
      const job = await jobQueue().getJobById(QUEUES.analysis, run.job_id, { includeArchive: false });
      expect(job).toMatchObject({ retryCount: attempt - 1, retryLimit: 2, retryBackoff: true });
      outcomes.push(await runJob(run, "w"));
      if (attempt < 3) {
        // Not due again before its backoff: pg-boss waits retryDelay·2^n/2·(1 + random) seconds.
        const retry = await jobQueue().getJobById(QUEUES.analysis, run.job_id, { includeArchive: false });
        expect(retry?.state).toBe("retry");
        expect(retry!.startAfter.getTime()).toBeGreaterThan(Date.now());
        expect(await claimNextJob("w")).toBeNull();
      }
    }
    expect(outcomes).toEqual(["retrying", "retrying", "failed"]);
    const [run] = await db().sequelize.query<{ status: string; error: string }>(
      "SELECT a.status::text AS status, a.error FROM analysis_runs a JOIN snapshots s ON s.id = a.snapshot_id WHERE s.number = 8",
      { type: QueryTypes.SELECT },
    );
    expect(run?.status).toBe("failed");
    expect(run?.error).toBeTruthy();
    vi.restoreAllMocks();
  });
});
