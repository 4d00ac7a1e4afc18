// POST /api/v1/users/{id}/invite — a fresh one-time link for someone who has not set a password (admin).
import { respond } from "@/lib/api/respond";
import { inviteResultSchema } from "@/lib/api/schemas/users";
import { parseParams } from "@/lib/api/query";
import { userParamsSchema } from "@/lib/api/schemas/users";
import { withPermission } from "@/lib/auth/with-permission";
import { reissueInvite } from "@/lib/data/user-admin";

export const POST = withPermission<{ id: string }>("admin", async ({ params, actor }) => {
  const { id } = parseParams(params, userParamsSchema);
  return respond(inviteResultSchema, await reissueInvite({ id, actor }), { status: 201, headers: { "cache-control": "no-store" } });
});
