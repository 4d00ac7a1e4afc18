// Benchmark of the analysis engine (npm run bench). Speed is measured here, never in tests.
//   npx tsx --conditions=react-server scripts/bench.ts                     all sections
//   npx tsx --conditions=react-server scripts/bench.ts --only measures     one section (map | push | impact | kubernetes | compose | traces | responsiveness | incidents | measures | scale | http | igraph)
//   npx tsx --conditions=react-server scripts/bench.ts --compare-igraph    also time python3-igraph on the 20k graph
//   npx tsx --conditions=react-server scripts/bench.ts --edge-list FILE    one JSON line for a `from to` edge list
//   --runs N                                     calls per side in the igraph comparison (default 5, alternating)
import { spawn } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analyse } from "../lib/analysis";
import { betweennessParallel, stopBetweennessPool, warmBetweennessPool } from "../lib/analysis/betweenness";
import { buildGraph, type CompactGraph } from "../lib/analysis/graph";
import { pagerank } from "../lib/analysis/pagerank";
import type { AnalysisInput } from "../lib/analysis/types";
import { generateGraph, toEdgeList } from "./bench/generate";

const PYTHON = process.env.PINCHPOINT_PYTHON ?? "/usr/bin/python3";
const args = process.argv.slice(2);
const flag = (name: string): boolean => args.includes(name);
const value = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};

const ms = (t0: number): number => Math.round((performance.now() - t0) * 10) / 10;
const mib = (bytes: number): string => `${(bytes / 1048576).toFixed(0)} MiB`;

interface Section {
  name: string;
  /** Run when no --only is given (otherwise only on request). */
  byDefault: boolean;
  run: () => Promise<void>;
}

async function timeAll(label: string, input: AnalysisInput): Promise<void> {
  const t0 = performance.now();
  const graph = buildGraph(input);
  const build = ms(t0);
  const t1 = performance.now();
  const r = await analyse(graph);
  const total = ms(t1);
  const parts = Object.entries(r.timings)
    .filter(([k]) => k !== "graph")
    .map(([k, v]) => `${k} ${Math.round(v ?? 0)}`)
    .join(", ");
  const bc = r.graph.exact ? "exact" : `sampled ${r.graph.sampleSize}`;
  console.log(
    `${label.padEnd(5)} n=${graph.n} m=${graph.edgeCount} build ${build} ms, all measures ${total} ms ` +
      `(betweenness ${bc}, ${r.graph.betweennessThreads} thread(s); ${parts} ms)`,
  );
}

async function benchPush(n: number): Promise<void> {
  const { inventoryYaml, withBenchDatabase } = await import("./bench/push");
  const input = generateGraph({ n, seed: 42 });
  const body = inventoryYaml(input, "bench-repo");
  await withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../models");
    const { migrateToLatest } = await import("../models/migrate");
    const { pushInventory } = await import("../lib/data/push");
    const { drainAnalysisQueue } = await import("../lib/jobs/analysis");
    const { importInventory } = await import("../importers");
    const { closeParsePool } = await import("../importers/off-thread");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    const t0 = performance.now();
    const parsed = importInventory({ format: "pinchpoint", body, contentType: "application/yaml" });
    const parseMs = ms(t0);
    if (!parsed.ok) throw new Error(`bench inventory refused: ${JSON.stringify(parsed.issues.slice(0, 3))}`);
    const t1 = performance.now();
    const first = await pushInventory({ environment: "bench", format: "pinchpoint", body, contentType: "application/yaml", dryRun: false, actor });
    const pushMs = ms(t1);
    const t2 = performance.now();
    await drainAnalysisQueue();
    const analyseMs = ms(t2);
    const t3 = performance.now();
    const again = await pushInventory({ environment: "bench", format: "pinchpoint", body, contentType: "application/yaml", dryRun: false, actor });
    const againMs = ms(t3);
    console.log(
      `push ${n / 1000}k components, ${input.edges.length} needs, ${(body.length / 1048576).toFixed(1)} MiB YAML: ` +
        `parse+validate ${parseMs} ms; push to stored snapshot #${first.snapshot?.number} ${pushMs} ms; ` +
        `analysis to ranked results ${analyseMs} ms; push → ranked ${Math.round(pushMs + analyseMs)} ms; ` +
        `identical re-push ${againMs} ms (changed: ${again.changed})`,
    );
    await Promise.all([closeDb(), closeParsePool()]);
  });
}

async function benchResponsiveness(): Promise<void> {
  const { inventoryYaml, withBenchDatabase } = await import("./bench/push");
  const { badYamlFiles, measureWhilePushing } = await import("./bench/responsiveness");
  await withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    process.env.NEXTAUTH_SECRET ??= "bench-secret";
    const { db, closeDb } = await import("../models");
    const { migrateToLatest } = await import("../models/migrate");
    const { pushInventory } = await import("../lib/data/push");
    const { createToken } = await import("../lib/data/tokens");
    const { closeParsePool } = await import("../importers/off-thread");
    const { POST: push } = await import("../app/api/v1/environments/[env]/inventory/route");
    // GET /api/health: three small queries, no sign-in; what a load balancer asks every few seconds.
    const { GET: get } = await import("../app/api/health/route");
    await migrateToLatest(db().sequelize);
    // A fresh pool: the first one read PostgreSQL's type list before the migrations made the enums.
    await closeDb();
    const admin = await db().models.User.create({ email: "bench@bench.example", name: "bench", role: "admin", passwordHash: null, oidcSubject: null });
    const { token } = await createToken({ name: "bench", scopes: ["inventory:write", "read"], environmentId: null, source: null, createdBy: admin.id });
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    await pushInventory({ environment: "bench", format: "pinchpoint", body: inventoryYaml(generateGraph({ n: 2000, seed: 42 }), "bench-repo"), contentType: "application/yaml", dryRun: false, actor });
    const line = (label: string, r: Awaited<ReturnType<typeof measureWhilePushing>>) =>
      console.log(
        `${label.padEnd(58)} push ${r.push.status} after ${Math.round(r.push.ms)} ms; GET every 50 ms: ${r.gets} answered, ` +
          `p50 ${Math.round(r.p50)} ms, p95 ${Math.round(r.p95)} ms, max ${Math.round(r.max)} ms`,
      );
    const files = badYamlFiles();
    for (const f of files) {
      line(`${f.name} (${(f.body.length / 1048576).toFixed(1)} MiB), worker threads`, await measureWhilePushing({ push, get, token, body: f.body }));
    }
    if (!flag("--skip-baseline")) {
      // The same push parsed on the request thread, as before: what the worker threads are for.
      process.env.PINCHPOINT_PARSE_THREADS = "0";
      const f = files[0]!;
      line(`${f.name}, on the request thread (before)`, await measureWhilePushing({ push, get, token, body: f.body }));
      delete process.env.PINCHPOINT_PARSE_THREADS;
    }
    await closeParsePool();
    await closeDb();
  });
}

/** A generated cluster dump (tests/fixtures/generate.ts) through the push path: the kubernetes format's promise is under 5 s. */
async function benchKubernetes(workloads: number, services: number): Promise<void> {
  const { withBenchDatabase } = await import("./bench/push");
  const { generateKubernetesDump } = await import("../tests/fixtures/generate");
  const body = generateKubernetesDump(workloads, services);
  await withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../models");
    const { migrateToLatest } = await import("../models/migrate");
    const { pushInventory } = await import("../lib/data/push");
    const { importInventory } = await import("../importers");
    const { closeParsePool } = await import("../importers/off-thread");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    const push = (dryRun: boolean) => pushInventory({ environment: "bench-k8s", format: "kubernetes", source: "cluster-dump", body, contentType: "application/yaml", dryRun, actor });
    const t0 = performance.now();
    const parsed = importInventory({ format: "kubernetes", body, source: "cluster-dump" });
    const parseMs = ms(t0);
    if (!parsed.ok) throw new Error(`bench dump refused: ${JSON.stringify(parsed.issues.slice(0, 3))}`);
    const needs = parsed.inventory.components.reduce((n, c) => n + c.needs.length, 0);
    const t1 = performance.now();
    const first = await push(false);
    const pushMs = ms(t1);
    const t2 = performance.now();
    const preview = await push(true);
    const dryMs = ms(t2);
    const t3 = performance.now();
    const again = await push(false);
    const againMs = ms(t3);
    console.log(
      `kubernetes dump ${workloads} workloads + ${services} Services (${(body.length / 1048576).toFixed(1)} MiB, one List), ${needs} inferred needs: ` +
        `parse+infer ${parseMs} ms; push to stored snapshot #${first.snapshot?.number} ${pushMs} ms (${pushMs < 5000 ? "under" : "OVER"} 5 s); ` +
        `dry run with ${preview.inferred?.total ?? 0} inferred reasons ${dryMs} ms; identical re-push ${againMs} ms (changed: ${again.changed}, snapshot: ${again.snapshot?.number ?? "none"})`,
    );
    await Promise.all([closeDb(), closeParsePool()]);
  });
}

async function benchCompose(n: number): Promise<void> {
  const { withBenchDatabase } = await import("./bench/push");
  const { composeProject } = await import("./bench/compose");
  const project = composeProject({ n });
  await withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../models");
    const { migrateToLatest } = await import("../models/migrate");
    const { pushInventory } = await import("../lib/data/push");
    const { importInventory } = await import("../importers");
    const { closeParsePool } = await import("../importers/off-thread");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    // A server that has taken a push before: one dry run into another environment warms the code paths.
    await pushInventory({ environment: "bench-warm-up", format: "compose", source: "bench-compose", body: project.text, contentType: "application/yaml", dryRun: true, actor });
    const t0 = performance.now();
    const parsed = importInventory({ format: "compose", body: project.text, source: "bench-compose", contentType: "application/yaml" });
    const parseMs = ms(t0);
    if (!parsed.ok) throw new Error(`bench Compose project refused: ${JSON.stringify(parsed.issues.slice(0, 3))}`);
    const needs = parsed.inventory.components.reduce((sum, c) => sum + c.needs.length, 0);
    const inferred = parsed.inventory.components.reduce((sum, c) => sum + c.needs.filter((x) => x.provenance?.includes("inferred")).length, 0);
    const push = () => pushInventory({ environment: "bench-compose", format: "compose", source: "bench-compose", body: project.text, contentType: "application/yaml", dryRun: false, actor });
    const t1 = performance.now();
    const first = await push();
    const pushMs = ms(t1);
    const t2 = performance.now();
    const again = await push();
    const againMs = ms(t2);
    console.log(
      `compose ${n} services, ${needs} needs (${inferred} inferred from URLs in environment), ${(project.text.length / 1048576).toFixed(2)} MiB: ` +
        `parse+merge+infer ${parseMs} ms; parse and push to stored snapshot #${first.snapshot?.number} ${pushMs} ms (target < 3000 ms); ` +
        `identical re-push ${againMs} ms (changed: ${again.changed})`,
    );
    await Promise.all([closeDb(), closeParsePool()]);
  });
}

/**
 * Impact of a change on a 20,000-component estate (DESIGN §10): a team's file of 200 components,
 * 50 of them changed, dry-run with impact=true through the API's push path; the promise is under
 * 5 s. Timed with the worker's stored analysis of the current snapshot (what a CI gate meets) and
 * with it stale (the current graph analysed again in the request), then the estate as one file.
 */
async function benchImpact(n: number): Promise<void> {
  const { withBenchDatabase, inventoryYaml } = await import("./bench/push");
  const { impactBenchFiles } = await import("./bench/impact");
  const input = generateGraph({ n, seed: 42 });
  const files = impactBenchFiles(input);
  await withBenchDatabase(async (url) => {
    process.env.DATABASE_URL = url;
    const { db, closeDb } = await import("../models");
    const { migrateToLatest } = await import("../models/migrate");
    const { pushInventory } = await import("../lib/data/push");
    const { drainAnalysisQueue } = await import("../lib/jobs/analysis");
    const { impactMarkdown } = await import("../lib/impact/markdown");
    const { impactSarif } = await import("../lib/impact/sarif");
    await migrateToLatest(db().sequelize);
    const actor = { type: "system" as const, label: "bench", canCreateEnvironments: true as const };
    const push = (environment: string, body: string, dryRun: boolean, impact = false) =>
      pushInventory({ environment, format: "pinchpoint", body, contentType: "application/yaml", dryRun, impact, actor });
    await push("bench-impact", files.platform, false);
    await push("bench-impact", files.team, false);
    await drainAnalysisQueue();
    const line = async (label: string, environment: string, body: string) => {
      const t0 = performance.now();
      const result = await push(environment, body, true, true);
      const total = ms(t0);
      const r = result.impact!;
      const t1 = performance.now();
      impactMarkdown(r, { file: "pinchpoint.yaml" });
      impactSarif(r, { file: "pinchpoint.yaml", policiesUrl: "http://127.0.0.1:3000/environments/bench-impact/policies" });
      const render = ms(t1);
      const parts = Object.entries(r.timings).map(([k, v]) => `${k} ${v}`).join(", ");
      console.log(
        `${label}: dry run with impact ${total} ms (${total < 5000 ? "under" : "OVER"} 5 s; analysis ${r.basis.analysis}; ${parts} ms); ` +
          `Markdown + SARIF ${render} ms; ${r.summary.changedComponents} components changed, ${r.summary.moved} moved, ` +
          `${r.summary.singlePointNeeds} tier-1 needs on single points, ${r.summary.tier1BlastChanged} tier-1 blast radii changed, ` +
          `${r.summary.dominatorEntriesChanged} of ${r.dominators.entriesTotal} entry points' dominators changed (${r.dominators.entriesChecked} checked)`,
      );
    };
    console.log(`estate: ${n} components, ${input.edges.length} needs; the change touches ${files.touched} of the team's 200 components`);
    const t0 = performance.now();
    await push("bench-impact", files.changed, true);
    console.log(`team file, the same dry run without impact (for comparison): ${ms(t0)} ms`);
    for (let i = 1; i <= 3; i++) await line(`team file, stored analysis, run ${i}`, "bench-impact", files.changed);
    // Stale: the newest snapshot's analysis queued again, as after a change of weights.
    await db().sequelize.query("UPDATE analysis_runs SET status = 'queued'");
    await line("team file, stored analysis stale (both graphs analysed in the request)", "bench-impact", files.changed);
    // The stale run is not needed again; analyse only the one-file estate.
    await db().sequelize.query("DELETE FROM analysis_runs WHERE status = 'queued'");
    await push("bench-impact-one", inventoryYaml(input, "estate-repo", "bench-impact-one"), false);
    await drainAnalysisQueue();
    const t1 = performance.now();
    await push("bench-impact-one", files.wholeChanged, true);
    console.log(`whole estate as one file, the same dry run without impact (for comparison): ${ms(t1)} ms`);
    await line(`whole estate as one ${(files.wholeChanged.length / 1048576).toFixed(1)} MiB file (parsed with positions), stored analysis`, "bench-impact-one", files.wholeChanged);
    await closeDb();
  });
}

const sections: Section[] = [
  {
    name: "map",
    byDefault: true,
    run: async () => {
      console.log("# the map at estate scale: the worker's layouts (ELK in Node), views composed from them, a 2-hop focus");
      const { benchMap } = await import("./bench/map");
      await benchMap([2_000, 10_000]);
    },
  },
  {
    name: "push",
    byDefault: true,
    run: async () => {
      console.log("# push of a seeded inventory through the API's code path into a throwaway PostgreSQL database");
      await benchPush(20_000);
    },
  },
  {
    name: "impact",
    byDefault: true,
    run: async () => {
      console.log("# impact of a change (impact=true dry run) through the API's push path, throwaway PostgreSQL database");
      await benchImpact(20_000);
    },
  },
  {
    name: "kubernetes",
    byDefault: true,
    run: async () => {
      console.log("# kubernetes format: a generated cluster dump through the API's push path into a throwaway PostgreSQL database");
      await benchKubernetes(2_000, 3_000);
    },
  },
  {
    name: "compose",
    byDefault: true,
    run: async () => {
      console.log("# a generated Compose project (scripts/bench/compose.ts) parsed and pushed through the API's code path");
      await benchCompose(3000);
    },
  },
  {
    name: "traces",
    byDefault: true,
    run: async () => {
      console.log("# traces through the receiver and as a streamed JSON Lines file, route handlers behind node:http, into a throwaway PostgreSQL database");
      const { withBenchDatabase } = await import("./bench/push");
      const { benchTraces } = await import("./bench/traces");
      await withBenchDatabase(benchTraces);
    },
  },
  {
    name: "responsiveness",
    byDefault: true,
    run: async () => {
      console.log(`# a GET's latency in the same process while a bad 20 MB push is parsed (budget ${process.env.PINCHPOINT_PARSE_BUDGET_MS ?? 30000} ms; --skip-baseline leaves out the request-thread run)`);
      await benchResponsiveness();
    },
  },
  {
    name: "incidents",
    byDefault: true,
    run: async () => {
      console.log("# probable origin of an incident: 200 firing components on a generated 20,000-component estate (promise: under 1 s)");
      const { benchIncidents } = await import("./bench/incidents");
      benchIncidents(20_000, 200);
    },
  },
  {
    name: "measures",
    byDefault: true,
    run: async () => {
      console.log("# per-measure times, seeded preferential-attachment graphs, out-degree 3, 5 cycles closed");
      for (const n of [1000, 5000, 20000]) await timeAll(`${n / 1000}k`, generateGraph({ n, seed: 42 }));
      const before = process.memoryUsage();
      await timeAll("100k", generateGraph({ n: 100_000, seed: 42 }));
      const after = process.memoryUsage();
      const peak = process.resourceUsage().maxRSS * 1024;
      console.log(
        `100k memory: peak rss ${mib(peak)}, rss ${mib(after.rss)}, heap used ${mib(after.heapUsed)} ` +
          `(before 100k: rss ${mib(before.rss)}), array buffers ${mib(after.arrayBuffers)}`,
      );
    },
  },
  {
    name: "scale",
    byDefault: true,
    run: async () => {
      console.log("# long analyses through the job code, a rival worker claiming every 0.5 s, stale limit 10 s (analysis on its own thread; the heartbeat keeps it)");
      const { benchScale } = await import("./bench/scale");
      for (const r of await benchScale()) {
        console.log(
          `${r.label}: ${r.outcome} in ${r.ms} ms, ${r.attempts} attempt(s), taken over ${r.takenOver} time(s); dominators from ${r.dominators}; phases ${r.phases} ms`,
        );
      }
    },
  },
  {
    name: "components-list",
    byDefault: true,
    run: async () => {
      console.log("# the components list on a generated 45,000-component environment: its API's first page, and the screen in headless Chromium against the production build (goal: rows on screen in under 1 s)");
      const { benchComponentsList } = await import("./bench/components-list");
      const r = await benchComponentsList(45_000);
      console.log(`components-list: ${r.n / 1000}k-component environment pushed in ${r.pushMs} ms`);
      console.log(`components-list API, first page of 50 (${(r.api.bytes / 1024).toFixed(1)} KiB): first call ${r.api.firstMs} ms, median of 10 ${r.api.medianMs} ms`);
      console.log(
        `components-list screen: first visit FCP ${r.screen.firstFcpMs} ms, rows ${r.screen.firstRowsMs} ms; median of 5 FCP ${r.screen.medianFcpMs} ms, ` +
          `rows ${r.screen.medianRowsMs} ms (${r.screen.rows} rows; goal rows < 1000 ms: ${r.screen.medianRowsMs < 1000 ? "met" : "NOT met"})`,
      );
    },
  },
  {
    name: "http",
    byDefault: true,
    run: async () => {
      console.log("# HTTP under load: the production build served as npm start serves it, autocannon with 50 concurrent clients for 10 s each, a signed-in viewer");
      const { benchHttp } = await import("./bench/http");
      for (const r of await benchHttp({ n: 20_000, seconds: 10 })) {
        const goal = r.label.includes("1000") ? 300 : 100;
        console.log(
          `${r.label}: ${r.requests} requests, ${r.perSecond}/s; p50 ${r.p50} ms, p95 ${r.p95} ms, p99 ${r.p99} ms ` +
            `(goal p95 < ${goal} ms: ${r.p95 < goal ? "met" : "NOT met"}); non-2xx ${r.non2xx}, errors ${r.errors}`,
        );
      }
    },
  },
  {
    name: "igraph",
    byDefault: true,
    run: async () => {
      await compareIgraph("20k", generateGraph({ n: 20_000, seed: 42 }));
      await compareIgraph("20k sparser (out-degree 2)", generateGraph({ n: 20_000, seed: 43, outDegree: 2 }));
      await compareIgraph("20k + one 3,300-component cycle", generateGraph({ n: 20_000, seed: 42, ring: 3300 }));
    },
  },
];

const RUNS = Number(value("--runs") ?? 5);

/** A python3-igraph process holding the graph, timing one betweenness call per request. */
function igraphServer(file: string) {
  const child = spawn(PYTHON, [join(__dirname, "bench", "igraph_betweenness.py"), file, "--serve"], { stdio: ["pipe", "pipe", "inherit"] });
  const lines: string[] = [];
  const waiting: Array<(line: string) => void> = [];
  let buffer = "";
  child.stdout.on("data", (chunk: Buffer) => {
    buffer += chunk.toString("utf8");
    for (let i = buffer.indexOf("\n"); i >= 0; i = buffer.indexOf("\n")) {
      const line = buffer.slice(0, i);
      buffer = buffer.slice(i + 1);
      const w = waiting.shift();
      if (w) w(line);
      else lines.push(line);
    }
  });
  const next = (): Promise<string> => (lines.length ? Promise.resolve(lines.shift()!) : new Promise((r) => waiting.push(r)));
  return {
    hello: async () => JSON.parse(await next()) as { igraph: string; nodes: number; edges: number },
    run: async () => {
      child.stdin.write("run\n");
      return (JSON.parse(await next()) as { ms: number }).ms;
    },
    close: () => {
      child.stdin.end();
    },
  };
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function compareIgraph(label: string, input: AnalysisInput): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), "pinchpoint-bench-"));
  writeFileSync(join(dir, "edges.txt"), toEdgeList(input));
  const ig = igraphServer(join(dir, "edges.txt"));
  try {
    const graph = buildGraph(input);
    const ours: number[] = [];
    const theirs: number[] = [];
    const threads: number[] = [];
    // The analysis thread starts its betweenness pool (and compiles the kernel) when it starts
    // (lib/analysis/thread-entry.ts), so a job finds it warm; do the same here rather than time
    // thread start-up.
    await warmBetweennessPool();
    const info = await ig.hello();
    // Calls alternate between the two sides, so that both see the same load on a shared machine.
    for (let i = 0; i < RUNS; i++) {
      const t0 = performance.now();
      threads.push((await betweennessParallel(graph)).threadsUsed);
      ours.push(ms(t0));
      theirs.push(Math.round((await ig.run()) * 10) / 10);
    }
    console.log(`# exact directed betweenness, ${label}, same edge list (n=${graph.n}, m=${graph.edgeCount}; igraph n=${info.nodes}, m=${info.edges})`);
    console.log(`pinchpoint typed arrays:   ${ours.join(" / ")} ms (threads: ${threads.join(" / ")})`);
    console.log(`python3-igraph ${info.igraph} (C): ${theirs.join(" / ")} ms (load not timed)`);
    console.log(
      `pinchpoint / igraph: best ${(Math.min(...ours) / Math.min(...theirs)).toFixed(2)}, median ${(median(ours) / median(theirs)).toFixed(2)}, ` +
        `first call ${(ours[0]! / theirs[0]!).toFixed(2)} (${RUNS} alternating calls each)`,
    );
  } finally {
    ig.close();
    rmSync(dir, { recursive: true, force: true });
    await stopBetweennessPool();
  }
}

function readEdgeList(file: string): AnalysisInput {
  const keys = new Set<string>();
  const edges: AnalysisInput["edges"] = [];
  for (const line of readFileSync(file, "utf8").split("\n")) {
    const [from, to] = line.trim().split(/\s+/);
    if (!from || !to || from.startsWith("#")) continue;
    keys.add(from);
    keys.add(to);
    edges.push({ from, to, strength: "hard", group: null });
  }
  return { nodes: [...keys].map((key) => ({ key, tier: 3, replicas: 1, zones: [], team: null })), edges };
}

async function edgeListLine(file: string): Promise<void> {
  const graph: CompactGraph = buildGraph(readEdgeList(file));
  let t0 = performance.now();
  await betweennessParallel(graph);
  const betweennessMs = ms(t0);
  t0 = performance.now();
  pagerank(graph);
  const pagerankMs = ms(t0);
  t0 = performance.now();
  await analyse(graph);
  const allMs = ms(t0);
  console.log(
    JSON.stringify({ nodes: graph.n, edges: graph.edgeCount, betweenness_ms: betweennessMs, pagerank_ms: pagerankMs, all_measures_ms: allMs }),
  );
}

async function main(): Promise<void> {
  const edgeList = value("--edge-list");
  if (edgeList) return edgeListLine(edgeList);
  const only = value("--only");
  if (only && !sections.some((s) => s.name === only)) {
    throw new Error(`unknown section ${only}; sections: ${sections.map((s) => s.name).join(", ")}`);
  }
  for (const s of sections) {
    const wanted = only ? s.name === only : s.byDefault || (s.name === "igraph" && flag("--compare-igraph"));
    if (wanted) await s.run();
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
