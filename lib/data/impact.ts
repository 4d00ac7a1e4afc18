// The impact of a push on the estate's failure points (DESIGN §10, Impact), inside the push's own
// transaction: what a dry run reports on request, and what a real push is held to when the
// environment has a policy at `block`. A blocked push is refused unless an architect or admin
// gives a reason, which is audited with the push.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { appUrl } from "@/lib/config";
import { AppError, forbidden } from "@/lib/errors";
import { ranksByKey } from "@/lib/analysis/rank";
import { DEFAULT_PINCH_WEIGHTS, pinchWeightsSchema, type PinchWeights } from "@/lib/analysis/types";
import { impactOf, type ImpactReport, type StoredAnalysis } from "@/lib/impact";
import type { MeasureFacts } from "@/lib/impact/compare";
import type { ReviewState } from "@/lib/impact/evaluate";
import { locatorFor } from "@/lib/impact/locate";
import { hasBlockingRule } from "@/lib/impact/policies";
import { readSettings } from "@/lib/inventory/settings";
import type { SnapshotContent, SnapshotDiff } from "@/lib/inventory/snapshot";
import type { InventoryIssue, NormalisedInventory } from "@/lib/inventory/types";
import { recordAudit, type SystemActor } from "./audit";
import { readEnvironmentPolicies } from "./change-policies";

/**
 * The worker's analysis of the newest snapshot, when it is what a fresh analysis of the current
 * graph would give: done, of the newest snapshot (the tables hold that snapshot's graph), and with
 * today's weights (a change of weights or settings re-queues it, so `done` implies today's settings).
 */
async function freshStoredAnalysis({ environmentId, weights }: { environmentId: string; weights: PinchWeights }, transaction: Transaction): Promise<StoredAnalysis | null> {
  const { sequelize } = db();
  const [latest] = await sequelize.query<{ id: string; number: number; status: string | null; exact: boolean | null; bridges: Array<[string, string]> | null; weights: unknown }>(
    `SELECT s.id, s.number, a.status, a.exact, a.bridges, a.graph->'weights' AS weights
       FROM snapshots s LEFT JOIN analysis_runs a ON a.snapshot_id = s.id
      WHERE s.environment_id = :environmentId ORDER BY s.number DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
  );
  if (!latest || latest.status !== "done" || !latest.bridges) return null;
  const stored = pinchWeightsSchema.safeParse(latest.weights);
  if (!stored.success || stored.data.betweenness !== weights.betweenness || stored.data.reach !== weights.reach || stored.data.single !== weights.single) return null;
  const rows = await sequelize.query<{ key: string; betweenness: number; pinch_score: number; blast_down: number; blast_degraded: number; articulation: boolean }>(
    "SELECT key, betweenness, pinch_score, blast_down, blast_degraded, articulation FROM component_metrics WHERE snapshot_id = :id",
    { type: QueryTypes.SELECT, replacements: { id: latest.id }, transaction },
  );
  // The stored ranks share ties (DESIGN §10); the comparison needs positions, ordered exactly as
  // the fresh side orders them (lib/analysis/rank.ts).
  const ranks = ranksByKey(rows.map((r) => ({ key: r.key, betweenness: r.betweenness, pinchScore: r.pinch_score })));
  const measures = new Map<string, MeasureFacts>();
  for (const r of rows) measures.set(r.key, { pinchScore: r.pinch_score, rank: ranks.get(r.key)!, blastDown: r.blast_down, blastDegraded: r.blast_degraded, articulation: r.articulation });
  return { snapshot: latest.number, measures, bridges: latest.bridges, exact: latest.exact ?? true };
}

/** Overdue as lib/data/reviews.ts judges it (by the UTC day); that module is server-only, this one runs in scripts too. */
async function reviewStates({ environmentId }: { environmentId: string }, transaction: Transaction): Promise<Map<string, ReviewState>> {
  const rows = await db().sequelize.query<{ key: string; status: ReviewState["status"]; overdue: boolean }>(
    `SELECT key, status, (status <> 'resolved' AND review_by < (now() AT TIME ZONE 'UTC')::date) AS overdue
       FROM risk_reviews WHERE environment_id = :environmentId`,
    { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
  );
  return new Map(rows.map((r) => [r.key, { status: r.status, overdue: r.overdue }]));
}

export interface PushImpactInput {
  environment: { id: string; slug: string };
  previous: SnapshotContent;
  next: SnapshotContent;
  /** What the push changes in the content: the comparison looks only at these components. */
  diff: SnapshotDiff;
  inventory: NormalisedInventory;
  /** Number of the newest snapshot (null before the first push). */
  snapshot: number | null;
  /** Whether the push changes the graph at all (an unchanged graph can break no policy). */
  changed: boolean;
  /** The caller asked for the impact (impact=true). */
  requested: boolean;
  dryRun: boolean;
  /** Why an architect or admin pushes a change a policy blocks. */
  overrideReason: string | null;
  actor: Actor | SystemActor;
}

/** Components whose fields or needs the push changes (a superset of what the analysis sees change). */
function changedKeys(diff: SnapshotDiff): Set<string> {
  return new Set([
    ...diff.componentsAdded.map((c) => c.key),
    ...diff.componentsRemoved.map((c) => c.key),
    ...diff.componentsChanged.map((c) => c.key),
    ...diff.dependenciesAdded.map((d) => d.from),
    ...diff.dependenciesRemoved.map((d) => d.from),
    ...diff.dependenciesChanged.map((d) => d.from),
  ]);
}

/** Policy findings as located issues, for the refusal of a blocked push. */
function blockingIssues(report: ImpactReport): InventoryIssue[] {
  return report.policies
    .filter((p) => p.status === "fail" && p.severity === "block")
    .flatMap((p) => p.findings.map((f) => ({ path: `policies.${p.rule}`, ...(f.at?.line ? { line: f.at.line, ...(f.at.column ? { column: f.at.column } : {}) } : {}), message: f.message })));
}

/**
 * The impact of this push, or null when nobody asked and no policy could refuse it. Throws a 409
 * `policy_blocked` for a real push that fails a `block` rule without an accepted override.
 */
export async function impactForPush(input: PushImpactInput, transaction: Transaction): Promise<ImpactReport | null> {
  const { environment } = input;
  const policies = await readEnvironmentPolicies({ environmentId: environment.id }, transaction);
  const enforce = !input.dryRun && input.changed && hasBlockingRule(policies);
  if (!input.requested && !enforce) return null;

  const env = await db().models.Environment.findByPk(environment.id, { attributes: ["settings", "pinchWeights"], transaction });
  const settings = readSettings(env?.settings);
  const weights = env?.pinchWeights ?? DEFAULT_PINCH_WEIGHTS;
  const [stored, reviews] = await Promise.all([
    input.snapshot === null ? null : freshStoredAnalysis({ environmentId: environment.id, weights }, transaction),
    reviewStates({ environmentId: environment.id }, transaction),
  ]);
  const report = await impactOf({
    environment: environment.slug,
    link: `${appUrl().replace(/\/$/, "")}/environments/${environment.slug}/pinch-points`,
    before: input.previous,
    after: input.next,
    snapshot: input.snapshot,
    unchanged: !input.changed,
    changed: changedKeys(input.diff),
    stored,
    settings,
    weights,
    policies,
    reviews,
    locator: locatorFor({ inventory: input.inventory, content: input.next }),
  });

  if (enforce && report.blocked) {
    const failed = report.policies.filter((p) => p.status === "fail" && p.severity === "block");
    if (!input.overrideReason) {
      throw new AppError(
        "policy_blocked",
        `Blocked by ${failed.map((p) => p.title.toLowerCase()).join("; ")}. Nothing was changed; an architect or admin can push it with a reason.`,
        blockingIssues(report),
      );
    }
    // A reason is a person's judgement: tokens carry no role, and engineers may not overrule a policy.
    if (input.actor.type !== "user" || !roleHas(input.actor.role, "reviews:write")) {
      throw forbidden("Only an architect or admin can push a change that a blocking policy refuses");
    }
    await recordAudit(
      {
        actor: input.actor,
        action: "inventory.policy_override",
        targetType: "source",
        targetId: `${environment.slug}/${input.inventory.source}`,
        environmentId: environment.id,
        before: { snapshot: input.snapshot },
        after: { reason: input.overrideReason, failed: failed.map((p) => ({ rule: p.rule, findings: p.findingsTotal })), headline: report.headline },
      },
      transaction,
    );
  }
  return report;
}
