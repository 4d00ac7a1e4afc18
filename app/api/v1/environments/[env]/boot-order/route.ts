// GET /api/v1/environments/{env}/boot-order[?stages=false] — cold-start stages (start-up-only needs
// included); cycles cannot start unaided, each with a suggested start order and the needs to break
// first. `stages=false` leaves the stages out (the overview only counts cycles); `components=true`
// adds each component's name, owner and tier and its start-up-only needs (the runbook).
import { respond } from "@/lib/api/respond";
import { bootCyclesResponseSchema, bootOrderResponseSchema } from "@/lib/api/schemas/analysis";
import { parseParams, parseQuery } from "@/lib/api/query";
import { bootOrderQuerySchema } from "@/lib/api/schemas/analysis";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getBootOrder, getCycles } from "@/lib/data/analysis-results";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { startupNeeds } from "@/lib/data/snapshot-graph";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, bootOrderQuerySchema);
  const served = await getServedAnalysis({ slug: env });
  const ids = { snapshotId: served.snapshot.id, environmentId: served.environment.id };
  if (!query.stages) {
    return respond(bootCyclesResponseSchema, { ...analysisMeta(served), cycles: await getCycles({ snapshotId: ids.snapshotId, kind: "boot" }) });
  }
  const [boot, startup] = await Promise.all([getBootOrder({ ...ids, withComponents: query.components }), query.components ? startupNeeds({ snapshotId: ids.snapshotId }) : null]);
  return respond(bootOrderResponseSchema, { ...analysisMeta(served), ...boot, ...(startup ? { startupNeeds: startup } : {}) });
});
