// Long analyses through the job code (npm run bench -- --only scale): a 100,000-component chain and
// a 100,000-component estate with a 5,000-component dependency cycle, each claimed and run by the
// worker's own runJob while a rival worker keeps trying to claim the job, with the stale limit cut
// to 10 s so that a stalled heartbeat would show. Reports time, attempts and whether the job was
// ever taken over. The snapshot is written straight into the tables (pushing is the push section's
// business).
import { QueryTypes } from "sequelize";
import type { AnalysisInput } from "../../lib/analysis/types";
import { generateGraph } from "./generate";
import { withBenchDatabase } from "./push";

export interface ScaleResult {
  label: string;
  ms: number;
  outcome: string;
  attempts: number;
  takenOver: number;
  phases: string;
  dominators: string;
}

function chain(n: number): AnalysisInput {
  return {
    nodes: Array.from({ length: n }, (_, i) => ({ key: `c${i}`, tier: i === n - 1 ? 1 : 3, replicas: 1, zones: [], team: null })),
    edges: Array.from({ length: n - 1 }, (_, i) => ({ from: `c${i + 1}`, to: `c${i}`, strength: "hard" as const, group: null })),
  };
}

export async function benchScale(): Promise<ScaleResult[]> {
  return withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    process.env.PINCHPOINT_ANALYSIS_STALE_S = "10";
    const { db, closeDb } = await import("../../models");
    const { migrateToLatest } = await import("../../models/migrate");
    const { claimNextJob, runJob } = await import("../../lib/jobs/analysis");
    const { writeScaleSnapshot } = await import("./scale-snapshot");
    const { stopAnalysisThread } = await import("../../lib/analysis/thread");
    await migrateToLatest(db().sequelize);
    const results: ScaleResult[] = [];
    const cases: Array<[string, AnalysisInput]> = [
      ["100,000-component chain", chain(100_000)],
      ["100,000-component estate with a 5,000-component cycle", generateGraph({ n: 100_000, seed: 42, ring: 5000 })],
    ];
    for (const [i, [label, input]] of cases.entries()) {
      const { sequelize } = db();
      await writeScaleSnapshot({ slug: `scale-${i}`, name: label, input, actor: "bench" });
      const job = await claimNextJob("bench-worker");
      if (!job) throw new Error("no job to claim");
      let running = true;
      let takenOver = 0;
      const rival = (async () => {
        while (running) {
          if (await claimNextJob("rival-worker")) takenOver++;
          await new Promise((r) => setTimeout(r, 500));
        }
      })();
      const t0 = performance.now();
      const outcome = await runJob(job, "bench-worker");
      const ms = Math.round(performance.now() - t0);
      running = false;
      await rival;
      const [run] = await sequelize.query<{ attempts: number; timings: Record<string, number>; graph: { dominators?: { entries: number; complete: boolean; entriesAnalysed: number } } }>(
        "SELECT attempts, timings, graph FROM analysis_runs WHERE id = :id",
        { type: QueryTypes.SELECT, replacements: { id: job.id } },
      );
      const d = run?.graph.dominators;
      results.push({
        label,
        ms,
        outcome,
        attempts: run?.attempts ?? 0,
        takenOver,
        phases: Object.entries(run?.timings ?? {})
          .filter(([k]) => k !== "graph")
          .map(([k, v]) => `${k} ${Math.round(v)}`)
          .join(", "),
        dominators: d ? `${d.entriesAnalysed} of ${d.entries} entry points${d.complete ? "" : " (work limit)"}` : "?",
      });
    }
    await stopAnalysisThread();
    await closeDb();
    delete process.env.PINCHPOINT_ANALYSIS_STALE_S;
    return results;
  });
}
