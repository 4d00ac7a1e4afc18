// Rank over recent analysed snapshots for a few components: the sparklines on the pinch-point
// table and the trend chart on the history screen.
import "server-only";
import { getRankHistory, getRankings } from "./analysis-results";
import type { ServedAnalysis } from "./environment-analysis";

export interface RankTrend {
  snapshots: number[];
  series: Array<{ key: string; points: Array<{ snapshot: number; rank: number | null }> }>;
}

export async function getRankTrend({ served, keys, top, count }: { served: ServedAnalysis; keys?: string[]; top: number; count: number }): Promise<RankTrend> {
  const wanted =
    keys && keys.length
      ? keys
      : (await getRankings({ snapshotId: served.snapshot.id, environmentId: served.environment.id, sort: "rank", order: "asc", limit: top, offset: 0 })).items.map((i) => i.key);
  const history = await getRankHistory({ environmentId: served.environment.id, keys: wanted, count });
  const series = wanted.map((key) => ({ key, points: history[key] ?? [] }));
  return { snapshots: series[0]?.points.map((p) => p.snapshot) ?? [], series };
}
