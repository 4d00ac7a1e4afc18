// GET /api/v1/environments/{env}/reviews[?overdue=true] — risk reviews, most urgent first (read).
import { respond } from "@/lib/api/respond";
import { reviewsResponseSchema } from "@/lib/api/schemas/reviews";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { reviewsQuerySchema } from "@/lib/api/schemas/reviews";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { listReviews } from "@/lib/data/reviews";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const { overdue } = parseQuery(req.url, reviewsQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(reviewsResponseSchema, { environment: env, items: await listReviews({ environmentId: environment.id, overdue: overdue ?? false }) });
});
