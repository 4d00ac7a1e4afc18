// The analysis off the caller's thread: one worker thread, started on first use and kept warm for
// the next job, runs analyse() (thread-entry.ts) while the calling thread stays free for the job's
// heartbeats and the queue. Before, a 60,000-component chain held the event loop long enough for
// the heartbeat to go stale and another worker to take the job over.
//
// The thread loads the TypeScript sources through tsx's register API (a worker does not inherit the
// loader of the thread that starts it), so it runs the same way under `tsx` and under vitest.
// When no thread can start, the analysis runs here instead, yielding between phases as before.
import { createRequire } from "node:module";
import { join } from "node:path";
import type { Worker as WorkerThread } from "node:worker_threads";
import { analyse } from "./index";
import type { AnalysisInput, AnalysisOptions, AnalysisResult, ProgressCallback } from "./types";

type Message =
  | { type: "ready" }
  | { id: number; type: "progress"; fraction: number; phase: Parameters<ProgressCallback>[1] }
  | { id: number; type: "done"; result: AnalysisResult }
  | { id: number; type: "error"; message: string };

interface Pending {
  resolve: (r: AnalysisResult) => void;
  reject: (e: Error) => void;
  onProgress?: ProgressCallback;
}

let worker: WorkerThread | null = null;
let starting: Promise<WorkerThread | null> | null = null;
const pending = new Map<number, Pending>();
let nextId = 1;
/** After a failed start, run on the calling thread for a while instead of retrying every job. */
let unavailableUntil = 0;

function fail(error: Error): void {
  for (const p of pending.values()) p.reject(error);
  pending.clear();
}

async function startWorker(): Promise<WorkerThread | null> {
  try {
    const { Worker } = await import("node:worker_threads");
    const here = typeof __dirname === "string" ? __dirname : process.cwd();
    const tsx = createRequire(join(here, "thread.ts")).resolve("tsx/cjs/api");
    const entry = join(here, "thread-entry.ts");
    const source = `const { register } = require(${JSON.stringify(tsx)}); register(); require(${JSON.stringify(entry)});`;
    const w = new Worker(source, { eval: true });
    await new Promise<void>((resolve, reject) => {
      w.once("message", (m: Message) => (m.type === "ready" ? resolve() : reject(new Error("analysis thread said something before it was ready"))));
      w.once("error", reject);
      w.once("exit", (code) => reject(new Error(`analysis thread exited with code ${code} while starting`)));
    });
    w.on("message", (m: Message) => {
      if (m.type === "ready") return;
      const p = pending.get(m.id);
      if (!p) return;
      if (m.type === "progress") p.onProgress?.(m.fraction, m.phase);
      else {
        pending.delete(m.id);
        if (pending.size === 0) w.unref();
        if (m.type === "done") p.resolve(m.result);
        else p.reject(new Error(m.message));
      }
    });
    w.on("error", (error) => {
      worker = null;
      fail(error);
    });
    w.on("exit", (code) => {
      worker = null;
      fail(new Error(`the analysis thread stopped (exit code ${code})`));
    });
    // Kept warm but never keeping the process alive on its own.
    w.unref();
    return w;
  } catch (error) {
    console.error("[analysis] no worker thread, analysing on the calling thread:", error instanceof Error ? error.message : error);
    return null;
  }
}

/** analyse() on the warm analysis thread; `thread` says whether it ran there. */
export async function analyseInThread(
  input: AnalysisInput,
  options: AnalysisOptions = {},
  onProgress?: ProgressCallback,
): Promise<AnalysisResult & { thread: boolean }> {
  if (!worker && Date.now() >= unavailableUntil) {
    starting ??= startWorker().finally(() => (starting = null));
    worker = await starting;
    if (!worker) unavailableUntil = Date.now() + 60_000;
  }
  const w = worker;
  if (!w) return { ...(await analyse(input, options, onProgress)), thread: false };
  const id = nextId++;
  const result = new Promise<AnalysisResult>((resolve, reject) => pending.set(id, { resolve, reject, onProgress }));
  w.ref();
  w.postMessage({ id, input, options });
  return { ...(await result), thread: true };
}

/** Stops the warm thread (tests, shutdown). */
export async function stopAnalysisThread(): Promise<void> {
  const w = worker;
  worker = null;
  if (w) await w.terminate();
}
