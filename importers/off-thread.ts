// Parse and validate pushes on worker threads, with a time budget. A 20 MB file with a syntax error,
// YAML anchors or too many components kept the request thread busy for 20–110 s, and every other
// request of the process waited. Here the request thread only hands the bytes over and waits; a
// file that takes longer than the budget is refused with 413 and its thread is ended.
//
// The pool is piscina; its threads load importers/parse-thread.ts through tsx's loader (the same
// way npm start runs the analysis worker), so the parse code is the checkout's TypeScript whatever
// bundled the caller (Next, vitest, tsx).
import path from "node:path";
import Piscina from "piscina";
import type { ImportRequest, ImportResult } from "@/lib/inventory/types";
import { AppError } from "@/lib/errors";
import { importInventory } from "./index";

/** How long one file may take to parse and check, queueing included (PINCHPOINT_PARSE_BUDGET_MS). */
const parseBudgetMs = () => Number(process.env.PINCHPOINT_PARSE_BUDGET_MS ?? 30_000);
/** Threads parsing at once per process (PINCHPOINT_PARSE_THREADS); 0 parses on the calling thread. */
const parseThreads = () => Math.max(0, Math.floor(Number(process.env.PINCHPOINT_PARSE_THREADS ?? 2)));
/** Files waiting for a thread beyond these are turned away with 503 and Retry-After. */
const MAX_QUEUE = 16;

const holder = globalThis as unknown as { __pinchpointParsePool?: Piscina };

function pool(): Piscina {
  if (!holder.__pinchpointParsePool) {
    const root = process.cwd();
    holder.__pinchpointParsePool = new Piscina({
      filename: path.join(root, "importers/parse-thread.ts"),
      execArgv: ["--import", "tsx"],
      minThreads: 0,
      maxThreads: Math.max(1, parseThreads()),
      idleTimeout: 60_000,
      maxQueue: MAX_QUEUE,
    });
  }
  return holder.__pinchpointParsePool;
}

/** For scripts and tests: end the pool's threads so the process can exit. */
export async function closeParsePool(): Promise<void> {
  const current = holder.__pinchpointParsePool;
  holder.__pinchpointParsePool = undefined;
  await current?.destroy();
}

const overBudget = (ms: number): ImportResult => ({
  ok: false,
  status: 413,
  issues: [
    {
      path: "",
      message: `parsing and checking this file took longer than ${Math.round(ms / 1000)} s, so it was stopped: it is too large or too complex (many components, YAML anchors and aliases); split it by source or write the values out`,
    },
  ],
});

/** `importInventory`, on a worker thread within the time budget. */
export async function importInventoryOffThread(req: ImportRequest, { budgetMs = parseBudgetMs() }: { budgetMs?: number } = {}): Promise<ImportResult> {
  if (parseThreads() === 0) return importInventory(req);
  // The body moves to the thread without a copy when it owns its whole buffer.
  const body = typeof req.body === "string" ? req.body : new Uint8Array(req.body);
  const transferList = typeof body === "string" ? [] : [body.buffer];
  try {
    return (await pool().run({ ...req, body }, { signal: AbortSignal.timeout(budgetMs), transferList: transferList as never })) as ImportResult;
  } catch (error) {
    const name = (error as { name?: string } | null)?.name;
    if (name === "AbortError" || name === "TimeoutError") return overBudget(budgetMs);
    if (error instanceof Error && /queue is at limit/i.test(error.message)) {
      throw new AppError("unavailable", "Too many files are being checked right now; send this one again in a few seconds", undefined, { retryAfterSeconds: 5 });
    }
    throw error;
  }
}
