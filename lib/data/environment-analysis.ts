// The snapshot the analysis API serves for an environment, or a clear 404 when there is none yet.
import { AppError } from "@/lib/errors";
import { getAnalysisView, type AnalysisView, type SnapshotRef } from "./analysis-results";
import { graphViewOf, type GraphView } from "./graph-view";
import { getEnvironmentOrThrow, type EnvironmentRef } from "./environments";

export interface ServedAnalysis {
  environment: EnvironmentRef;
  view: AnalysisView;
  snapshot: SnapshotRef;
  /** which needs the served analysis ran on: declared, observed or both (DESIGN §10) */
  graphView: GraphView;
}

export async function getServedAnalysis({ slug, withGraph = false }: { slug: string; withGraph?: boolean }): Promise<ServedAnalysis> {
  const environment = await getEnvironmentOrThrow({ slug });
  const view = await getAnalysisView({ environmentId: environment.id, withGraph });
  if (!view.served) {
    const status = view.latestAnalysis.status;
    throw new AppError("not_found", view.latest ? `No finished analysis yet (the newest is ${status}); try again shortly` : `Nothing has been pushed to "${slug}" yet`);
  }
  return { environment, view, snapshot: view.served, graphView: await graphViewOf({ environmentId: environment.id, snapshotId: view.served.id }) };
}

/** The analysis block every analysis response carries (DESIGN §4), plus snapshot age and the undeclared share. */
export function analysisMeta({ view, snapshot, graphView }: { view: AnalysisView; snapshot: SnapshotRef; graphView?: GraphView }) {
  return {
    ...(graphView ? { graphView } : {}),
    snapshot: { number: snapshot.number, createdAt: snapshot.createdAt, ageSeconds: Math.round((Date.now() - Date.parse(snapshot.createdAt)) / 1000), components: snapshot.componentCount, undeclared: snapshot.undeclaredCount, undeclaredShare: snapshot.componentCount ? snapshot.undeclaredCount / snapshot.componentCount : 0 },
    analysis: {
      status: view.servedAnalysis?.status ?? "none",
      computedAt: view.servedAnalysis?.computedAt ?? null,
      exact: view.servedAnalysis?.exact ?? null,
      ...(view.servedAnalysis?.exact === false ? { sampleSize: view.servedAnalysis.sampleSize } : {}),
    },
    /** the newest snapshot may still be in analysis: say so, so nobody reads stale ranks as current */
    latest: view.latest && view.latest.id !== snapshot.id ? { number: view.latest.number, status: view.latestAnalysis.status, progress: view.latestAnalysis.progress, phase: view.latestAnalysis.phase } : null,
  };
}
