// GET /api/v1/tokens — list (admin); POST /api/v1/tokens — create, the secret shown once (admin).
import { respond } from "@/lib/api/respond";
import { createdTokenSchema, tokensResponseSchema } from "@/lib/api/schemas/tokens";
import { readJson } from "@/lib/api/query";
import { createTokenSchema } from "@/lib/api/schemas/tokens";
import { withPermission } from "@/lib/auth/with-permission";
import { createTokenAsAdmin } from "@/lib/data/token-admin";
import { listTokens } from "@/lib/data/tokens";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission("admin", async () => respond(tokensResponseSchema, { items: await listTokens() }));

export const POST = withPermission("admin", async ({ req, actor }) => {
  const input = parseOrThrow(createTokenSchema, await readJson(req), "body");
  const { token, info } = await createTokenAsAdmin({ input, actor });
  return respond(createdTokenSchema, { ...info, token }, { status: 201, headers: { "cache-control": "no-store" } });
});
