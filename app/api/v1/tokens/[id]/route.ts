// DELETE /api/v1/tokens/{id} — revoke (admin). The row stays, marked revoked, for the audit trail.
import { respond } from "@/lib/api/respond";
import { tokenInfoSchema } from "@/lib/api/schemas/tokens";
import { parseParams } from "@/lib/api/query";
import { tokenParamsSchema } from "@/lib/api/schemas/tokens";
import { withPermission } from "@/lib/auth/with-permission";
import { revokeTokenAsAdmin } from "@/lib/data/token-admin";

export const DELETE = withPermission<{ id: string }>("admin", async ({ params, actor }) => {
  const { id } = parseParams(params, tokenParamsSchema);
  return respond(tokenInfoSchema, await revokeTokenAsAdmin({ id, actor }));
});
