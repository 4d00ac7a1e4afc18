// POST /api/v1/environments/{env}/otlp/v1/traces — the OTLP/HTTP trace receiver. A Collector's
// otlphttp exporter (endpoint …/environments/{env}/otlp, which it completes with /v1/traces) or an
// SDK exporter sends here with `Authorization: Bearer ppt_…`; protobuf or JSON, gzip or not.
import { parseParams } from "@/lib/api/query";
import { envParamsSchema } from "@/lib/api/schemas/common";
import { decodeOtlpSpans, otlpErrorResponse, otlpSuccess, readOtlpBody } from "@/lib/api/otlp";
import { withPermission } from "@/lib/auth/with-permission";
import { receiveTraces } from "@/lib/data/traces";

export const POST = withPermission<{ env: string }>(
  "inventory:write",
  async ({ req, params, actor }) => {
    const { env } = parseParams(params, envParamsSchema);
    const { encoding, bytes } = await readOtlpBody(req);
    const { spans, rejected } = decodeOtlpSpans(encoding, bytes);
    const result = await receiveTraces({ environment: env, actor, spans, rejected });
    const warning = result.duplicates > 0 ? `${result.duplicates} spans repeated a trace and span id already received; each span counts once` : undefined;
    return otlpSuccess(encoding, result.rejected, warning);
  },
  { renderError: otlpErrorResponse },
);
