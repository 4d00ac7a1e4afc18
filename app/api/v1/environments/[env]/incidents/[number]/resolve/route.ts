// POST /api/v1/environments/{env}/incidents/{number}/resolve — `{ reason }`: close an incident by
// hand when its alert source never sends resolved alerts; its firing alerts end now. Audited.
import { respond } from "@/lib/api/respond";
import { resolvedIncidentSchema } from "@/lib/api/schemas/incidents";
import { parseParams, readJson } from "@/lib/api/query";
import { incidentParamsSchema, resolveIncidentSchema } from "@/lib/api/schemas/incidents";
import { withPermission } from "@/lib/auth/with-permission";
import { resolveIncident } from "@/lib/data/incidents";
import { parseOrThrow } from "@/lib/errors";

export const POST = withPermission<{ env: string; number: string }>("inventory:write", async ({ req, params, actor }) => {
  const { env, number } = parseParams(params, incidentParamsSchema);
  const { reason } = parseOrThrow(resolveIncidentSchema, await readJson(req), "body");
  return respond(resolvedIncidentSchema, { incident: await resolveIncident({ slug: env, number, actor, reason }) });
});
