// GET /api/v1/environments/{env}/map/positions — pinned positions; PUT replaces them (lead+).
import { respond } from "@/lib/api/respond";
import { positionsResponseSchema } from "@/lib/api/schemas/map";
import { parseParams, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { positionsSchema } from "@/lib/api/schemas/map";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getPositions, savePositions } from "@/lib/data/map-positions";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(positionsResponseSchema, { positions: await getPositions({ environmentId: environment.id }) });
});

export const PUT = withPermission<{ env: string }>("components:annotate", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const positions = parseOrThrow(positionsSchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(positionsResponseSchema, { positions: await savePositions({ environmentId: environment.id, positions, actor }) });
});
