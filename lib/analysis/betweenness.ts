// Betweenness centrality (Brandes, "A faster algorithm for betweenness centrality", J. Math. Sociol. 25, 2001):
// c_B(v) = Σ_{s≠v≠t} σ_st(v)/σ_st over the directed graph, normalised by (n−1)(n−2); beyond a size
// limit estimated from k uniformly sampled sources scaled by n/k (Brandes & Pich, "Centrality
// estimation in large networks", Int. J. Bifurcation and Chaos 17, 2007).
//
// Our own typed-array code rather than graphology-metrics: that package counts parallel edges as
// separate paths, keeps 32-bit path counts that wrap on layered graphs, and is ~8× slower on 20k
// components (measured on this project's bench). Path counts here are Float64 (exact up to 2^53 and
// then a faithful float, never a wrap).
import { availableParallelism } from "node:os";
import type { Worker as WorkerThread } from "node:worker_threads";
import type { CompactGraph } from "./graph";
import { sampleWithoutReplacement } from "./random";

export interface BetweennessOptions {
  /** Exact up to this many components, source-sampled beyond. */
  exactLimit?: number;
  /** Sources used when sampling. */
  sampleSize?: number;
  seed?: number;
  /** Explicit sources (distinct node indices), overriding the exact/sampled choice. */
  sources?: Int32Array;
  /** Threads in total (the calling thread counts as one); default 2, at most the cores available. */
  threads?: number;
  /** Below this many sources one thread always does it (default 2,000). */
  parallelThreshold?: number;
  /** Split over threads only when the single-thread estimate exceeds this (default 25 ms: the pool is warm). */
  minParallelMs?: number;
  onProgress?: (fraction: number) => void;
}

export interface BetweennessResult {
  /** Normalised by (n−1)(n−2), like NetworkX `betweenness_centrality(G, normalized=True)`. */
  values: Float64Array;
  exact: boolean;
  /** Number of sources used; equals n when exact. */
  sampleSize: number;
  threadsUsed: number;
}

const DEFAULT_EXACT_LIMIT = 50_000;
const DEFAULT_SAMPLE_SIZE = 2048;
const DEFAULT_SEED = 0x5eed;

/**
 * Adds the dependencies of every source in sources[start..end) to `bc`. Self-contained on
 * purpose (no imports, no closures): its source text is also what the worker threads run.
 * The forward BFS records each node's shortest-path successors in `succ` (grouped by BFS
 * position, starts in `succStart`), so the backward sweep reads only DAG edges, contiguously.
 */
function brandesAccumulate(
  offsets: Int32Array,
  targets: Int32Array,
  sources: Int32Array,
  start: number,
  end: number,
  bc: Float64Array,
  work: { dist: Int32Array; sigma: Float64Array; coef: Float64Array; order: Int32Array; succ: Int32Array; succStart: Int32Array },
): void {
  const { dist, sigma, coef, order, succ, succStart } = work;
  for (let si = start; si < end; si++) {
    const s = sources[si]!;
    dist[s] = 0;
    sigma[s] = 1;
    order[0] = s;
    let head = 0;
    let tail = 1;
    let k = 0;
    while (head < tail) {
      const v = order[head]!;
      succStart[head] = k;
      head++;
      const dv = dist[v]! + 1;
      const sv = sigma[v]!;
      const eEnd = offsets[v + 1]!;
      for (let e = offsets[v]!; e < eEnd; e++) {
        const w = targets[e]!;
        const dw = dist[w]!;
        if (dw < 0) {
          dist[w] = dv;
          sigma[w] = sv;
          order[tail++] = w;
          succ[k++] = w;
        } else if (dw === dv) {
          sigma[w] = sigma[w]! + sv;
          succ[k++] = w;
        }
      }
    }
    succStart[tail] = k;
    // Reverse BFS order visits successors first. coef[w] = (1 + δ(w)) / σ(w), so that
    // δ(v) = σ(v) · Σ_{w successor} coef[w] (Brandes 2001, Theorem 6) with one division per
    // node. Every successor's coef is written earlier in this sweep, so coef needs no reset.
    for (let i = tail - 1; i >= 0; i--) {
      const v = order[i]!;
      let acc = 0;
      const sEnd = succStart[i + 1]!;
      for (let e = succStart[i]!; e < sEnd; e++) acc += coef[succ[e]!]!;
      const delta = sigma[v]! * acc;
      if (v !== s) bc[v] = bc[v]! + delta;
      coef[v] = (1 + delta) / sigma[v]!;
      dist[v] = -1;
      sigma[v] = 0;
    }
  }
}

type Scratch = Parameters<typeof brandesAccumulate>[6];

function scratch(n: number, m: number): Scratch {
  return {
    dist: new Int32Array(n).fill(-1),
    sigma: new Float64Array(n),
    coef: new Float64Array(n),
    order: new Int32Array(n),
    succ: new Int32Array(m),
    succStart: new Int32Array(n + 1),
  };
}

function chooseSources(
  n: number,
  options: BetweennessOptions,
): { sources: Int32Array; exact: boolean } {
  if (options.sources) return { sources: options.sources, exact: options.sources.length === n };
  const limit = options.exactLimit ?? DEFAULT_EXACT_LIMIT;
  const k = options.sampleSize ?? DEFAULT_SAMPLE_SIZE;
  if (n <= limit || k >= n) {
    const all = new Int32Array(n);
    for (let i = 0; i < n; i++) all[i] = i;
    return { sources: all, exact: true };
  }
  return { sources: sampleWithoutReplacement(n, k, options.seed ?? DEFAULT_SEED), exact: false };
}

function normalise(raw: Float64Array, n: number, k: number): Float64Array {
  // NetworkX `_rescale` for directed graphs: 1/((n−1)(n−2)), times n/k when sampled.
  const scale = n > 2 ? (1 / ((n - 1) * (n - 2))) * (n / k) : 0;
  for (let v = 0; v < n; v++) raw[v] = raw[v]! * scale;
  return raw;
}

/** Single-threaded betweenness: the reference path, and what runs on small graphs. */
export function betweenness(graph: CompactGraph, options: BetweennessOptions = {}): BetweennessResult {
  const { n } = graph;
  const { sources, exact } = chooseSources(n, options);
  const bc = new Float64Array(n);
  const s = scratch(n, graph.out.targets.length);
  const chunk = 256;
  for (let i = 0; i < sources.length; i += chunk) {
    const end = Math.min(sources.length, i + chunk);
    brandesAccumulate(graph.out.offsets, graph.out.targets, sources, i, end, bc, s);
    options.onProgress?.(end / sources.length);
  }
  return { values: normalise(bc, n, Math.max(1, sources.length)), exact, sampleSize: sources.length, threadsUsed: 1 };
}

// Pool workers receive the kernel's own compiled source text, so they need no module resolution:
// this is what lets them run the same way under tsx, vitest (whose transformed modules a plain
// worker could not import) and compiled code. They stay alive between calls (a worker costs
// ~100 ms to start, more than the whole computation on a sparse 20,000-component estate) and keep
// their scratch arrays while the graph size allows.
function workerSource(): string {
  return `
const { parentPort } = require("node:worker_threads");
const brandesAccumulate = (${brandesAccumulate.toString()});
let work = null;
parentPort.on("message", ({ id, n, offsets, targets, sources }) => {
  if (!work || work.dist.length !== n || work.succ.length < targets.length) {
    work = {
      dist: new Int32Array(n).fill(-1),
      sigma: new Float64Array(n),
      coef: new Float64Array(n),
      order: new Int32Array(n),
      succ: new Int32Array(targets.length),
      succStart: new Int32Array(n + 1),
    };
  }
  const bc = new Float64Array(n);
  const chunk = 128;
  for (let i = 0; i < sources.length; i += chunk) {
    const end = Math.min(sources.length, i + chunk);
    brandesAccumulate(offsets, targets, sources, i, end, bc, work);
    parentPort.postMessage({ id, type: "progress", done: end });
  }
  parentPort.postMessage({ id, type: "done", bc }, [bc.buffer]);
});
parentPort.postMessage({ type: "ready" });
`;
}

type WorkerMessage = { type: "ready" } | { id: number; type: "progress"; done: number } | { id: number; type: "done"; bc: Float64Array };

/** The warm pool: started once, kept (unreferenced, so it never holds a process open), refilled when a worker dies. */
const pool: WorkerThread[] = [];
let poolStarting: Promise<void> | null = null;
let nextCallId = 1;

async function startPoolWorker(): Promise<WorkerThread | null> {
  try {
    const { Worker } = await import("node:worker_threads");
    const worker = new Worker(workerSource(), { eval: true });
    await new Promise<void>((resolve, reject) => {
      worker.once("message", (m: WorkerMessage) => (m.type === "ready" ? resolve() : reject(new Error("unexpected first message"))));
      worker.once("error", reject);
      worker.once("exit", () => reject(new Error("betweenness worker exited while starting")));
    });
    const forget = (): void => {
      const i = pool.indexOf(worker);
      if (i >= 0) pool.splice(i, 1);
    };
    worker.on("error", forget);
    worker.on("exit", forget);
    worker.unref();
    return worker;
  } catch {
    return null;
  }
}

/**
 * Starts (or tops up) the pool to `size` workers; returns how many are ready. The analysis thread
 * calls this when it starts, so the first job finds the pool warm.
 */
export async function warmBetweennessPool(size = defaultThreads() - 1): Promise<number> {
  while (poolStarting) await poolStarting;
  if (pool.length < size) {
    poolStarting = (async () => {
      const started = await Promise.all(Array.from({ length: size - pool.length }, () => startPoolWorker()));
      for (const w of started) if (w) pool.push(w);
    })();
    await poolStarting;
    poolStarting = null;
  }
  return Math.min(size, pool.length);
}

/** Stops the pool (tests, shutdown). */
export async function stopBetweennessPool(): Promise<void> {
  await Promise.all(pool.splice(0).map((w) => w.terminate()));
}

function defaultThreads(): number {
  // Two on this machine class; never more than the cores the process may use.
  const cores = typeof availableParallelism === "function" ? availableParallelism() : 2;
  return Math.max(1, Math.min(2, cores));
}

function runOnPool(worker: WorkerThread, n: number, graph: CompactGraph, sources: Int32Array, onDone: (count: number) => void): Promise<Float64Array | null> {
  const id = nextCallId++;
  return new Promise((resolve) => {
    const cleanup = (): void => {
      worker.off("message", onMessage);
      worker.off("exit", onExit);
      worker.off("error", onExit);
      worker.unref();
    };
    const onMessage = (msg: WorkerMessage): void => {
      if (msg.type === "ready" || msg.id !== id) return;
      if (msg.type === "progress") onDone(msg.done);
      else {
        cleanup();
        resolve(msg.bc);
      }
    };
    const onExit = (): void => {
      cleanup();
      resolve(null);
    };
    worker.on("message", onMessage);
    worker.once("exit", onExit);
    worker.once("error", onExit);
    worker.ref();
    worker.postMessage({ id, n, offsets: graph.out.offsets, targets: graph.out.targets, sources });
  });
}

const yieldToEventLoop = (): Promise<void> => new Promise((r) => setImmediate(r));

/**
 * Betweenness split over `threads` threads (default 2: this machine class has 2 cores): the
 * calling thread takes one share and warm pool workers the rest. A probe of evenly spread sources
 * is timed first and the rest is only split when the estimate says it pays (dependency graphs vary
 * widely in how far each source reaches, and handing a share to a worker costs a message and a
 * copy of the graph). Any worker that cannot start or dies has its share computed here instead:
 * the result never depends on workers.
 */
export async function betweennessParallel(
  graph: CompactGraph,
  options: BetweennessOptions = {},
): Promise<BetweennessResult> {
  const { n } = graph;
  const threads = Math.max(1, Math.floor(options.threads ?? defaultThreads()));
  const threshold = options.parallelThreshold ?? 2000;
  const minParallelMs = options.minParallelMs ?? 25;
  const { sources, exact } = chooseSources(n, options);
  if (threads < 2 || sources.length < threshold) return betweenness(graph, options);

  const bc = new Float64Array(n);
  const s = scratch(n, graph.out.targets.length);
  const { offsets, targets } = graph.out;
  const probeCount = Math.min(sources.length, 128);
  const stride = sources.length / probeCount;
  const probe = new Int32Array(probeCount);
  const inProbe = new Uint8Array(sources.length);
  for (let i = 0; i < probeCount; i++) {
    const j = Math.floor(i * stride);
    probe[i] = sources[j]!;
    inProbe[j] = 1;
  }
  const t0 = performance.now();
  brandesAccumulate(offsets, targets, probe, 0, probeCount, bc, s);
  const estimateMs = ((performance.now() - t0) * (sources.length - probeCount)) / probeCount;
  const rest = new Int32Array(sources.length - probeCount);
  for (let j = 0, k = 0; j < sources.length; j++) if (!inProbe[j]) rest[k++] = sources[j]!;

  const total = sources.length;
  if (estimateMs < minParallelMs) {
    const chunk = 256;
    for (let i = 0; i < rest.length; i += chunk) {
      const end = Math.min(rest.length, i + chunk);
      brandesAccumulate(offsets, targets, rest, i, end, bc, s);
      options.onProgress?.((probeCount + end) / total);
    }
    return { values: normalise(bc, n, Math.max(1, total)), exact, sampleSize: total, threadsUsed: 1 };
  }

  // Interleaved shares balance well: in dependency graphs cost per source varies with its depth.
  const shares: Int32Array[] = [];
  for (let t = 0; t < threads; t++) {
    const len = Math.floor((rest.length - t + threads - 1) / threads);
    const share = new Int32Array(Math.max(0, len));
    for (let i = 0, j = t; j < rest.length; i++, j += threads) share[i] = rest[j]!;
    shares.push(share);
  }
  const done = new Array<number>(threads).fill(0);
  const report = (): void => options.onProgress?.((probeCount + done.reduce((a, b) => a + b, 0)) / total);
  await warmBetweennessPool(threads - 1);
  const workerRuns = shares.slice(1).map((share, i) => {
    const worker = pool[i];
    if (!worker) return Promise.resolve(null);
    return runOnPool(worker, n, graph, share, (count) => {
      done[i + 1] = count;
      report();
    });
  });

  const mine = shares[0]!;
  const chunk = 128;
  for (let i = 0; i < mine.length; i += chunk) {
    const end = Math.min(mine.length, i + chunk);
    brandesAccumulate(offsets, targets, mine, i, end, bc, s);
    done[0] = end;
    report();
    // Let worker progress messages and other callbacks through between chunks.
    await yieldToEventLoop();
  }
  const results = await Promise.all(workerRuns);
  let threadsUsed = 1;
  for (let t = 0; t < results.length; t++) {
    const part = results[t];
    if (part) {
      threadsUsed++;
      for (let v = 0; v < n; v++) bc[v] = bc[v]! + part[v]!;
    } else {
      const share = shares[t + 1]!;
      brandesAccumulate(offsets, targets, share, 0, share.length, bc, s);
    }
  }
  options.onProgress?.(1);
  return { values: normalise(bc, n, Math.max(1, total)), exact, sampleSize: total, threadsUsed };
}
