// GET /api/v1/environments/{env}/components[?team=&kind=&q=&unowned=true] — the component list.
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseParams, parseQuery } from "@/lib/api/query";
import { booleanParam, envParamsSchema, kindSchema, slugSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { countComponents, listComponents } from "@/lib/data/components";
import { getEnvironmentOrThrow } from "@/lib/data/environments";

const querySchema = z
  .object({
    team: slugSchema.optional(),
    kind: kindSchema.optional(),
    q: z.string().max(128).optional(),
    unowned: booleanParam.optional(),
  })
  .strict();

export const GET = withPermission<{ env: string }>("read", async ({ req, params }) => {
  const { env } = parseParams(params, envParamsSchema);
  const filter = parseQuery(req.url, querySchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  const [items, counts] = await Promise.all([
    listComponents({ environmentId: environment.id, filter }),
    countComponents({ environmentId: environment.id }),
  ]);
  return NextResponse.json({ environment: environment.slug, counts, items });
});
