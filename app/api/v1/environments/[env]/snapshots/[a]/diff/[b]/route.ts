// GET /api/v1/environments/{env}/snapshots/{a}/diff/{b} — what changed from snapshot a to b.
import { respond } from "@/lib/api/respond";
import { diffResponseSchema } from "@/lib/api/schemas/history";
import { parseParams } from "@/lib/api/query";
import { diffParamsSchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { diffBetween } from "@/lib/data/snapshots";

export const GET = withPermission<{ env: string; a: string; b: string }>("read", async ({ params }) => {
  const { env, a, b } = parseParams(params, diffParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(diffResponseSchema, await diffBetween({ environmentId: environment.id, a, b }));
});
