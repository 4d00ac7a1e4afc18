// GET /api/v1/environments/{env}/snapshots[?limit=&offset=&sort=&order=&q=] — history, newest first.
import { parseParams, parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { snapshotsQuerySchema, snapshotsResponseSchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { listSnapshots } from "@/lib/data/snapshots";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, snapshotsQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(snapshotsResponseSchema, await listSnapshots({ environmentId: environment.id, query }));
});
