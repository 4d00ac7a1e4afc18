// GET /api/v1/environments/{env}/incidents — incidents newest first, each with its origin ranking,
// beside the components that caused them and the top of the pinch-point ranking.
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { pageQuerySchema } from "@/lib/api/schemas/history";
import { withPermission } from "@/lib/auth/with-permission";
import { listIncidents } from "@/lib/data/incidents";

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const { limit, offset } = parseQuery(req.url, pageQuerySchema);
  return NextResponse.json(await listIncidents({ slug: env, limit, offset }));
});
