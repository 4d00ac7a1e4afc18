// GET /api/v1/users — list people (admin); POST /api/v1/users — invite by e-mail with a one-time link (admin).
import { respond } from "@/lib/api/respond";
import { inviteResultSchema, usersResponseSchema } from "@/lib/api/schemas/users";
import { readJson } from "@/lib/api/query";
import { inviteUserSchema } from "@/lib/api/schemas/users";
import { withPermission } from "@/lib/auth/with-permission";
import { inviteUser, listUsers } from "@/lib/data/user-admin";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission("admin", async () => respond(usersResponseSchema, { items: await listUsers() }));

export const POST = withPermission("admin", async ({ req, actor }) => {
  const input = parseOrThrow(inviteUserSchema, await readJson(req), "body");
  const result = await inviteUser({ input, actor });
  // The link carries a secret: never cached anywhere on the way back.
  return respond(inviteResultSchema, result, { status: 201, headers: { "cache-control": "no-store" } });
});
