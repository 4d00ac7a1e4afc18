// GET /api/v1/environments/{env}/chain?from=a&to=b — why does a depend on b: the shortest chain of needs.
import { respond } from "@/lib/api/respond";
import { parseParams, parseQuery } from "@/lib/api/query";
import { chainQuerySchema, chainResponseSchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getServedAnalysis } from "@/lib/data/environment-analysis";
import { dependencyChain } from "@/lib/data/snapshot-graph";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const { from, to } = parseQuery(req.url, chainQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const chain = await dependencyChain({ snapshotId: served.snapshot.id, from, to });
  return respond(chainResponseSchema, { snapshot: { number: served.snapshot.number, createdAt: served.snapshot.createdAt }, ...chain });
});
