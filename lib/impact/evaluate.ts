// Each change policy (lib/impact/policies.ts) held against a comparison (lib/impact/compare.ts).
// Pure. Every finding names the component or need it is about and, where the pushed file wrote
// it, the position, so the SARIF result lands on that line.
import type { FilePosition } from "@/lib/inventory/types";
import type { ImpactComparison, ImpactSide, NeedRef, SinglePointReason } from "./compare";
import type { Locator } from "./locate";
import { POLICY_RULES, parameterOf, ruleTitle, type PolicyRuleId, type PolicySet, type PolicySeverity } from "./policies";

export interface PolicyFinding {
  message: string;
  /** The component the finding is about. */
  key?: string;
  /** The need that caused it, when one did. */
  need?: NeedRef;
  at?: FilePosition;
}

export interface PolicyResult {
  rule: PolicyRuleId;
  title: string;
  enabled: boolean;
  severity: PolicySeverity;
  parameter: number | null;
  status: "pass" | "fail" | "off";
  findings: PolicyFinding[];
}

export interface ReviewState {
  status: "accepted" | "mitigating" | "resolved";
  overdue: boolean;
}

/** A review covers a component at the top while the risk is accepted or being mitigated and its date has not passed. */
const reviewCovers = (r: ReviewState | undefined): boolean => r !== undefined && r.status !== "resolved" && !r.overdue;

const SINGLE_POINT_REASON: Record<SinglePointReason, string> = {
  "new-need": "a new hard need",
  "now-hard": "a need made hard",
  "now-tier-1": "it is now tier 1",
  "now-single-point": "the target now runs as a single point",
};

function where(target: { replicas: number; zones: string[]; undeclared: boolean }): string {
  if (target.undeclared) return "is declared by no source (one replica assumed)";
  const replicas = `${target.replicas} replica${target.replicas === 1 ? "" : "s"}`;
  const zones = target.zones.length === 0 ? "no declared zone" : target.zones.length === 1 ? `one zone (${target.zones[0]})` : `${target.zones.length} zones`;
  return `runs ${replicas} in ${zones}`;
}

const list = (keys: readonly string[], max = 5): string => (keys.length <= max ? keys.join(", ") : `${keys.slice(0, max).join(", ")} and ${keys.length - max} more`);

/** The first position found, trying each candidate in turn. */
function first(...candidates: Array<() => FilePosition | undefined>): FilePosition | undefined {
  for (const c of candidates) {
    const at = c();
    if (at) return at;
  }
  return undefined;
}

export function evaluatePolicies({
  comparison: c,
  before,
  after,
  policies,
  reviews,
  locator,
}: {
  comparison: ImpactComparison;
  before: Pick<ImpactSide, "measures">;
  after: Pick<ImpactSide, "measures" | "components">;
  policies: PolicySet;
  reviews: ReadonlyMap<string, ReviewState>;
  locator: Locator;
}): PolicyResult[] {
  const addedOnto = (key: string) => () => {
    const n = c.addedNeeds.find((x) => x.to === key) ?? c.addedNeeds.find((x) => x.from === key);
    return n ? locator.need(n.from, n.to) : undefined;
  };
  const findings: Record<PolicyRuleId, () => PolicyFinding[]> = {
    "no-new-hard-cycle": () =>
      c.hardCycles.added.map((cycle) => {
        const closing = cycle.closedBy.find((n) => locator.need(n.from, n.to)) ?? cycle.closedBy[0];
        const by = closing ? `${closing.from} → ${closing.to} closes` : "The change closes";
        return {
          message: `${by} a cycle of hard needs among ${list(cycle.members, 8)}: none of them can cold-start unaided, and each takes the others down.`,
          key: closing?.from ?? cycle.members[0],
          ...(closing ? { need: closing } : {}),
          at: first(
            () => (closing ? locator.need(closing.from, closing.to) : undefined),
            ...cycle.members.map((m) => () => locator.component(m)),
          ),
        };
      }),
    "tier1-single-point-need": () =>
      c.singlePointNeeds.map((n) => ({
        message: `Tier-1 ${n.from} has a hard need on ${n.to}, which ${where(n.target)} (${SINGLE_POINT_REASON[n.reason]}): ${n.from} is down whenever ${n.to} is.`,
        key: n.from,
        need: { from: n.from, to: n.to },
        at:
          n.reason === "now-single-point"
            ? first(() => locator.component(n.to), () => locator.need(n.from, n.to))
            : n.reason === "now-tier-1"
              ? first(() => locator.component(n.from), () => locator.need(n.from, n.to))
              : first(() => locator.need(n.from, n.to), () => locator.component(n.from)),
      })),
    "takes-down-growth": () => {
      const max = policies.rules["takes-down-growth"].maxGrowth;
      return c.downGrowth
        .filter((g) => g.after!.down - g.before!.down > max)
        .map((g) => {
          const newly = new Set(g.newlyDown ?? []);
          // The cause: a need added (or made hard) on a component that now goes down with this one.
          const cause = c.addedNeeds.find((n) => n.hard && newly.has(n.from) && locator.need(n.from, n.to)) ?? c.addedNeeds.find((n) => n.hard && newly.has(n.from));
          return {
            message:
              `A failure of ${g.key} would take down ${g.after!.down} components instead of ${g.before!.down} (+${g.after!.down - g.before!.down}, more than ${max})` +
              (g.newlyDown?.length ? `; newly down: ${list(g.newlyDown)}.` : "."),
            key: g.key,
            ...(cause ? { need: { from: cause.from, to: cause.to } } : {}),
            at: first(() => (cause ? locator.need(cause.from, cause.to) : undefined), () => locator.component(g.key)),
          };
        });
    },
    "new-tier1-articulation": () =>
      c.articulation.added
        .filter((k) => after.components.get(k)?.tier === 1)
        .map((k) => ({
          message: `Tier-1 ${k} becomes an articulation point: without it the dependency graph falls apart into pieces.`,
          key: k,
          at: first(() => locator.component(k), addedOnto(k)),
        })),
    "top-k-review": () => {
      const k = policies.rules["top-k-review"].k;
      const out: PolicyFinding[] = [];
      for (const [key, m] of after.measures) {
        if (m.rank > k) continue;
        const was = before.measures.get(key)?.rank;
        if (was !== undefined && was <= k) continue;
        if (reviewCovers(reviews.get(key))) continue;
        out.push({
          message: `${key} enters the top ${k} pinch points at rank ${m.rank} (${was === undefined ? "new" : `was ${was}`}) without a current risk review.`,
          key,
          at: first(() => locator.component(key), addedOnto(key)),
        });
      }
      return out.sort((a, b) => after.measures.get(a.key!)!.rank - after.measures.get(b.key!)!.rank);
    },
  };
  return POLICY_RULES.map((rule) => {
    const config = policies.rules[rule];
    const base = { rule, title: ruleTitle(rule, policies), enabled: config.enabled, severity: config.severity, parameter: parameterOf(rule, policies) };
    if (!config.enabled) return { ...base, status: "off" as const, findings: [] };
    const found = findings[rule]().map(({ at, ...f }) => (at ? { ...f, at } : f));
    return { ...base, status: found.length ? ("fail" as const) : ("pass" as const), findings: found };
  });
}

export const isBlocked = (results: readonly PolicyResult[]): boolean => results.some((r) => r.status === "fail" && r.severity === "block");
