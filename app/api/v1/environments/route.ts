// GET /api/v1/environments — every environment with its latest snapshot and analysis status.
// POST /api/v1/environments — create an empty environment `{ slug, name? }` (admin; 409 if the slug exists).
import { respond } from "@/lib/api/respond";
import { environmentSummarySchema, environmentsResponseSchema } from "@/lib/api/schemas/environments";
import { readJson } from "@/lib/api/query";
import { createEnvironmentSchema } from "@/lib/api/schemas/environments";
import { withPermission } from "@/lib/auth/with-permission";
import { createEnvironmentAsAdmin } from "@/lib/data/environment-admin";
import { listEnvironments } from "@/lib/data/environments";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission(
  "read",
  async ({ actor }) => {
    const items = await listEnvironments();
    // A token bound to one environment sees only that one.
    const bound = actor.type === "token" ? actor.environmentId : null;
    return respond(environmentsResponseSchema, { items: bound ? items.filter((e) => e.id === bound) : items });
  },
  { acrossEnvironments: true },
);

export const POST = withPermission("admin", async ({ req, actor }) => {
  const input = parseOrThrow(createEnvironmentSchema, await readJson(req), "body");
  return respond(environmentSummarySchema, await createEnvironmentAsAdmin({ input, actor }), { status: 201 });
});
