// GET /api/v1/environments/{env}/settings — the environment's settings with defaults filled in (read).
// PATCH — any subset of the settings (reviews:write): save, audit, re-queue the analysis when it reads them.
import { respond } from "@/lib/api/respond";
import { settingsViewSchema } from "@/lib/api/schemas/environments";
import { parseParams, readJson } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { settingsPatchSchema } from "@/lib/api/schemas/environments";
import { withPermission } from "@/lib/auth/with-permission";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { getEnvironmentSettings, updateEnvironmentSettings } from "@/lib/data/environment-settings";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ env: string }>("read", async ({ params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(settingsViewSchema, await getEnvironmentSettings({ environmentId: environment.id }));
});

export const PATCH = withPermission<{ env: string }>("reviews:write", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const changes = parseOrThrow(settingsPatchSchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(settingsViewSchema, await updateEnvironmentSettings({ environmentId: environment.id, changes, actor }));
});
