// GET /api/v1/environments/{env} — one environment's summary with its component counts (read).
// PATCH — rename `{ name }` (admin). DELETE ?confirm=<slug> — delete it and everything of it (admin).
import { respond } from "@/lib/api/respond";
import { deletedEnvironmentSchema, environmentResponseSchema, environmentSummarySchema } from "@/lib/api/schemas/environments";
import { parseParams, parseQuery, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { deleteEnvironmentQuerySchema, renameEnvironmentSchema } from "@/lib/api/schemas/environments";
import { withPermission } from "@/lib/auth/with-permission";
import { deleteEnvironmentAsAdmin, renameEnvironmentAsAdmin } from "@/lib/data/environment-admin";
import { getEnvironmentSummaryOrThrow } from "@/lib/data/environments";
import { countComponents, listZones } from "@/lib/data/components";
import { parseOrThrow } from "@/lib/errors";

type Params = { env: string };

export const GET = withPermission<Params>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const summary = await getEnvironmentSummaryOrThrow({ slug: env });
  const [counts, zones] = await Promise.all([countComponents({ environmentId: summary.id }), listZones({ environmentId: summary.id })]);
  return respond(environmentResponseSchema, { ...summary, counts, zones });
});

export const PATCH = withPermission<Params>("admin", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const input = parseOrThrow(renameEnvironmentSchema, await readJson(req), "body");
  return respond(environmentSummarySchema, await renameEnvironmentAsAdmin({ slug: env, input, actor }));
});

export const DELETE = withPermission<Params>("admin", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const { confirm } = parseQuery(req.url, deleteEnvironmentQuerySchema);
  return respond(deletedEnvironmentSchema, await deleteEnvironmentAsAdmin({ slug: env, confirm, actor }));
});
