// GET /api/v1/environments/{env}/graph — components, dependencies and measures for the map.
import { respond } from "@/lib/api/respond";
import { mapGraphSchema } from "@/lib/api/schemas/map";
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getMapGraph } from "@/lib/data/map-graph";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(mapGraphSchema, await getMapGraph({ environmentId: environment.id, slug: environment.slug }));
});
