// The snapshot the analysis API serves for an environment, or a clear 404 when there is none yet.
import "server-only";
import { DEFAULT_PINCH_WEIGHTS, type PinchWeights } from "@/lib/analysis/types";
import { AppError, notFound } from "@/lib/errors";
import { getServedState, type AnalysisView, type SnapshotRef } from "./analysis-results";
import { graphViewOf, type GraphView } from "./graph-view";
import type { EnvironmentRef } from "./environments";

export interface ServedAnalysis {
  environment: EnvironmentRef;
  view: AnalysisView;
  snapshot: SnapshotRef;
  /** which needs the served analysis ran on: declared, observed or both (DESIGN §10) */
  graphView: GraphView;
  /** changes whenever what an analysis response shows could change (for ETags and the page cache) */
  version: string;
}

export async function getServedAnalysis({ slug }: { slug: string }): Promise<ServedAnalysis> {
  const state = await getServedState({ slug });
  if (!state) throw notFound(`Environment "${slug}"`);
  const { view } = state;
  const environment: EnvironmentRef = { ...state.environment, pinchWeights: (state.environment.pinchWeights as PinchWeights | null) ?? DEFAULT_PINCH_WEIGHTS };
  if (!view.served) {
    const status = view.latestAnalysis.status;
    throw new AppError("not_found", view.latest ? `No finished analysis yet (the newest is ${status}); try again shortly` : `Nothing has been pushed to "${slug}" yet`);
  }
  const graphView = await graphViewOf({ environmentId: environment.id, snapshotId: view.served.id, settings: state.environment.settings });
  return { environment, view, snapshot: view.served, graphView, version: state.version };
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
      measures: measureStatus(view),
    },
    /** the newest snapshot may still be in analysis: say so, so nobody reads stale ranks as current */
    latest: view.latest && view.latest.id !== snapshot.id ? { number: view.latest.number, status: view.latestAnalysis.status, progress: view.latestAnalysis.progress, phase: view.latestAnalysis.phase } : null,
  };
}

/**
 * Whether the iterative measures converged (a value that did not is served as null, and the reason
 * is said here) and how far the per-entry dominators got. Analyses from before this was recorded
 * say nothing: `null`.
 */
function measureStatus({ summary }: AnalysisView) {
  const status = (m: { converged: boolean; reason: string | null } | undefined) => (m ? { converged: m.converged, reason: m.reason } : null);
  return {
    pagerank: status(summary?.pagerank),
    eigenvector: status(summary?.eigenvector),
    dominators: summary?.dominators ?? null,
  };
}
