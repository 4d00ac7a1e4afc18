// GET /api/v1/environments/{env}/snapshots[?limit=&offset=] — history, newest first.
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { pageQuerySchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { listSnapshots } from "@/lib/data/snapshots";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const page = parseQuery(req.url, pageQuerySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return NextResponse.json(await listSnapshots({ environmentId: environment.id, ...page }));
});
