// GET /api/v1/environments/{env}/components[?team=&kind=&tier=&q=&unowned=true&sort=&order=&limit=&offset=]
// — one page of the component list, and the environment's counts.
import { parseParams, parseQuery } from "@/lib/api/query";
import { respond } from "@/lib/api/respond";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { componentsQuerySchema, componentsResponseSchema } from "@/lib/api/schemas/components";
import { withPermission } from "@/lib/auth/with-permission";
import { countComponents, listComponents } from "@/lib/data/components";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, componentsQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  const [page, counts] = await Promise.all([listComponents({ environmentId: environment.id, query }), countComponents({ environmentId: environment.id })]);
  return respond(componentsResponseSchema, { environment: environment.slug, counts, ...page });
});
