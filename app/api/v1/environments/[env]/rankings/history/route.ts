// GET /api/v1/environments/{env}/rankings/history[?keys=a,b][&top=8][&count=20] — rank of the
// named components (or of the current top N) over the last `count` analysed snapshots, oldest first.
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema, keySchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { getRankTrend } from "@/lib/data/rank-trend";

const querySchema = z
  .object({
    keys: z
      .string()
      .max(20_000)
      .transform((s) => s.split(",").filter(Boolean))
      .pipe(z.array(keySchema).max(200))
      .optional(),
    top: z.coerce.number().int().min(1).max(50).default(8),
    count: z.coerce.number().int().min(2).max(100).default(20),
  })
  .strict();

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, querySchema);
  const served = await getServedAnalysis({ slug: env });
  const trend = await getRankTrend({ served, keys: query.keys, top: query.top, count: query.count });
  return NextResponse.json({ ...analysisMeta(served), ...trend });
});
