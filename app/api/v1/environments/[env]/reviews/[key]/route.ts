// PUT /api/v1/environments/{env}/reviews/{key} — `{ status, rationale, reviewBy? }`: set the review of a component (reviews:write), audited.
// DELETE — clear it (reviews:write), audited with what it was.
import { respond } from "@/lib/api/respond";
import { clearedReviewSchema, reviewViewSchema } from "@/lib/api/schemas/reviews";
import { parseParams, readJson } from "@/lib/api/query";
import { componentParamsSchema } from "@/lib/api/schemas/common";
import { reviewBodySchema } from "@/lib/api/schemas/reviews";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { clearReview, putReview } from "@/lib/data/reviews";
import { parseOrThrow } from "@/lib/errors";

export const PUT = withPermission<{ env: string; key: string }>("reviews:write", async ({ req, params, actor }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const input = parseOrThrow(reviewBodySchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(reviewViewSchema, await putReview({ environmentId: environment.id, key, input, actor }));
});

export const DELETE = withPermission<{ env: string; key: string }>("reviews:write", async ({ params, actor }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(clearedReviewSchema, await clearReview({ environmentId: environment.id, key, actor }));
});
