// GET /api/v1/environments/{env}/components/{key}/blast-radius — the drill for that one component.
import { respond } from "@/lib/api/respond";
import { drillResponseSchema } from "@/lib/api/schemas/analysis";
import { parseParams } from "@/lib/api/query";
import { componentParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { analysisMeta, getServedAnalysis } from "@/lib/data/environment-analysis";
import { runDrill } from "@/lib/data/snapshot-graph";
import { AppError } from "@/lib/errors";

export const GET = withPermission<{ env: string; key: string }>("read", async ({ params }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const served = await getServedAnalysis({ slug: env });
  try {
    const result = await runDrill({ environmentId: served.environment.id, snapshot: served.snapshot, request: { components: [key] } });
    return respond(drillResponseSchema, { ...analysisMeta(served), ...result });
  } catch (error) {
    // On this route an unknown key is a missing resource, not a bad body.
    if (error instanceof AppError && error.code === "invalid_request") throw new AppError("not_found", `Component "${key}" not found`);
    throw error;
  }
});
