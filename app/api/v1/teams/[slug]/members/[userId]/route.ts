// DELETE /api/v1/teams/{slug}/members/{userId} — take a user out of the team (admin), audited.
import { respond } from "@/lib/api/respond";
import { memberRemovedSchema } from "@/lib/api/schemas/teams";
import { parseParams } from "@/lib/api/query";
import { memberParamsSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { removeTeamMember } from "@/lib/data/team-admin";

export const DELETE = withPermission<{ slug: string; userId: string }>("admin", async ({ params, actor }) => {
  const { slug, userId } = parseParams(params, memberParamsSchema);
  return respond(memberRemovedSchema, await removeTeamMember({ slug, userId, actor }));
});
