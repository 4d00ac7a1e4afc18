// GET /api/v1/environments/{env}/rankings/history[?keys=a,b][&top=8][&count=20] — rank of the
// named components (or of the current top N) over the last `count` analysed snapshots, oldest first.
import { respond } from "@/lib/api/respond";
import { rankTrendResponseSchema } from "@/lib/api/schemas/analysis";
import { parseParams, parseQuery } from "@/lib/api/query";
import { rankHistoryQuerySchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { getRankTrend } from "@/lib/data/rank-trend";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, rankHistoryQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const trend = await getRankTrend({ served, keys: query.keys, top: query.top, count: query.count });
  return respond(rankTrendResponseSchema, { ...analysisMeta(served), ...trend });
});
