// POST /api/v1/invites/{token} — the invitee sets their password, once (public: the link is the credential).
import { respond } from "@/lib/api/respond";
import { acceptedInviteSchema } from "@/lib/api/schemas/users";
import { parseParams, readJson } from "@/lib/api/query";
import { acceptInviteSchema, inviteParamsSchema } from "@/lib/api/schemas/users";
import { withPermission } from "@/lib/auth/with-permission";
import { acceptInvite } from "@/lib/data/user-admin";
import { parseOrThrow } from "@/lib/errors";

export const POST = withPermission<{ token: string }>("public", async ({ req, params }) => {
  const { token } = parseParams(params, inviteParamsSchema);
  const input = parseOrThrow(acceptInviteSchema, await readJson(req), "body");
  return respond(acceptedInviteSchema, await acceptInvite({ token, input }), { headers: { "cache-control": "no-store" } });
});
