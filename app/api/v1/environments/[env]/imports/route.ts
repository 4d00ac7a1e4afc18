// GET /api/v1/environments/{env}/imports[?limit=&offset=] — accepted pushes and uploads: who, when, what.
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { pageQuerySchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { listImports } from "@/lib/data/snapshots";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const page = parseQuery(req.url, pageQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return NextResponse.json(await listImports({ environmentId: environment.id, ...page }));
});
