// GET /api/v1/environments/{env}/components/{key} — everything known about one component.
// PATCH — `{ team?, notes? }`: owner and notes (lead of the team, architect, admin), audited.
import { respond } from "@/lib/api/respond";
import { annotationResultSchema, componentDetailResponseSchema } from "@/lib/api/schemas/components";
import { parseParams, readJson } from "@/lib/api/query";
import { annotateBodySchema } from "@/lib/api/schemas/components";
import { componentParamsSchema } from "@/lib/api/schemas/common";
import { withPermission } from "@/lib/auth/with-permission";
import { getAnalysisView } from "@/lib/data/analysis-results";
import { annotateComponent } from "@/lib/data/annotations";
import { getComponentDetail, getComponentMetrics } from "@/lib/data/component-detail";
import { getEnvironmentOrThrow } from "@/lib/data/environments";
import { entryDominators } from "@/lib/data/snapshot-graph";
import { parseOrThrow } from "@/lib/errors";

export const GET = withPermission<{ env: string; key: string }>("read", async ({ params }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const environment = await getEnvironmentOrThrow({ slug: env });
  const [detail, view] = await Promise.all([getComponentDetail({ environmentId: environment.id, key }), getAnalysisView({ environmentId: environment.id })]);
  const metrics = view.served ? await getComponentMetrics({ snapshotId: view.served.id, key }) : null;
  // An entry point also shows what every path from it passes through (one dominator tree, on demand).
  const fromHere = view.served && metrics?.entry ? await entryDominators({ snapshotId: view.served.id, entry: key }) : null;
  const summary = view.summary;
  return respond(componentDetailResponseSchema, {
    ...detail,
    metrics,
    fromHere,
    snapshot: view.served ? { number: view.served.number, createdAt: view.served.createdAt } : null,
    measures: {
      pagerank: summary?.pagerank ? { converged: summary.pagerank.converged, reason: summary.pagerank.reason } : null,
      eigenvector: summary?.eigenvector ? { converged: summary.eigenvector.converged, reason: summary.eigenvector.reason } : null,
      dominators: summary?.dominators ?? null,
    },
  });
});

export const PATCH = withPermission<{ env: string; key: string }>("components:annotate", async ({ req, params, actor }) => {
  const { env, key } = parseParams(params, componentParamsSchema);
  const input = parseOrThrow(annotateBodySchema, await readJson(req), "body");
  const environment = await getEnvironmentOrThrow({ slug: env });
  return respond(annotationResultSchema, await annotateComponent({ environmentId: environment.id, key, input, actor }));
});
