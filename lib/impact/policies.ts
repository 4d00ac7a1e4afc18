// Change policies: per-environment rules an inventory change is held to before it is merged
// (DESIGN §10, Impact). Each rule is on or off and has a severity: `block` fails a CI gate and
// refuses a real push unless an architect or admin records a reason; `warn` only reports.
// The catalogue here is the one list the API, the screen, the Markdown comment and the SARIF
// rules metadata are made from.
import { z } from "zod";

const POLICY_SEVERITIES = ["block", "warn"] as const;
export type PolicySeverity = (typeof POLICY_SEVERITIES)[number];

export const POLICY_RULES = ["no-new-hard-cycle", "tier1-single-point-need", "takes-down-growth", "new-tier1-articulation", "top-k-review"] as const;
export type PolicyRuleId = (typeof POLICY_RULES)[number];

interface RuleInfo {
  title: string;
  /** One sentence: what fails the rule. `{n}` is replaced by the rule's parameter. */
  description: string;
  /** Why the rule exists, for the screen and the SARIF rule's full description. */
  why: string;
  parameter?: { name: "maxGrowth" | "k"; label: string; min: number; max: number };
}

export const RULE_INFO: Record<PolicyRuleId, RuleInfo> = {
  "no-new-hard-cycle": {
    title: "No new cycle of hard needs",
    description: "The change closes a dependency cycle in which every need is hard.",
    why: "Components in a cycle of hard needs cannot cold-start unaided, and each takes the others down.",
  },
  "tier1-single-point-need": {
    title: "No tier-1 hard need on a single point",
    description: "A tier-1 component gains a hard need on a component with one replica or fewer than two zones.",
    why: "A tier-1 component is then down whenever that single instance or zone is.",
  },
  "takes-down-growth": {
    title: "Blast radius may not grow by more than {n}",
    description: "A component's failure would take down more than {n} more components than it does now.",
    why: "A sudden jump in what one failure takes down is usually an unintended hard need.",
    parameter: { name: "maxGrowth", label: "most extra components a failure may take down", min: 0, max: 1_000_000 },
  },
  "new-tier1-articulation": {
    title: "No new articulation point among tier-1 components",
    description: "A tier-1 component becomes an articulation point of the dependency graph.",
    why: "Removing an articulation point splits the graph: a tier-1 one is a new single point between parts of the estate.",
  },
  "top-k-review": {
    title: "Entering the top {n} needs a risk review",
    description: "A component enters the top {n} pinch points without an accepted or mitigating risk review that is not overdue.",
    why: "Architects review the pinch points at the top of the list; a change should not put a new one there unseen.",
    parameter: { name: "k", label: "size of the top of the ranking", min: 1, max: 10_000 },
  },
};

export function ruleTitle(rule: PolicyRuleId, policies: PolicySet): string {
  return RULE_INFO[rule].title.replace("{n}", String(parameterOf(rule, policies) ?? ""));
}

const severity = z.enum(POLICY_SEVERITIES);
const plainRule = z.strictObject({ enabled: z.boolean(), severity });

export const policySetSchema = z.strictObject({
  rules: z.strictObject({
    "no-new-hard-cycle": plainRule,
    "tier1-single-point-need": plainRule,
    "takes-down-growth": z.strictObject({ enabled: z.boolean(), severity, maxGrowth: z.int().min(0).max(1_000_000) }),
    "new-tier1-articulation": plainRule,
    "top-k-review": z.strictObject({ enabled: z.boolean(), severity, k: z.int().min(1).max(10_000) }),
  }),
  /** What counts as "moved" in the impact's table: changes of at most these are left out. */
  movement: z.strictObject({
    /** Pinch-score points (0–100 scale). */
    pinchScore: z.number().min(0).max(100),
    /** Places in the ranking. */
    rank: z.int().min(0).max(1_000_000),
    /** Rank changes count only for components within this many places of the top, before or after. */
    topWindow: z.int().min(1).max(1_000_000),
  }),
});

export type PolicySet = z.infer<typeof policySetSchema>;

/**
 * Defaults: every rule on and only warning, so that no environment starts refusing pushes until
 * an architect chooses what blocks. N = 10 and K = 10 are common-practice starting points.
 */
export const DEFAULT_POLICIES: PolicySet = {
  rules: {
    "no-new-hard-cycle": { enabled: true, severity: "warn" },
    "tier1-single-point-need": { enabled: true, severity: "warn" },
    "takes-down-growth": { enabled: true, severity: "warn", maxGrowth: 10 },
    "new-tier1-articulation": { enabled: true, severity: "warn" },
    "top-k-review": { enabled: true, severity: "warn", k: 10 },
  },
  movement: { pinchScore: 5, rank: 5, topWindow: 50 },
};

export function parameterOf(rule: PolicyRuleId, policies: PolicySet): number | null {
  if (rule === "takes-down-growth") return policies.rules[rule].maxGrowth;
  if (rule === "top-k-review") return policies.rules[rule].k;
  return null;
}

/** Stored policies with defaults filled in: a stored document that no longer parses reads as the defaults, rule by rule. */
export function readPolicies(stored: unknown): PolicySet {
  const whole = policySetSchema.safeParse(stored);
  if (whole.success) return whole.data;
  const out: PolicySet = structuredClone(DEFAULT_POLICIES);
  if (typeof stored !== "object" || stored === null) return out;
  const s = stored as { rules?: Record<string, unknown>; movement?: unknown };
  for (const rule of POLICY_RULES) {
    const one = policySetSchema.shape.rules.shape[rule].safeParse(s.rules?.[rule]);
    if (one.success) (out.rules as Record<string, unknown>)[rule] = one.data;
  }
  const movement = policySetSchema.shape.movement.safeParse(s.movement);
  if (movement.success) out.movement = movement.data;
  return out;
}

/** Whether any rule that is on would refuse a push. */
export const hasBlockingRule = (p: PolicySet): boolean => POLICY_RULES.some((r) => p.rules[r].enabled && p.rules[r].severity === "block");
