// Where the numbers come from and how far to trust them (DESIGN §9), shown above rankings and drills.
import { Badge } from "@/components/ui/Badge";
import { ageFromSeconds, percent, plural } from "@/components/ui/format";
import type { AnalysisMetaBlock } from "./api-types";

export function SnapshotMeta({ meta, what = "rankings", counts = true }: { meta: AnalysisMetaBlock; what?: "rankings" | "drill"; counts?: boolean }) {
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
          ? "A drill follows the declared dependencies only: it is a rehearsal aid, not a guarantee of what an outage will do. Changes to production go through your own change and incident processes."
          : "Ranks are only as good as the inventory: a dependency nobody declared is invisible here. Changes to production go through your own change and incident processes."}
      </p>
    </div>
  );
}
