// Runs inside the analysis worker thread (see thread.ts): receives one analysis request at a time
// and answers with progress and the result, so the CPU-heavy phases never hold up the caller's
// event loop (the job's heartbeat, the queue).
import { parentPort } from "node:worker_threads";
import { warmBetweennessPool } from "./betweenness";
import { analyse } from "./index";
import type { AnalysisInput, AnalysisOptions } from "./types";

export interface ThreadRequest {
  id: number;
  input: AnalysisInput;
  options: AnalysisOptions;
}

const port = parentPort;
if (port) {
  port.on("message", (msg: ThreadRequest) => {
    let last = 0;
    let lastPhase = "";
    void analyse(msg.input, msg.options, (fraction, phase) => {
      // Progress is for people and heartbeats: a few messages a second are plenty.
      const now = Date.now();
      if (phase === lastPhase && now - last < 200) return;
      last = now;
      lastPhase = phase;
      port.postMessage({ id: msg.id, type: "progress", fraction, phase });
    }).then(
      (result) => port.postMessage({ id: msg.id, type: "done", result }),
      (error: unknown) => port.postMessage({ id: msg.id, type: "error", message: error instanceof Error ? error.stack ?? error.message : String(error) }),
    );
  });
  port.postMessage({ type: "ready" });
}

// The betweenness pool starts with the thread, so the first job finds it warm.
void warmBetweennessPool();
