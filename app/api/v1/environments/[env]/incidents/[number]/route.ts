// GET /api/v1/environments/{env}/incidents/{number} — one incident, its alerts with their lifetimes
// and the origin ranking from when the most components fired.
import { respond } from "@/lib/api/respond";
import { incidentDetailResponseSchema } from "@/lib/api/schemas/incidents";
import { parseParams } from "@/lib/api/query";
import { incidentParamsSchema } from "@/lib/api/schemas/incidents";
import { withPermission } from "@/lib/auth/with-permission";
import { getIncident } from "@/lib/data/incidents";

export const GET = withPermission<{ env: string; number: string }>("read", async ({ params }) => {
  const { env, number } = parseParams(params, incidentParamsSchema);
  return respond(incidentDetailResponseSchema, await getIncident({ slug: env, number }));
});
