// POST /api/v1/teams/{slug}/members — `{ email, lead? }`: add a user to the team or change whether they lead it (admin), audited.
import { respond } from "@/lib/api/respond";
import { teamMemberSchema } from "@/lib/api/schemas/teams";
import { parseParams, readJson } from "@/lib/api/query";
import { addMemberSchema, teamParamsSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { addTeamMember } from "@/lib/data/team-admin";
import { parseOrThrow } from "@/lib/errors";

export const POST = withPermission<{ slug: string }>("admin", async ({ req, params, actor }) => {
  const { slug } = parseParams(params, teamParamsSchema);
  const input = parseOrThrow(addMemberSchema, await readJson(req), "body");
  return respond(teamMemberSchema, await addTeamMember({ slug, input, actor }));
});
