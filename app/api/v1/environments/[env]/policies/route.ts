// GET /api/v1/environments/{env}/policies — the change policies in force, with the defaults (read).
// PUT — the whole policy set (reviews:write): save and audit. Pushes are held to it from then on.
import { respond } from "@/lib/api/respond";
import { policiesViewSchema } from "@/lib/api/schemas/policies";
import { parseParams, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getPolicies, setPolicies } from "@/lib/data/change-policies";
import { parseOrThrow } from "@/lib/errors";
import { policySetSchema } from "@/lib/impact/policies";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(policiesViewSchema, await getPolicies({ environmentId: environment.id }));
});

export const PUT = withPermission<{ env: string }>("reviews:write", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const policies = parseOrThrow(policySetSchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(policiesViewSchema, await setPolicies({ environmentId: environment.id, policies, actor }));
});
