// Change impact through the push API against PostgreSQL (DESIGN §10, Impact): the dry run's
// impact from the stored analysis and recomputed (the two must agree), its Markdown and SARIF
// forms with status 200 whatever the policies say, the policies API, and real pushes that a
// blocking policy refuses unless an architect or admin records a reason.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { GET as getPoliciesRoute, PUT as putPoliciesRoute } from "@/app/api/v1/environments/[env]/policies/route";
import { PUT as putWeights } from "@/app/api/v1/environments/[env]/weights/route";
import { PUT as putReview } from "@/app/api/v1/environments/[env]/reviews/[key]/route";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import type { PushResult } from "@/lib/data/push";
import type { ImpactReport } from "@/lib/impact";
import { DEFAULT_POLICIES, type PolicySet } from "@/lib/impact/policies";
import type { SarifLog } from "@/lib/impact/sarif";
import { db } from "@/models";
import type { Role } from "@/lib/auth/roles";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const ENV = "harbor";
const users = {} as Record<Role, TestUser>;
let token: string;

// The platform team's file: a session store on one replica in one zone, a bus in two zones.
const PLATFORM = `pinchpoint: 1
source: platform-repo
environment: harbor
components:
  - key: session-store
    kind: datastore
    tier: 2
    replicas: 1
    zones: [harbor-east]
  - key: harbor-bus
    kind: queue
    tier: 2
    replicas: 3
    zones: [harbor-east, harbor-west]
  - key: dns-resolver
    kind: network
    tier: 1
    replicas: 4
    zones: [harbor-east, harbor-west]
`;

// The checkout team's file; `extra` lands under checkout-service's needs, from line 20.
const CHECKOUT = (extra = "") => `pinchpoint: 1
source: checkout-repo
environment: harbor
components:
  - key: web-frontend
    kind: service
    tier: 1
    replicas: 3
    zones: [harbor-east, harbor-west]
    needs: [checkout-service, dns-resolver]
  - key: checkout-service
    kind: service
    tier: 1
    replicas: 3
    zones: [harbor-east, harbor-west]
    needs:
      - dns-resolver
      - key: harbor-bus
        strength: soft
${extra}  - key: cart-service
    kind: service
    tier: 2
    replicas: 2
    zones: [harbor-east, harbor-west]
    needs: [dns-resolver]
`;
const RISKY = CHECKOUT("      - session-store\n");

async function pushAs(as: TestUser | { token: string }, body: string, query = "") {
  return call(push, { url: `/api/v1/environments/${ENV}/inventory${query}`, method: "POST", params: { env: ENV }, as, body, headers: { "content-type": "application/yaml" } });
}

async function setPolicies(as: TestUser, policies: PolicySet) {
  return call(putPoliciesRoute, { url: `/api/v1/environments/${ENV}/policies`, method: "PUT", params: { env: ENV }, as, body: policies });
}

const blocking = (): PolicySet => {
  const p = structuredClone(DEFAULT_POLICIES);
  p.rules["tier1-single-point-need"].severity = "block";
  return p;
};

async function counts() {
  const [row] = await db().sequelize.query<Record<string, string>>(
    "SELECT (SELECT count(*) FROM snapshots) s, (SELECT count(*) FROM dependencies) d, (SELECT count(*) FROM import_records) i",
    { type: QueryTypes.SELECT },
  );
  return row;
}

beforeAll(async () => {
  for (const role of ["admin", "architect", "lead", "engineer", "viewer"] as const) users[role] = await createUser(role);
  expect((await pushAs(users.admin, PLATFORM)).status).toBe(200);
  expect((await pushAs(users.admin, CHECKOUT())).status).toBe(200);
  await drainAnalysisQueue();
  token = await createApiToken({ scopes: ["inventory:write"], createdBy: users.admin.id });
});

describe("dry run with impact=true", () => {
  it("an identical file: 200, nothing changes, every policy passes", async () => {
    const res = await pushAs({ token }, CHECKOUT(), "?dry_run=true&impact=true");
    expect(res.status).toBe(200);
    const impact = (res.json as PushResult).impact!;
    expect(impact).toMatchObject({ changed: false, blocked: false, basis: { snapshot: 2, analysis: "stored" } });
    expect(impact.policies.every((p) => p.status === "pass")).toBe(true);
  });

  it("a tier-1 hard need on the single-instance session store: found at line 20, column 9, from the stored analysis; nothing is written", async () => {
    const before = await counts();
    const res = await pushAs({ token }, RISKY, "?dry_run=true&impact=true");
    expect(res.status).toBe(200);
    const impact = (res.json as PushResult).impact!;
    expect(impact.basis.analysis).toBe("stored");
    expect(impact.singlePointNeeds).toEqual([expect.objectContaining({ from: "checkout-service", to: "session-store", reason: "new-need", at: { line: 20, column: 9 } })]);
    const rule = impact.policies.find((p) => p.rule === "tier1-single-point-need")!;
    expect(rule).toMatchObject({ status: "fail", severity: "warn" });
    // session-store now takes down checkout-service and web-frontend (hand count).
    expect(impact.downGrowth.find((g) => g.key === "session-store")).toMatchObject({ before: { down: 0 }, after: { down: 2 }, newlyDown: ["checkout-service", "web-frontend"] });
    expect(await counts()).toEqual(before);
  });

  it("the stored analysis and a fresh one give the same impact (weights saved again re-queue the analysis, so it is recomputed)", async () => {
    const stored = ((await pushAs({ token }, RISKY, "?dry_run=true&impact=true")).json as PushResult).impact!;
    const w = await call(putWeights, { url: `/api/v1/environments/${ENV}/weights`, method: "PUT", params: { env: ENV }, as: users.architect, body: { betweenness: 0.4, reach: 0.4, single: 0.2 } });
    expect(w.status).toBe(200);
    const fresh = ((await pushAs({ token }, RISKY, "?dry_run=true&impact=true")).json as PushResult).impact!;
    expect(fresh.basis.analysis).toBe("recomputed");
    const strip = (r: ImpactReport) => ({ ...r, basis: null, timings: null });
    expect(strip(fresh)).toEqual(strip(stored));
    await drainAnalysisQueue();
  });

  it("impact_format=markdown: a pull-request comment, text/markdown, status 200 and the verdict in Pinchpoint-Impact", async () => {
    const res = await pushAs({ token }, RISKY, "?dry_run=true&impact=true&impact_format=markdown&file=services/checkout/pinchpoint.yaml");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/markdown/);
    expect(res.headers.get("pinchpoint-impact")).toBe("warn");
    expect(res.json).toEqual(expect.stringContaining("`services/checkout/pinchpoint.yaml:20:9` Tier-1 checkout-service has a hard need on session-store"));
  });

  it("impact_format=sarif: one result per finding at the need's file, line and column", async () => {
    const res = await pushAs({ token }, RISKY, "?dry_run=true&impact_format=sarif&file=services/checkout/pinchpoint.yaml");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/sarif+json");
    const log = res.json as SarifLog;
    expect(log.runs[0]!.results.filter((r) => r.ruleId === "tier1-single-point-need")).toEqual([
      expect.objectContaining({ level: "warning", locations: [expect.objectContaining({ physicalLocation: { artifactLocation: { uri: "services/checkout/pinchpoint.yaml" }, region: { startLine: 20, startColumn: 9 } } })] }),
    ]);
  });

  it("refuses bad impact parameters with located 422s and changes nothing", async () => {
    for (const q of ["?dry_run=true&impact_format=html", "?dry_run=true&impact=maybe", "?dry_run=true&override_reason=because%20I%20said%20so", "?dry_run=true&impact=true&file=a%0Ab"]) {
      const res = await pushAs({ token }, RISKY, q);
      expect({ q, status: res.status }).toEqual({ q, status: 422 });
      expect((res.json as { issues: Array<{ path: string }> }).issues[0]!.path).toMatch(/^query\./);
    }
  });
});

describe("policies API", () => {
  it("GET gives the defaults to any reader; PUT by an architect saves, audits and is read back", async () => {
    const first = await call(getPoliciesRoute, { url: `/api/v1/environments/${ENV}/policies`, params: { env: ENV }, as: users.viewer });
    expect(first.json).toMatchObject({ custom: false, policies: DEFAULT_POLICIES });
    const p = blocking();
    p.rules["top-k-review"].k = 3;
    const res = await setPolicies(users.architect, p);
    expect(res.status).toBe(200);
    const again = await call(getPoliciesRoute, { url: `/api/v1/environments/${ENV}/policies`, params: { env: ENV }, as: users.viewer });
    expect(again.json).toMatchObject({ custom: true, policies: p });
    const [audit] = await db().sequelize.query<{ after: PolicySet; actor_label: string }>("SELECT after, actor_label FROM audit_events WHERE action = 'policies.update' ORDER BY created_at DESC LIMIT 1", { type: QueryTypes.SELECT });
    expect(audit?.after.rules["top-k-review"].k).toBe(3);
  });

  it("refuses a rule with a wrong severity or a missing parameter, naming the field, and keeps what was there", async () => {
    const bad = structuredClone(DEFAULT_POLICIES) as unknown as { rules: Record<string, Record<string, unknown>> };
    bad.rules["no-new-hard-cycle"]!.severity = "deny";
    delete bad.rules["takes-down-growth"]!.maxGrowth;
    const res = await setPolicies(users.admin, bad as unknown as PolicySet);
    expect(res.status).toBe(422);
    const paths = (res.json as { issues: Array<{ path: string }> }).issues.map((i) => i.path).sort();
    expect(paths).toEqual(["rules.no-new-hard-cycle.severity", "rules.takes-down-growth.maxGrowth"]);
    const now = await call(getPoliciesRoute, { url: `/api/v1/environments/${ENV}/policies`, params: { env: ENV }, as: users.viewer });
    expect((now.json as { policies: PolicySet }).policies.rules["tier1-single-point-need"].severity).toBe("block");
  });
});

describe("a blocking policy", () => {
  it("the dry run still answers 200, with blocked: true", async () => {
    await setPolicies(users.architect, blocking());
    const res = await pushAs({ token }, RISKY, "?dry_run=true&impact=true");
    expect(res.status).toBe(200);
    expect((res.json as PushResult).impact).toMatchObject({ blocked: true });
  });

  it("refuses the real push with 409 policy_blocked naming the need, and writes nothing", async () => {
    const before = await counts();
    const res = await pushAs({ token }, RISKY);
    expect(res.status).toBe(409);
    expect(res.json).toMatchObject({ error: "policy_blocked" });
    expect((res.json as { issues: Array<{ path: string; message: string }> }).issues).toEqual([
      expect.objectContaining({ path: "policies.tier1-single-point-need", message: expect.stringContaining("checkout-service has a hard need on session-store") }),
    ]);
    expect(await counts()).toEqual(before);
  });

  it("lets a harmless change through", async () => {
    const harmless = CHECKOUT().replace("    needs: [dns-resolver]\n", "    needs: [dns-resolver, { key: harbor-bus, strength: soft }]\n");
    const res = await pushAs({ token }, harmless);
    expect(res.status).toBe(200);
    expect((res.json as PushResult).changed).toBe(true);
  });

  it("an override reason from a token or an engineer is refused (403); nothing is written", async () => {
    const before = await counts();
    const q = "?override_reason=we%20need%20this%20for%20the%20launch";
    expect((await pushAs({ token }, RISKY, q)).status).toBe(403);
    expect((await pushAs(users.engineer, RISKY, q)).status).toBe(403);
    expect(await counts()).toEqual(before);
  });

  it("an architect pushes it with a reason: 200, a new snapshot, and the reason and failed rules audited", async () => {
    const reason = "Session store gets a replica next sprint; accepted for the launch";
    const res = await pushAs(users.architect, RISKY, `?override_reason=${encodeURIComponent(reason)}`);
    expect(res.status).toBe(200);
    expect((res.json as PushResult).snapshot).not.toBeNull();
    const [audit] = await db().sequelize.query<{ after: { reason: string; failed: Array<{ rule: string; findings: number }> }; actor_label: string }>(
      "SELECT after, actor_label FROM audit_events WHERE action = 'inventory.policy_override' ORDER BY created_at DESC LIMIT 1",
      { type: QueryTypes.SELECT },
    );
    expect(audit?.after).toMatchObject({ reason, failed: [{ rule: "tier1-single-point-need", findings: 1 }] });
    expect(audit?.actor_label).toContain(users.architect.email);
  });
});

describe("entering the top K", () => {
  it("a risk review on the component that enters covers it", async () => {
    await drainAnalysisQueue();
    const p = structuredClone(DEFAULT_POLICIES);
    for (const r of Object.keys(p.rules) as Array<keyof PolicySet["rules"]>) p.rules[r].enabled = r === "top-k-review";
    p.rules["top-k-review"] = { enabled: true, severity: "block", k: 2 };
    await setPolicies(users.admin, p);
    // A gateway in front of everything: web-frontend → edge-gateway → checkout-service, cart-service.
    // Shortest paths through it: web-frontend to checkout-service, cart-service, session-store and
    // harbor-bus (4), as many as through checkout-service, which ranks first on its larger blast
    // radius; so edge-gateway enters at rank 2 (hand count).
    const gateway = RISKY.replace("    needs: [checkout-service, dns-resolver]\n", "    needs: [edge-gateway, dns-resolver]\n") +
      "  - key: edge-gateway\n    kind: gateway\n    tier: 1\n    replicas: 2\n    zones: [harbor-east, harbor-west]\n    needs: [checkout-service, cart-service]\n";
    const first = ((await pushAs({ token }, gateway, "?dry_run=true&impact=true")).json as PushResult).impact!;
    const top = first.policies.find((x) => x.rule === "top-k-review")!;
    expect(top.findings.map((f) => f.key)).toEqual(["edge-gateway"]);
    // A review needs the component to exist: push it as an architect first with a reason, then review it.
    expect((await pushAs(users.architect, gateway, `?override_reason=${encodeURIComponent("adding the edge gateway; review follows")}`)).status).toBe(200);
    await drainAnalysisQueue();
    const review = await call(putReview, {
      url: `/api/v1/environments/${ENV}/reviews/edge-gateway`,
      method: "PUT",
      params: { env: ENV, key: "edge-gateway" },
      as: users.architect,
      body: { status: "accepted", rationale: "Two replicas in two zones; load tested.", reviewBy: new Date(Date.now() + 90 * 86_400_000).toISOString().slice(0, 10) },
    });
    expect(review.status).toBe(200);
    // Back to the file without the gateway, then the gateway again as a dry run: now covered.
    await pushAs(users.architect, RISKY, `?override_reason=${encodeURIComponent("undo to test the review")}`);
    await drainAnalysisQueue();
    const again = ((await pushAs({ token }, gateway, "?dry_run=true&impact=true")).json as PushResult).impact!;
    expect(again.policies.find((x) => x.rule === "top-k-review")!.status).toBe("pass");
  });
});
