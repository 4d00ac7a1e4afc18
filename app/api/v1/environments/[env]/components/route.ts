// GET /api/v1/environments/{env}/components[?team=&kind=&q=&unowned=true] — the component list.
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { componentsQuerySchema } from "@/lib/api/schemas/inventory";
import { withPermission } from "@/lib/auth/with-permission";
import { countComponents, listComponents } from "@/lib/data/components";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const filter = parseQuery(req.url, componentsQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  const [items, counts] = await Promise.all([
    listComponents({ environmentId: environment.id, filter }),
    countComponents({ environmentId: environment.id }),
  ]);
  return NextResponse.json({ environment: environment.slug, counts, items });
});
