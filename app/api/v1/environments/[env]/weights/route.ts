// GET /api/v1/environments/{env}/weights — the pinch-score weights in use (read).
// PUT — `{ betweenness, reach, single }` (reviews:write): save, audit and re-queue the newest snapshot's analysis.
import { respond } from "@/lib/api/respond";
import { weightsViewSchema } from "@/lib/api/schemas/reviews";
import { parseParams, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { pinchWeightsSchema } from "@/lib/analysis/types";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getWeights, setWeights } from "@/lib/data/weights";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(weightsViewSchema, await getWeights({ environmentId: environment.id }));
});

export const PUT = withPermission<{ env: string }>("reviews:write", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const weights = parseOrThrow(pinchWeightsSchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(weightsViewSchema, await setWeights({ environmentId: environment.id, weights, actor }));
});
