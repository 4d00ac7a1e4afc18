// GET /api/v1/environments/{env}/rankings/export[?sort=&order=&team=&kind=&tier=&q=] — the whole
// filtered, sorted ranking as CSV (every row, not one page), for spreadsheets and review packs.
import { parseParams, parseQuery } from "@/lib/api/query";
import { defaultRankingOrder, rankingsExportQuerySchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getRankings } from "@/lib/data/analysis-results";
import { getServedAnalysis } from "@/lib/data/environment-analysis";
import { rankingsCsv } from "@/lib/export/rankings-csv";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, rankingsExportQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const order = query.order ?? defaultRankingOrder(query.sort);
  const { items } = await getRankings({ ...query, order, limit: served.snapshot.componentCount + 1, offset: 0, snapshotId: served.snapshot.id, environmentId: served.environment.id });
  const body = rankingsCsv({ items, snapshot: served.snapshot.number });
  return new Response(body, {
    status: 200,
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="pinch-points-${env}-snapshot-${served.snapshot.number}.csv"`,
    },
  });
});
