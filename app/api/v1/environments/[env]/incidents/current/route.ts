// GET /api/v1/environments/{env}/incidents/current — what fires now, the probable origin(s), what
// will likely fail next and who to page, read against the newest snapshot; a copyable summary.
import { respond } from "@/lib/api/respond";
import { currentIncidentResponseSchema } from "@/lib/api/schemas/incidents";
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { appUrl } from "@/lib/config";
import { getCurrentIncident } from "@/lib/data/incidents";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const link = `${appUrl().replace(/\/$/, "")}/environments/${env}/incidents`;
  return respond(currentIncidentResponseSchema, await getCurrentIncident({ slug: env, link }));
});
