// GET /api/v1/teams/{slug}[?limit=&offset=&sort=&order=&environment=&q=] — members, contact, pinch points, and a page of
// its components across environments (read).
// PATCH — `{ name?, email?, oncall?, description? }`: admins any field, a lead of the team its contact fields; audited.
import { respond } from "@/lib/api/respond";
import { teamDetailSchema, teamRecordSchema } from "@/lib/api/schemas/teams";
import { parseParams, parseQuery, readJson } from "@/lib/api/query";
import { teamParamsSchema, teamQuerySchema, updateTeamSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { getTeamDetail, updateTeam } from "@/lib/data/team-admin";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ slug: string }>("read", async ({ req, params }) => {
  const { slug } = parseParams(params, teamParamsSchema);
  const query = parseQuery(req.url, teamQuerySchema);
  return respond(teamDetailSchema, await getTeamDetail({ slug, query }));
});

// components:annotate lets leads in; which team and which fields is decided in updateTeam.
export const PATCH = withPermission<{ slug: string }>("components:annotate", async ({ req, params, actor }) => {
  const { slug } = parseParams(params, teamParamsSchema);
  const input = parseOrThrow(updateTeamSchema, await readJson(req), "body");
  return respond(teamRecordSchema, await updateTeam({ slug, input, actor }));
});
