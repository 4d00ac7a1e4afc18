// POST /api/v1/environments/{env}/inventory[?dry_run=true][&format=…&source=…&profiles=…][&kubernetes settings]
// [&impact=true&impact_format=json|markdown|sarif&file=…][&override_reason=…] — push an inventory, as one
// body or, for a layered Compose project, as several files in a multipart body.
import { NextResponse } from "next/server";
import { parseParams, parseQuery } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { kubernetesOptionsOf, pushQuerySchema } from "@/lib/api/schemas/inventory";
import { pushResponse } from "@/lib/api/impact-response";
import { withPermission } from "@/lib/auth/with-permission";
import { pushInventory } from "@/lib/data/push";
import { bodyChunks, readBodyWithLimit } from "@/lib/api/body";
import { isMultipart, readPushedFiles } from "@/lib/api/multipart";
import { pushTraceFile } from "@/lib/data/traces";

export const POST = withPermission<{ env: string }>("inventory:write", async ({ req, params, actor }) => {
  const { env } = parseParams(params, envParamsSchema);
  const query = parseQuery(req.url, pushQuerySchema);
  if (query.format === "otlp") {
    // Trace files are folded as they stream in, so they may be larger than the inventory limit.
    return NextResponse.json(await pushTraceFile({ environment: env, source: query.source ?? null, chunks: bodyChunks(req), dryRun: query.dry_run ?? false, actor }));
  }
  const contentType = req.headers.get("content-type");
  const files = isMultipart(contentType) ? await readPushedFiles(req) : undefined;
  const body = files ? Buffer.alloc(0) : await readBodyWithLimit(req);
  const format = query.format ?? "pinchpoint";
  const result = await pushInventory({
    environment: env,
    format,
    body,
    files,
    profiles: query.profiles,
    contentType: files ? null : contentType,
    source: query.source ?? null,
    dryRun: query.dry_run ?? false,
    kubernetes: kubernetesOptionsOf(query),
    impact: query.impact === true || query.impact_format !== undefined,
    overrideReason: query.override_reason ?? null,
    actor,
  });
  return pushResponse(result, { impactFormat: query.impact_format ?? "json", file: query.file ?? (files?.length === 1 ? files[0]?.name : undefined), format, env });
});
