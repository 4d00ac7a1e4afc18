// POST /api/v1/environments/{env}/drills — `{ fail: { components?, zones? } }` → what is down and degraded.
import { respond } from "@/lib/api/respond";
import { drillResponseSchema } from "@/lib/api/schemas/analysis";
import { parseParams, readJson } from "@/lib/api/query";
import { drillBodySchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { runDrill } from "@/lib/data/snapshot-graph";
import { parseOrThrow } from "@/lib/errors";

export const POST = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const body = parseOrThrow(drillBodySchema, await readJson(req), "body");
  const served = await getServedAnalysis({ slug: env });
  const result = await runDrill({ environmentId: served.environment.id, snapshot: served.snapshot, request: body.fail });
  return respond(drillResponseSchema, { ...analysisMeta(served), ...result });
});
