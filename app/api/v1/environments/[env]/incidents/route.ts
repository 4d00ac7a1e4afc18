// GET /api/v1/environments/{env}/incidents[?limit=&offset=&sort=&order=&status=] — incidents, newest first by
// default, each with its origin ranking, beside the components that caused them and the top of the ranking.
import { parseParams, parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { incidentHistoryResponseSchema, incidentsQuerySchema } from "@/lib/api/schemas/incidents";
import { withPermission } from "@/lib/auth/with-permission";
import { listIncidents } from "@/lib/data/incidents";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, incidentsQuerySchema);
  return respond(incidentHistoryResponseSchema, await listIncidents({ slug: env, query }));
});
