// Runs ELK off the main thread. The bundled build is used rather than elk-api + elk-worker
// so the graph building and result reading live in the same worker as ELK itself and only
// plain positions cross back. Cancellation is worker.terminate() from the hook: ELK's
// layered run is one synchronous call that cannot be interrupted from inside.
import ELK from "elkjs/lib/elk.bundled.js";
import { buildElkGraph, readElkLayout } from "./layout";
import type { LayoutRequest, LayoutReply } from "./layout-protocol";

interface WorkerScope {
  postMessage(message: LayoutReply): void;
  onmessage: ((event: MessageEvent<LayoutRequest>) => void) | null;
}

const scope = self as unknown as WorkerScope;
const elk = new ELK();

// Importing elk.bundled.js in a worker installs its own onmessage; this assignment replaces it.
scope.onmessage = (event) => {
  const req = event.data;
  if (req.type !== "layout") return;
  const started = performance.now();
  scope.postMessage({ type: "phase", id: req.id, phase: "graph" });
  const graph = buildElkGraph(req.input);
  scope.postMessage({ type: "phase", id: req.id, phase: "layout" });
  elk
    .layout(graph)
    .then((out) => {
      scope.postMessage({ type: "phase", id: req.id, phase: "read" });
      const result = readElkLayout(out);
      scope.postMessage({ type: "done", id: req.id, result, ms: performance.now() - started });
    })
    .catch((err: unknown) => {
      scope.postMessage({ type: "error", id: req.id, message: err instanceof Error ? err.message : String(err) });
    });
};
