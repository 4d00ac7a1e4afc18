// PATCH /api/v1/users/{id} — change role and/or deactivate / reactivate (admin; never oneself).
import { respond } from "@/lib/api/respond";
import { adminUserSchema } from "@/lib/api/schemas/users";
import { parseParams, readJson } from "@/lib/api/query";
import { updateUserSchema, userParamsSchema } from "@/lib/api/schemas/users";
import { withPermission } from "@/lib/auth/with-permission";
import { updateUser } from "@/lib/data/user-admin";
import { parseOrThrow } from "@/lib/errors";

export const PATCH = withPermission<{ id: string }>("admin", async ({ req, params, actor }) => {
  const { id } = parseParams(params, userParamsSchema);
  const input = parseOrThrow(updateUserSchema, await readJson(req), "body");
  return respond(adminUserSchema, await updateUser({ id, input, actor }));
});
