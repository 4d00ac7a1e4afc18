// Where the numbers come from and how far to trust them (DESIGN §9), shown above rankings and drills.
import { Badge } from "@/components/ui/Badge";
import { ageFromSeconds, percent, plural } from "@/components/ui/format";
import type { AnalysisMeta } from "@/lib/api/schemas/analysis";

const VIEW_TEXT = {
  declared: { label: "declared needs", title: "Analysed on the needs the inventory files declare (and infer); calls seen only in traces are left out" },
  observed: { label: "needs seen in traces", title: "Analysed on the calls traces showed; declared needs no trace confirms are left out" },
  both: { label: "declared + traced needs", title: "Analysed on declared needs and on calls traces showed; needs seen only in traces count as the environment's settings say (soft by default)" },
} as const;

/** Which needs the numbers come from (DESIGN §10): declared, seen in traces, or both. */
export function GraphViewBadge({ graphView }: { graphView: AnalysisMeta["graphView"] }) {
  if (!graphView) return null;
  const t = VIEW_TEXT[graphView.view];
  return (
    <span data-testid="graph-view" title={`${t.title}${graphView.setting ? " (set in the environment's settings)" : " (chosen from what the graph holds; the environment's settings can fix it)"}`}>
      view: <Badge tone="info">{t.label}</Badge>
      {graphView.view !== "declared" && graphView.observedOnlyComponents > 0 && <span className="ml-1">{plural(graphView.observedOnlyComponents, "component")} known only from traces</span>}
    </span>
  );
}

export function SnapshotMeta({ meta, what = "rankings", counts = true }: { meta: AnalysisMeta; what?: "rankings" | "drill"; counts?: boolean }) {
  const { snapshot, analysis, latest } = meta;
  const stale = snapshot.ageSeconds > 7 * 24 * 3600;
  return (
    <div className="space-y-1.5 text-sm" data-testid="snapshot-meta">
      <p className="flex flex-wrap items-center gap-x-3 gap-y-1 text-muted">
        <span>
          Snapshot <span className="font-mono text-ink">#{snapshot.number}</span>, pushed{" "}
          <span className={stale ? "text-degraded" : "text-ink"}>{ageFromSeconds(snapshot.ageSeconds)}</span>
        </span>
        {counts && <span>{plural(snapshot.components, "component")}</span>}
        {counts && (
          <span title="Components something needs but no source declares: their own needs are unknown">
            undeclared: <span className={snapshot.undeclared > 0 ? "text-degraded" : "text-ink"}>{percent(snapshot.undeclaredShare)}</span> ({snapshot.undeclared})
          </span>
        )}
        <GraphViewBadge graphView={meta.graphView} />
        {analysis.exact === false ? (
          <Badge tone="degraded" title="Betweenness estimated from a sample of source components (Brandes & Pich 2007); the top of the list is reliable, the tail less so">
            betweenness sampled{"sampleSize" in analysis && analysis.sampleSize ? ` from ${analysis.sampleSize} sources` : ""}
          </Badge>
        ) : analysis.exact === true ? (
          <Badge tone="ok" title="Betweenness computed over every pair of components">exact betweenness</Badge>
        ) : null}
      </p>
      {latest && (
        <p className="text-info" data-testid="newer-analysis">
          Analysis of newer snapshot #{latest.number} {latest.status === "failed" ? "failed" : `${latest.status} (${Math.round(latest.progress * 100)}%)`}; these {what === "drill" ? "results" : "ranks"} are from #{snapshot.number}.
        </p>
      )}
      <p className="text-xs text-muted" data-testid="caution">
        {what === "drill"
          ? `A drill follows the ${meta.graphView?.view === "observed" ? "needs traces showed" : meta.graphView?.view === "both" ? "declared needs and those traces showed" : "declared dependencies"} only: it is a rehearsal aid, not a guarantee of what an outage will do. Changes to production go through your own change and incident processes.`
          : `Ranks are only as good as the inventory${meta.graphView && meta.graphView.view !== "declared" ? " and the traces behind it: a call no trace caught and nobody declared is invisible here" : ": a dependency nobody declared is invisible here"}. Changes to production go through your own change and incident processes.`}
      </p>
    </div>
  );
}
