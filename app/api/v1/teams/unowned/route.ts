// GET /api/v1/teams/unowned[?environment=&q=&sort=&order=&limit=&offset=] — components with no owner in any environment, most pinching first (read).
// Claiming and assigning go through PATCH /api/v1/environments/{env}/components/{key}.
import { respond } from "@/lib/api/respond";
import { parseQuery } from "@/lib/api/query";
import { unownedQuerySchema, unownedResponseSchema } from "@/lib/api/schemas/teams";
import { withPermission } from "@/lib/auth/with-permission";
import { listUnowned } from "@/lib/data/team-admin";

export const GET = withPermission("read", async ({ req }) => {
  return respond(unownedResponseSchema, await listUnowned(parseQuery(req.url, unownedQuerySchema)));
});
