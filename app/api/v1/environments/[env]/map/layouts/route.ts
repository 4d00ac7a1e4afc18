// GET /api/v1/environments/{env}/map/layouts — the map's positions, laid out by the worker per snapshot and view.
import { respond } from "@/lib/api/respond";
import { mapLayoutsResponseSchema } from "@/lib/api/schemas/map";
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getMapLayouts } from "@/lib/data/map-layouts";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(mapLayoutsResponseSchema, await getMapLayouts({ environmentId: environment.id }));
});
