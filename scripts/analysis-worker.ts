// The worker: analyses, e-mail delivery, traced calls and the scheduled jobs, off the request path
// (lib/jobs/worker.ts). Run any number of these (npm start runs one, kept going by
// scripts/supervise-worker.ts); they share the queue without stepping on each other.
//   tsx --conditions=react-server scripts/analysis-worker.ts
// (lib/data modules import "server-only", which is an empty module under the react-server condition.)
import { closeDb } from "../models";
import { runWorker } from "../lib/jobs/worker";

const stop = new AbortController();
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    // Hand back what is in hand and stop; a worker that cannot is ended after a few seconds anyway.
    stop.abort();
    setTimeout(() => process.exit(0), 8_000).unref();
  });
}

runWorker({ signal: stop.signal })
  .then(() => closeDb())
  .then(() => process.exit(0))
  .catch((error: unknown) => {
    console.error("[worker] stopped:", error);
    process.exit(1);
  });
