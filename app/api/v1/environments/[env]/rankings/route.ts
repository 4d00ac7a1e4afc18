// GET /api/v1/environments/{env}/rankings[?sort=betweenness&order=desc&limit=50&offset=0&team=&kind=&tier=&q=]
// Pages are prepared once per (environment, analysis and owners, query) and kept in memory
// (lib/data/page-cache.ts); the ETag lets a client that has the page get a 304. The answer is spliced
// from bytes, so its two halves are typed against rankingsResponseSchema before they are written.
import { parseParams, parseQuery } from "@/lib/api/query";
import { etagOf, jsonWithEtag, notModified } from "@/lib/api/http-cache";
import type { z } from "zod";
import { type analysisMetaSchema, defaultRankingOrder, rankingsQuerySchema, type rankingsResponseSchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getRankings } from "@/lib/data/analysis-results";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { cachedPage } from "@/lib/data/page-cache";

const CLOSE = Buffer.from("}");

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, rankingsQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const order = query.order ?? defaultRankingOrder(query.sort);
  const normalised = JSON.stringify({ ...query, order });
  const etag = etagOf("rankings", served.environment.id, served.version, normalised);
  const unchanged = notModified(req, etag);
  if (unchanged) return unchanged;
  const page = await cachedPage(`rankings\u0000${served.environment.id}\u0000${served.version}\u0000${normalised}`, async () => {
    const { total, rankBy, items } = await getRankings({ ...query, order, snapshotId: served.snapshot.id, environmentId: served.environment.id });
    const body: Omit<z.input<typeof rankingsResponseSchema>, keyof z.input<typeof analysisMetaSchema>> = { sort: query.sort, order, rankBy, limit: query.limit, offset: query.offset, total, items };
    return JSON.stringify(body).slice(1, -1);
  });
  // The meta block carries the snapshot's age, so it is made fresh; the page is spliced in as bytes.
  const metaBlock: z.input<typeof analysisMetaSchema> = analysisMeta(served);
  const meta = Buffer.from(`{${JSON.stringify(metaBlock).slice(1, -1)},`, "utf8");
  return jsonWithEtag(Buffer.concat([meta, page, CLOSE]) as Uint8Array as Uint8Array<ArrayBuffer>, etag);
});
