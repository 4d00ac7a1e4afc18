// GET /api/v1/environments/{env}/rankings[?sort=betweenness&order=desc&limit=50&offset=0&team=&kind=&tier=&q=]
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { defaultRankingOrder, rankingsQuerySchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getRankings } from "@/lib/data/analysis-results";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, rankingsQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const order = query.order ?? defaultRankingOrder(query.sort);
  const { total, items } = await getRankings({ ...query, order, snapshotId: served.snapshot.id, environmentId: served.environment.id });
  return NextResponse.json({ ...analysisMeta(served), sort: query.sort, order, limit: query.limit, offset: query.offset, total, items });
});
