// POST /api/v1/environments/{env}/alerts — the alert webhook: Pinchpoint alerts or an Alertmanager
// webhook body (lib/incidents/payload.ts), with `Authorization: Bearer ppt_…`; parsed whole, then applied.
import { respond } from "@/lib/api/respond";
import { receiveAlertsResponseSchema } from "@/lib/api/schemas/incidents";
import { parseParams, parseQuery, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { alertsQuerySchema } from "@/lib/api/schemas/incidents";
import { withPermission } from "@/lib/auth/with-permission";
import { receiveAlerts } from "@/lib/data/incidents";
import { parseAlertPayload } from "@/lib/incidents/payload";

export const POST = withPermission<{ env: string }>("inventory:write", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const { format } = parseQuery(req.url, alertsQuerySchema);
  const parsed = parseAlertPayload(await readJson(req), format);
  return respond(receiveAlertsResponseSchema, await receiveAlerts({ slug: env, actor, parsed }));
});
