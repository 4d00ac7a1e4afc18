// Response shapes of the analysis API as the screens read them (types only: nothing server-side is bundled).
import type { RankingItem } from "@/lib/data/analysis-results";
import type { ComponentListItem, EnvironmentCounts } from "@/lib/data/components";
import type { analysisMeta } from "@/lib/data/environment-analysis";
import type { RankTrend } from "@/lib/data/rank-trend";

export type AnalysisMetaBlock = ReturnType<typeof analysisMeta>;

export interface RankingsResponse extends AnalysisMetaBlock {
  sort: string;
  /** the measure the # column (each item's `position`) ranks by */
  rankBy: string;
  order: "asc" | "desc";
  limit: number;
  offset: number;
  total: number;
  items: RankingItem[];
}

export type RankTrendResponse = AnalysisMetaBlock & RankTrend;

export interface ComponentsResponse {
  environment: string;
  counts: EnvironmentCounts;
  items: ComponentListItem[];
}

export type { RankingItem, ComponentListItem };
