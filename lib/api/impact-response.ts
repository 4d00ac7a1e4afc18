// The answer of a push that carries an impact, in the format the caller asked for: the usual JSON,
// the impact alone as a Markdown pull-request comment, or as a SARIF 2.1.0 log. The HTTP status
// stays 200 whatever the policies say (CI decides from the body); `Pinchpoint-Impact` tells the
// verdict without parsing it.
import { NextResponse } from "next/server";
import { respond } from "./respond";
import { pushResultSchema } from "./schemas/inventory";
import { appUrl } from "@/lib/config";
import { impactMarkdown } from "@/lib/impact/markdown";
import { impactSarif } from "@/lib/impact/sarif";
import type { PushResult } from "@/lib/data/push";
import type { ImportFormat } from "@/lib/inventory/types";
import type { ImpactFormat } from "./schemas/inventory";

/** The file name a finding points at when the caller names none (`file=`). */
const DEFAULT_FILE: Record<ImportFormat, string> = {
  pinchpoint: "pinchpoint.yaml",
  compose: "compose.yaml",
  csv: "inventory.csv",
  otlp: "traces.json",
  kubernetes: "manifests.yaml",
};

export function pushResponse(result: PushResult, { impactFormat, file, format, env }: { impactFormat: ImpactFormat; file: string | undefined; format: ImportFormat; env: string }): Response {
  const impact = result.impact;
  if (!impact || impactFormat === "json") return respond(pushResultSchema, result);
  const verdict = { "Pinchpoint-Impact": !impact.changed ? "unchanged" : impact.blocked ? "blocked" : impact.summary.policiesFailed ? "warn" : "pass" };
  const path = file ?? DEFAULT_FILE[format];
  if (impactFormat === "markdown") {
    return new NextResponse(impactMarkdown(impact, { file: path }), { headers: { "content-type": "text/markdown; charset=utf-8", ...verdict } });
  }
  const policiesUrl = `${appUrl().replace(/\/$/, "")}/environments/${env}/policies`;
  return new NextResponse(JSON.stringify(impactSarif(impact, { file: path, policiesUrl }), null, 2), { headers: { "content-type": "application/sarif+json", ...verdict } });
}
