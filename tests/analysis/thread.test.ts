// The analysis on its warm worker thread gives exactly what analyse() gives on the calling thread,
// reports progress across the thread boundary, and reuses the thread for the next run.
import { afterAll, describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { analyseInThread, stopAnalysisThread } from "@/lib/analysis/thread";
import { generateGraph } from "@/scripts/bench/generate";

afterAll(() => stopAnalysisThread());

describe("analysis thread", () => {
  const input = generateGraph({ n: 3000, seed: 9, ring: 40 });

  it("runs on the thread with the same result and progress up to done", async () => {
    const phases: string[] = [];
    const r = await analyseInThread(input, { seed: 3 }, (_, phase) => phases.push(phase));
    expect(r.thread).toBe(true);
    const local = await analyse(input, { seed: 3 });
    const { thread, timings, ...rest } = r;
    void thread;
    void timings;
    expect({ ...rest, graph: { ...rest.graph, betweennessMs: 0 } }).toEqual({ nodes: local.nodes, graph: { ...local.graph, betweennessMs: 0 } });
    expect(phases).toContain("blast-radius");
    expect(phases.at(-1)).toBe("done");
  });

  it("answers the next run on the same thread while this thread stays free", async () => {
    let turns = 0;
    const tick = setInterval(() => turns++, 0);
    const r = await analyseInThread(generateGraph({ n: 2000, seed: 10 }));
    clearInterval(tick);
    expect(r.thread).toBe(true);
    expect(r.nodes).toHaveLength(2000);
    expect(turns).toBeGreaterThan(0);
  });
});
