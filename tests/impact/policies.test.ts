// Change policies on small Harbor Pantry graphs whose outcome is worked out by hand in the comment
// above each case. The proposed file goes through the real importer with positions on, so each
// finding's line and column are those of the YAML written here.
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { DEFAULT_ANALYSIS_SETTINGS } from "@/lib/analysis/input";
import { DEFAULT_PINCH_WEIGHTS } from "@/lib/analysis/types";
import { impactOf, type ImpactReport } from "@/lib/impact";
import type { ReviewState } from "@/lib/impact/evaluate";
import { locatorFor } from "@/lib/impact/locate";
import { DEFAULT_POLICIES, readPolicies, type PolicyRuleId, type PolicySet } from "@/lib/impact/policies";
import { mergeSources } from "@/lib/inventory/merge";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import type { NormalisedInventory } from "@/lib/inventory/types";

const EMPTY: SnapshotContent = { components: [], dependencies: [] };

function parse(yaml: string): NormalisedInventory {
  const r = importInventory({ format: "pinchpoint", body: yaml, contentType: "application/yaml", positions: true });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.inventory;
}

function contentOf(inventory: NormalisedInventory): SnapshotContent {
  return mergeSources({ existing: EMPTY, source: inventory.source, incoming: inventory }).content;
}

/** Every rule off but the one under test, at `block`, with its parameter. */
function only(rule: PolicyRuleId, parameter?: number): PolicySet {
  const p = structuredClone(DEFAULT_POLICIES);
  for (const r of Object.keys(p.rules) as PolicyRuleId[]) p.rules[r].enabled = r === rule;
  p.rules[rule].severity = "block";
  if (parameter !== undefined && rule === "takes-down-growth") p.rules[rule].maxGrowth = parameter;
  if (parameter !== undefined && rule === "top-k-review") p.rules[rule].k = parameter;
  return p;
}

async function impact(before: string, after: string, policies: PolicySet, reviews = new Map<string, ReviewState>()): Promise<ImpactReport> {
  const proposed = parse(after);
  const next = contentOf(proposed);
  return impactOf({
    environment: "production",
    link: "http://127.0.0.1:3000/environments/production/pinch-points",
    before: contentOf(parse(before)),
    after: next,
    snapshot: 1,
    stored: null,
    settings: DEFAULT_ANALYSIS_SETTINGS,
    weights: DEFAULT_PINCH_WEIGHTS,
    policies,
    reviews,
    locator: locatorFor({ inventory: proposed, content: next }),
  });
}

const result = (r: ImpactReport, rule: PolicyRuleId) => r.policies.find((p) => p.rule === rule)!;

// Three components; checkout-service (tier 1) needs orders-db (one replica, one zone) softly.
const SHOP = (checkoutNeeds: string, db = "    replicas: 1\n    zones: [harbor-east]\n", checkoutTier = 1) => `pinchpoint: 1
source: shop-repo
components:
  - key: web-frontend
    kind: service
    tier: 1
    replicas: 3
    zones: [harbor-east, harbor-west]
    needs: [checkout-service]
  - key: checkout-service
    kind: service
    tier: ${checkoutTier}
    replicas: 3
    zones: [harbor-east, harbor-west]
    needs:
${checkoutNeeds}
  - key: orders-db
    kind: datastore
    tier: 2
${db}  - key: orders-db-replica
    kind: datastore
    tier: 2
    replicas: 1
    zones: [harbor-west]
`;
const SOFT_DB = "      - key: orders-db\n        strength: soft";
const HARD_DB = "      - key: orders-db\n        strength: hard";

describe("tier-1 hard need on a single point", () => {
  it("a soft need made hard fails at the need's line (line 16, column 9: the `- key: orders-db` entry)", async () => {
    const r = await impact(SHOP(SOFT_DB), SHOP(HARD_DB), only("tier1-single-point-need"));
    const p = result(r, "tier1-single-point-need");
    expect(p.status).toBe("fail");
    expect(p.findings).toHaveLength(1);
    expect(p.findings[0]).toMatchObject({ key: "checkout-service", need: { from: "checkout-service", to: "orders-db" }, at: { line: 16, column: 9 } });
    expect(p.findings[0]!.message).toMatch(/a need made hard/);
    expect(r.blocked).toBe(true);
    expect(r.singlePointNeeds).toEqual([expect.objectContaining({ from: "checkout-service", to: "orders-db", reason: "now-hard" })]);
  });

  it("a new need is 'new-need'; the same need on two replicas in two zones passes; an any_of of two single points passes (it has an alternative)", async () => {
    const none = "      - web-frontend-static";
    expect(result(await impact(SHOP(none), SHOP(`${none}\n${HARD_DB}`), only("tier1-single-point-need")), "tier1-single-point-need").findings[0]!.message).toMatch(/a new hard need/);
    const spread = "    replicas: 2\n    zones: [harbor-east, harbor-west]\n";
    expect(result(await impact(SHOP(none, spread), SHOP(`${none}\n${HARD_DB}`, spread), only("tier1-single-point-need")), "tier1-single-point-need").status).toBe("pass");
    const anyOf = "      - any_of: [orders-db, orders-db-replica]";
    expect(result(await impact(SHOP(none), SHOP(`${none}\n${anyOf}`), only("tier1-single-point-need")), "tier1-single-point-need").status).toBe("pass");
  });

  it("the need was there before: the target losing its second zone (now-single-point) fails at the target's entry, line 18", async () => {
    const spread = "    replicas: 2\n    zones: [harbor-east, harbor-west]\n";
    const r = await impact(SHOP(HARD_DB, spread), SHOP(HARD_DB, "    replicas: 2\n    zones: [harbor-east]\n"), only("tier1-single-point-need"));
    expect(result(r, "tier1-single-point-need").findings).toEqual([expect.objectContaining({ at: { line: 18, column: 5 } })]);
    expect(r.singlePointNeeds[0]!.reason).toBe("now-single-point");
  });

  it("the owner becoming tier 1 (now-tier-1) fails at the owner's entry, line 10", async () => {
    const r = await impact(SHOP(HARD_DB, undefined, 2), SHOP(HARD_DB, undefined, 1), only("tier1-single-point-need"));
    expect(r.singlePointNeeds[0]!.reason).toBe("now-tier-1");
    expect(result(r, "tier1-single-point-need").findings[0]!.at).toEqual({ line: 10, column: 5 });
  });

  it("an unchanged graph passes every rule and blocks nothing", async () => {
    const r = await impact(SHOP(HARD_DB), SHOP(HARD_DB), { ...DEFAULT_POLICIES, rules: { ...only("tier1-single-point-need").rules } });
    expect(r.changed).toBe(false);
    expect(r.policies.every((p) => p.status !== "fail")).toBe(true);
    expect(r.blocked).toBe(false);
  });
});

// slot-service needs picking-capacity (hard); the change makes picking-capacity need slot-service.
const SLOTS = (back: string) => `pinchpoint: 1
source: routing-repo
components:
  - key: slot-service
    kind: service
    tier: 1
    replicas: 2
    zones: [harbor-east, harbor-west]
    needs: [picking-capacity]
  - key: picking-capacity
    kind: service
    tier: 2
    replicas: 2
    zones: [harbor-east, harbor-west]
${back}`;

describe("no new cycle of hard needs", () => {
  it("a hard need back closes slot-service ⇄ picking-capacity: fails at that need (line 16, column 9)", async () => {
    const r = await impact(SLOTS(""), SLOTS("    needs:\n      - slot-service\n"), only("no-new-hard-cycle"));
    const p = result(r, "no-new-hard-cycle");
    expect(p.status).toBe("fail");
    expect(p.findings[0]).toMatchObject({ need: { from: "picking-capacity", to: "slot-service" }, at: { line: 16, column: 9 } });
    expect(r.hardCycles.added).toEqual([{ members: ["picking-capacity", "slot-service"], closedBy: [{ from: "picking-capacity", to: "slot-service" }] }]);
  });

  it("a soft need back makes a cycle that is not hard: passes", async () => {
    const r = await impact(SLOTS(""), SLOTS("    needs:\n      - key: slot-service\n        strength: soft\n"), only("no-new-hard-cycle"));
    expect(result(r, "no-new-hard-cycle").status).toBe("pass");
  });

  it("breaking the cycle passes and reports it broken", async () => {
    const r = await impact(SLOTS("    needs:\n      - slot-service\n"), SLOTS(""), only("no-new-hard-cycle"));
    expect(result(r, "no-new-hard-cycle").status).toBe("pass");
    expect(r.hardCycles.removed).toEqual([["picking-capacity", "slot-service"]]);
  });
});

// bus has three hard dependents a, b, c. The change adds d, e, f needing it hard: bus's failure
// takes down 3 → 6 (+3).
const BUS = (extra: string[]) => `pinchpoint: 1
source: platform-repo
components:
  - key: harbor-bus
    kind: queue
    tier: 2
    replicas: 3
    zones: [harbor-east, harbor-west]
${["a", "b", "c", ...extra].map((k) => `  - key: svc-${k}\n    kind: service\n    needs: [harbor-bus]\n`).join("")}`;

describe("blast radius growth", () => {
  it("+3 against N = 2 fails, located at the first new need (svc-d's `needs`, line 20, column 13)", async () => {
    const r = await impact(BUS([]), BUS(["d", "e", "f"]), only("takes-down-growth", 2));
    const p = result(r, "takes-down-growth");
    expect(p.findings).toHaveLength(1);
    expect(p.findings[0]).toMatchObject({ key: "harbor-bus", need: { from: "svc-d", to: "harbor-bus" }, at: { line: 20, column: 13 } });
    expect(p.findings[0]!.message).toMatch(/instead of 3 \(\+3, more than 2\)/);
  });

  it("+3 against N = 3 passes (the rule is 'more than N')", async () => {
    expect(result(await impact(BUS([]), BUS(["d", "e", "f"]), only("takes-down-growth", 3)), "takes-down-growth").status).toBe("pass");
  });
});

// Tier-1 api-gateway joins two otherwise separate halves: web → api-gateway and api-gateway →
// catalog-api. Before the change, web needed catalog-api directly too, so the gateway was no cut
// vertex; without that need, removing the gateway splits the graph.
const GATEWAY = (direct: boolean, tier = 1) => `pinchpoint: 1
source: edge-repo
components:
  - key: web
    kind: service
    tier: 1
    replicas: 2
    zones: [harbor-east, harbor-west]
    needs: [api-gateway${direct ? ", catalog-api" : ""}]
  - key: api-gateway
    kind: gateway
    tier: ${tier}
    replicas: 2
    zones: [harbor-east, harbor-west]
    needs: [catalog-api]
  - key: catalog-api
    kind: service
    replicas: 2
    zones: [harbor-east, harbor-west]
`;

describe("no new articulation point among tier-1 components", () => {
  it("tier-1 api-gateway becoming a cut vertex fails at its entry (line 10)", async () => {
    const r = await impact(GATEWAY(true), GATEWAY(false), only("new-tier1-articulation"));
    expect(r.articulation.added.map((a) => a.key)).toEqual(["api-gateway"]);
    expect(result(r, "new-tier1-articulation").findings).toEqual([expect.objectContaining({ key: "api-gateway", at: { line: 10, column: 5 } })]);
  });

  it("the same change with a tier-2 gateway passes", async () => {
    const r = await impact(GATEWAY(true, 2), GATEWAY(false, 2), only("new-tier1-articulation"));
    expect(r.articulation.added.map((a) => a.key)).toEqual(["api-gateway"]);
    expect(result(r, "new-tier1-articulation").status).toBe("pass");
  });
});

// Before: a → b → c (only b lies between two others, so b ranks first). After: a → d, d → c and
// x → d too. Shortest paths through b: a→b→c; through d: x→d→c (a→c has two shortest paths, one
// through each, ½ to each). Betweenness (unnormalised) after: d = ½ + 1 = 1½, b = ½; so d ranks
// first and enters the top 1.
const RANK = (after: boolean) => `pinchpoint: 1
source: rank-repo
components:
  - key: a
    kind: service
    needs: [b${after ? ", d" : ""}]
  - key: b
    kind: service
    needs: [c]
  - key: c
    kind: datastore
${after ? "  - key: d\n    kind: service\n    needs: [c]\n  - key: x\n    kind: service\n    needs: [d]\n" : ""}`;

describe("entering the top K needs a risk review", () => {
  it("d enters the top 1 with no review: fails at d's entry (line 12)", async () => {
    const r = await impact(RANK(false), RANK(true), only("top-k-review", 1));
    expect(result(r, "top-k-review").findings).toEqual([expect.objectContaining({ key: "d", at: { line: 12, column: 5 } })]);
  });

  it("an accepted or mitigating review that is not overdue covers it; a resolved or overdue one does not", async () => {
    const run = async (review: ReviewState) => result(await impact(RANK(false), RANK(true), only("top-k-review", 1), new Map([["d", review]])), "top-k-review").status;
    expect(await run({ status: "accepted", overdue: false })).toBe("pass");
    expect(await run({ status: "mitigating", overdue: false })).toBe("pass");
    expect(await run({ status: "resolved", overdue: false })).toBe("fail");
    expect(await run({ status: "accepted", overdue: true })).toBe("fail");
  });

  it("d is new to the estate, so it enters the top K for any K it ranks within (K = 2, K = 3)", async () => {
    expect(result(await impact(RANK(false), RANK(true), only("top-k-review", 2)), "top-k-review").findings.map((f) => f.key)).toEqual(["d"]);
    expect(result(await impact(RANK(false), RANK(true), only("top-k-review", 3)), "top-k-review").findings.map((f) => f.key)).toEqual(["d"]);
  });
});

describe("severities and the verdict", () => {
  it("a failing warn rule reports but does not block; a rule that is off reports 'off'", async () => {
    const p = only("tier1-single-point-need");
    p.rules["tier1-single-point-need"].severity = "warn";
    const r = await impact(SHOP(SOFT_DB), SHOP(HARD_DB), p);
    expect(result(r, "tier1-single-point-need").status).toBe("fail");
    expect(result(r, "no-new-hard-cycle").status).toBe("off");
    expect(r.blocked).toBe(false);
    expect(r.headline).toMatch(/^1 policy warning/);
  });

  it("stored policies that no longer parse read as the defaults, rule by rule", () => {
    const stored = { rules: { "top-k-review": { enabled: false, severity: "block", k: 3 }, "no-new-hard-cycle": { enabled: "yes" } }, movement: 7 };
    const p = readPolicies(stored);
    expect(p.rules["top-k-review"]).toEqual({ enabled: false, severity: "block", k: 3 });
    expect(p.rules["no-new-hard-cycle"]).toEqual(DEFAULT_POLICIES.rules["no-new-hard-cycle"]);
    expect(p.movement).toEqual(DEFAULT_POLICIES.movement);
  });
});
