// GET /api/v1/teams — every team with member, component and pinch-point counts (read).
// POST /api/v1/teams — create a team (admin), audited.
import { respond } from "@/lib/api/respond";
import { teamRecordSchema, teamsResponseSchema } from "@/lib/api/schemas/teams";
import { readJson } from "@/lib/api/query";
import { createTeamSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { createTeam, listTeamOverview } from "@/lib/data/team-admin";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission("read", async () => respond(teamsResponseSchema, await listTeamOverview()));

export const POST = withPermission("admin", async ({ req, actor }) => {
  const input = parseOrThrow(createTeamSchema, await readJson(req), "body");
  return respond(teamRecordSchema, await createTeam({ input, actor }), { status: 201 });
});
