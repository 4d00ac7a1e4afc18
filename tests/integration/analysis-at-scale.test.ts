// Long analyses never stall the queue, and what the API says about ranks and convergence.
// - A 100,000-component chain and a deep estate with a long dependency cycle are analysed in one
//   attempt while a second worker keeps trying to claim the job: the heartbeats (from the calling
//   thread, the analysis runs on its own) keep it from ever looking orphaned. The stale limit is cut
//   to 3 s so that a stall would show within the test. (The full 100,000-component estate with a
//   5,000-component cycle runs in `npm run bench`.)
// - Equal values share a rank in the API (DESIGN §10), the all-zero betweenness case included.
// - A measure that did not converge is null in the API with its reason, never a number.
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { GET as rankings } from "@/app/api/v1/environments/[env]/rankings/route";
import { GET as bootOrder } from "@/app/api/v1/environments/[env]/boot-order/route";
import { GET as component, PATCH as annotate } from "@/app/api/v1/environments/[env]/components/[key]/route";
import { db } from "@/models";
import { claimNextJob, drainAnalysisQueue, runJob } from "@/lib/jobs/analysis";
import { jobQueue, QUEUES } from "@/lib/data/job-queue";
import { pushInventory } from "@/lib/data/push";
import { stopAnalysisThread } from "@/lib/analysis/thread";
import type { AnalysisInput } from "@/lib/analysis/types";
import { generateGraph } from "@/scripts/bench/generate";
import { writeScaleSnapshot } from "@/scripts/bench/scale-snapshot";
import { call, createUser, type TestUser } from "../support/api";

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
let viewer: TestUser;

beforeAll(async () => {
  viewer = await createUser("viewer");
});
afterAll(() => stopAnalysisThread());

const snapshotOf = (slug: string, input: AnalysisInput) => writeScaleSnapshot({ slug, name: slug, input, actor: "test" });

/** Runs the queued job while a second worker tries to claim work every 250 ms; returns what that worker got. */
async function runContested(): Promise<{ outcome: string; stolen: number; attempts: number; status: string; thread: boolean }> {
  process.env.PINCHPOINT_ANALYSIS_STALE_S = "3";
  try {
    const job = await claimNextJob("scale-worker");
    expect(job).not.toBeNull();
    let stolen = 0;
    let running = true;
    const rival = (async () => {
      while (running) {
        if (await claimNextJob("rival-worker")) stolen++;
        await new Promise((r) => setTimeout(r, 250));
      }
    })();
    const outcome = await runJob(job!, "scale-worker");
    running = false;
    await rival;
    const [run] = await db().sequelize.query<{ attempts: number; status: string; thread: boolean }>(
      "SELECT attempts, status, (graph ->> 'thread')::boolean AS thread FROM analysis_runs WHERE id = :id",
      { type: QueryTypes.SELECT, replacements: { id: job!.id } },
    );
    return { outcome, stolen, ...run! };
  } finally {
    delete process.env.PINCHPOINT_ANALYSIS_STALE_S;
  }
}

describe("long analyses never stall the queue", () => {
  it("a 100,000-component chain: one attempt, never taken over, results stored", async () => {
    const n = 100_000;
    const input: AnalysisInput = {
      nodes: Array.from({ length: n }, (_, i) => ({ key: `c${i}`, tier: i === n - 1 ? 1 : 3, replicas: 1, zones: [], team: null })),
      edges: Array.from({ length: n - 1 }, (_, i) => ({ from: `c${i + 1}`, to: `c${i}`, strength: "hard" as const, group: null })),
    };
    const { snapshotId } = await snapshotOf("chain", input);
    const r = await runContested();
    expect(r).toEqual({ outcome: "done", stolen: 0, attempts: 1, status: "done", thread: true });
    // The deepest need takes everything else down; the chain's own eigenvector converged.
    const [first] = await db().sequelize.query<{ key: string; blast_down: number; eigenvector: number | null }>(
      "SELECT key, blast_down, eigenvector FROM component_metrics WHERE snapshot_id = :snapshotId AND rank_blast = 1",
      { type: QueryTypes.SELECT, replacements: { snapshotId } },
    );
    expect(first).toMatchObject({ key: "c0", blast_down: n - 1 });
    expect(first!.eigenvector).not.toBeNull();
  }, 180_000);

  it("a 30,000-component estate with a 1,500-component cycle: one attempt, never taken over", async () => {
    await snapshotOf("ring", generateGraph({ n: 30_000, seed: 42, ring: 1500 }));
    expect(await runContested()).toEqual({ outcome: "done", stolen: 0, attempts: 1, status: "done", thread: true });
  }, 180_000);

  it("an analysis past its timeout is stopped, its thread ended, and the queue tries it again", async () => {
    // The job's expiry is the timeout (pg-boss fails a job active past it); the runner stops 30 s before.
    process.env.PINCHPOINT_ANALYSIS_TIMEOUT_S = "31";
    try {
      await snapshotOf("slow", generateGraph({ n: 30_000, seed: 7, ring: 1500 }));
      const run = await claimNextJob("timed-worker");
      // pg-boss reads its expiry back as PostgreSQL's numeric (a string).
      expect(Number((await jobQueue().getJobById(QUEUES.analysis, run!.job_id, { includeArchive: false }))?.expireInSeconds)).toBe(31);
      vi.spyOn(console, "error").mockImplementation(() => undefined);
      expect(await runJob(run!, "timed-worker")).toBe("retrying");
      const [row] = await db().sequelize.query<{ status: string; error: string }>("SELECT status::text AS status, error FROM analysis_runs WHERE id = :id", {
        type: QueryTypes.SELECT,
        replacements: { id: run!.id },
      });
      expect(row).toMatchObject({ status: "queued", error: expect.stringContaining("took longer than 1 s") });
      expect(await jobQueue().getJobById(QUEUES.analysis, run!.job_id, { includeArchive: false })).toMatchObject({ state: "retry" });
    } finally {
      vi.restoreAllMocks();
      delete process.env.PINCHPOINT_ANALYSIS_TIMEOUT_S;
      // Leave nothing queued for the tests below.
      await db().sequelize.query("UPDATE analysis_runs SET status = 'failed' WHERE status = 'queued'");
      await jobQueue().purgeQueue(QUEUES.analysis);
    }
  }, 120_000);
});

describe("ranks with ties and withheld measures in the API", () => {
  it("every betweenness 0: all components share rank 1, and the API says how many share it", async () => {
    // hub needs four leaves: no component lies between two others.
    const file = `pinchpoint: 1
source: star
components:
  - { key: hub, kind: service, needs: [a, b, c, d] }
  - { key: a, kind: service }
  - { key: b, kind: service }
  - { key: c, kind: service }
  - { key: d, kind: service }
`;
    await pushInventory({ environment: "star", format: "pinchpoint", body: file, dryRun: false, actor: system });
    await drainAnalysisQueue("w");
    const res = await call(rankings, { url: "/api/v1/environments/star/rankings", params: { env: "star" }, as: viewer });
    const body = res.json as { rankBy: string; items: Array<{ key: string; rank: number; tied: number; position: { rank: number; tied: number } }> };
    expect(body.rankBy).toBe("betweenness");
    expect(body.items.map((i) => [i.rank, i.tied])).toEqual(Array(5).fill([1, 5]));
    // By blast radius: each leaf takes the hub down (rank 1, four share it), the hub nothing (rank 5).
    const byBlast = await call(rankings, { url: "/api/v1/environments/star/rankings?sort=blastDown", params: { env: "star" }, as: viewer });
    const positions = (byBlast.json as typeof body).items.map((i) => [i.key, i.position.rank, i.position.tied]);
    expect(positions).toEqual([["a", 1, 4], ["b", 1, 4], ["c", 1, 4], ["d", 1, 4], ["hub", 5, 1]]);
  });

  it("eigenvector centrality that did not converge is null with its reason, in the rankings and on the component page", async () => {
    // A ladder: its top eigenvalues are close together; one Lanczos cycle and no fill-in allowed
    // for the factorisation cannot settle it (with the defaults it converges).
    const rails = 300;
    const lines = Array.from({ length: rails }, (_, i) => {
      const needs = [`r${i + 1}`, `s${i}`].filter((k) => !k.endsWith(`${rails}`) || k.startsWith("s"));
      return `  - { key: r${i}, kind: service, needs: [${i + 1 < rails ? needs.join(", ") : `s${i}`}] }\n  - { key: s${i}, kind: service${i + 1 < rails ? `, needs: [s${i + 1}]` : ""} }`;
    });
    await pushInventory({ environment: "ladder", format: "pinchpoint", body: `pinchpoint: 1\nsource: ladder\ncomponents:\n${lines.join("\n")}\n`, dryRun: false, actor: system });
    await drainAnalysisQueue("w", { eigenvector: { lanczosCycles: 1, fillLimit: 0 } });
    const res = await call(rankings, { url: "/api/v1/environments/ladder/rankings?sort=eigenvector", params: { env: "ladder" }, as: viewer });
    const body = res.json as { analysis: { measures: { eigenvector: { converged: boolean; reason: string } } }; items: Array<{ eigenvector: number | null; position: { rank: number | null } }> };
    expect(body.analysis.measures.eigenvector.converged).toBe(false);
    expect(body.analysis.measures.eigenvector.reason).toMatch(/^did not converge/);
    expect(body.items.every((i) => i.eigenvector === null && i.position.rank === null)).toBe(true);
    const page = await call(component, { url: "/api/v1/environments/ladder/components/r0", params: { env: "ladder", key: "r0" }, as: viewer });
    expect(page.json).toMatchObject({ metrics: { eigenvector: null }, measures: { eigenvector: { converged: false } } });
  });
});

describe("conditional GET on the rankings (RFC 9110 §13.1.2 If-None-Match)", () => {
  it("a client holding the page gets 304; a new owner changes the ETag", async () => {
    const first = await call(rankings, { url: "/api/v1/environments/star/rankings?limit=2", params: { env: "star" }, as: viewer });
    const etag = first.headers.get("etag")!;
    expect(etag).toMatch(/^W\/"/);
    expect(first.headers.get("cache-control")).toBe("private, no-cache");
    const again = await call(rankings, { url: "/api/v1/environments/star/rankings?limit=2", params: { env: "star" }, as: viewer, headers: { "if-none-match": etag } });
    expect(again.status).toBe(304);
    const other = await call(rankings, { url: "/api/v1/environments/star/rankings?limit=3", params: { env: "star" }, as: viewer, headers: { "if-none-match": etag } });
    expect(other.status).toBe(200);
    const architect = await createUser("architect");
    const noted = await call(annotate, { url: "/api/v1/environments/star/components/hub", method: "PATCH", params: { env: "star", key: "hub" }, as: architect, body: { notes: "owned by nobody yet" } });
    expect(noted.status).toBe(200);
    const changed = await call(rankings, { url: "/api/v1/environments/star/rankings?limit=2", params: { env: "star" }, as: viewer, headers: { "if-none-match": etag } });
    expect(changed.status).toBe(200);
    expect(changed.headers.get("etag")).not.toBe(etag);
  });
});

describe("the cold-start runbook's data", () => {
  it("includes start-up-only needs (graph.boot): they order the stages and are listed per component", async () => {
    const file = `pinchpoint: 1
source: boot
components:
  - { key: web, kind: service, tier: 1, needs: [orders] }
  - { key: orders, kind: service, needs: [db, { key: schema-job, strength: startup }] }
  - { key: schema-job, kind: job, needs: [db] }
  - { key: db, kind: datastore }
`;
    await pushInventory({ environment: "boot", format: "pinchpoint", body: file, dryRun: false, actor: system });
    await drainAnalysisQueue("w");
    const res = await call(bootOrder, { url: "/api/v1/environments/boot/boot-order?components=true", params: { env: "boot" }, as: viewer });
    // By hand: db needs nothing; schema-job needs db; orders waits for the job at start; web needs orders.
    expect(res.json).toMatchObject({ stages: [["db"], ["schema-job"], ["orders"], ["web"]], cycles: [], startupNeeds: { orders: ["schema-job"] } });
  });
});
