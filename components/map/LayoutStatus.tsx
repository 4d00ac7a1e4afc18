"use client";
// What the layout is doing while the view has no positions yet: progress with a cancel, a retry, or "nothing to show".
import { PHASE_LABEL } from "./layout-protocol";
import type { useElkLayout } from "./useElkLayout";

export function LayoutStatus(props: { state: ReturnType<typeof useElkLayout>; count: number; onClearFilters?: () => void }) {
  const s = props.state;
  return (
    <div className="pp-progress" role="status" aria-live="polite">
      {s.status === "running" ? (
        <>
          <span className="pp-spinner" aria-hidden="true" />
          <span>
            {PHASE_LABEL[s.phase]} ({props.count.toLocaleString()} nodes) · {(s.elapsedMs / 1000).toFixed(1)} s
          </span>
          <button type="button" className="pp-btn" onClick={s.cancel} aria-label="Cancel the layout">
            Cancel
          </button>
        </>
      ) : s.status === "cancelled" ? (
        <>
          <span>Layout cancelled.</span>
          <button type="button" className="pp-btn" onClick={s.retry} aria-label="Lay out again">
            Lay out again
          </button>
        </>
      ) : s.status === "error" ? (
        <>
          <span className="text-down">Layout failed: {s.message}</span>
          <button type="button" className="pp-btn" onClick={s.retry} aria-label="Retry the layout">
            Retry
          </button>
        </>
      ) : (
        <>
          <span>Nothing to show{props.onClearFilters ? ": the filters hide every component." : "."}</span>
          {props.onClearFilters ? (
            <button type="button" className="pp-btn" onClick={props.onClearFilters}>
              Clear filters
            </button>
          ) : null}
        </>
      )}
    </div>
  );
}
