// GET /api/v1/environments/{env}/components/{key}/history — the snapshots (last 30) that added,
// changed or removed this component or one of its dependencies, newest first.
import { respond } from "@/lib/api/respond";
import { componentHistoryResponseSchema } from "@/lib/api/schemas/components";
import { parseParams } from "@/lib/api/query";
import { componentParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getComponentHistory } from "@/lib/data/component-history";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

export const GET = withPermission<{ env: string; key: string }>("read", async ({ params }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(componentHistoryResponseSchema, { key, ...(await getComponentHistory({ environmentId: environment.id, key })) });
});
