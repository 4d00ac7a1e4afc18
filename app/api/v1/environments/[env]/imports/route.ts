// GET /api/v1/environments/{env}/imports[?limit=&offset=&sort=&order=&q=&format=] — accepted pushes and uploads: who, when, what.
import { parseParams, parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { importsQuerySchema, importsResponseSchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { listImports } from "@/lib/data/snapshots";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, importsQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(importsResponseSchema, await listImports({ environmentId: environment.id, query }));
});
