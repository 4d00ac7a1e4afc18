"use client";
// Lays out the current view in a Web Worker, with progress, cancellation and a small cache
// so that toggling a filter back does not lay the same view out twice.
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { layoutInputFromView, type LayoutResult } from "./layout";
import type { LayoutPhase, LayoutReply, LayoutRequest } from "./layout-protocol";
import { layoutSignature, type MapView } from "./view";

const CACHE_LIMIT = 8;
// Module-level so results outlive a remount of the canvas (e.g. navigating back to the map).
const cache = new Map<string, { result: LayoutResult; ms: number }>();

function remember(sig: string, value: { result: LayoutResult; ms: number }): void {
  cache.delete(sig);
  cache.set(sig, value);
  while (cache.size > CACHE_LIMIT) {
    const oldest = cache.keys().next().value;
    if (oldest === undefined) break;
    cache.delete(oldest);
  }
}

export type ElkLayoutState =
  | { status: "running"; phase: LayoutPhase; elapsedMs: number }
  | { status: "done"; result: LayoutResult; ms: number; cached: boolean }
  | { status: "cancelled" }
  | { status: "error"; message: string }
  | { status: "idle" };

function spawn(): Worker {
  return new Worker(new URL("./layout.worker.ts", import.meta.url));
}

export function useElkLayout(view: MapView | null): ElkLayoutState & { cancel(): void; retry(): void } {
  const signature = useMemo(() => (view ? layoutSignature(view) : null), [view]);
  const [progress, setProgress] = useState<{ sig: string; phase: LayoutPhase; elapsedMs: number } | null>(null);
  const [finished, setFinished] = useState<{ sig: string; state: ElkLayoutState } | null>(null);
  const [attempt, setAttempt] = useState(0);
  const workerRef = useRef<Worker | null>(null);
  const jobRef = useRef<{ id: number; sig: string } | null>(null);
  const nextId = useRef(1);

  const stop = useCallback(() => {
    // terminate() is the only way to stop a running ELK pass; a fresh worker is spawned on demand.
    workerRef.current?.terminate();
    workerRef.current = null;
    jobRef.current = null;
  }, []);

  useEffect(() => {
    if (!view || !signature || cache.has(signature)) return;
    const id = nextId.current++;
    jobRef.current = { id, sig: signature };
    const worker = workerRef.current ?? spawn();
    workerRef.current = worker;
    const started = performance.now();
    let phase: LayoutPhase = "graph";
    const tick = window.setInterval(() => {
      setProgress({ sig: signature, phase, elapsedMs: performance.now() - started });
    }, 150);
    worker.onmessage = (event: MessageEvent<LayoutReply>) => {
      const msg = event.data;
      if (msg.id !== jobRef.current?.id) return;
      if (msg.type === "phase") {
        phase = msg.phase;
        setProgress({ sig: signature, phase, elapsedMs: performance.now() - started });
        return;
      }
      window.clearInterval(tick);
      jobRef.current = null;
      if (msg.type === "done") {
        remember(signature, { result: msg.result, ms: msg.ms });
        setFinished({ sig: signature, state: { status: "done", result: msg.result, ms: msg.ms, cached: false } });
      } else {
        setFinished({ sig: signature, state: { status: "error", message: msg.message } });
      }
    };
    worker.onerror = (event) => {
      window.clearInterval(tick);
      stop();
      setFinished({ sig: signature, state: { status: "error", message: event.message || "layout worker failed" } });
    };
    const req: LayoutRequest = { type: "layout", id, input: layoutInputFromView(view) };
    worker.postMessage(req);
    return () => {
      window.clearInterval(tick);
      // Inputs changed (or unmount) while this job ran: kill it rather than wait for a stale answer.
      if (jobRef.current?.id === id) stop();
    };
  }, [view, signature, attempt, stop]);

  useEffect(() => stop, [stop]);

  const cancel = useCallback(() => {
    if (!signature || !jobRef.current) return;
    stop();
    setFinished({ sig: signature, state: { status: "cancelled" } });
  }, [signature, stop]);

  const retry = useCallback(() => {
    setFinished(null);
    setAttempt((a) => a + 1);
  }, []);

  const hit = signature ? cache.get(signature) : undefined;
  // Memoised so that consumers can depend on the result without re-rendering in a loop.
  const state = useMemo<ElkLayoutState>(() => {
    if (!signature) return { status: "idle" };
    if (finished?.sig === signature) return finished.state;
    if (hit) return { status: "done", result: hit.result, ms: hit.ms, cached: true };
    if (progress?.sig === signature) return { status: "running", phase: progress.phase, elapsedMs: progress.elapsedMs };
    return { status: "running", phase: "graph", elapsedMs: 0 };
  }, [signature, finished, hit, progress]);
  return useMemo(() => ({ ...state, cancel, retry }), [state, cancel, retry]);
}
