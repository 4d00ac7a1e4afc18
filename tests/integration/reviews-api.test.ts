// Risk reviews and pinch-score weights over the real route handlers and PostgreSQL: only
// architects and admins write them, a rationale is required, review-by dates follow their rules,
// overdue reviews are listed, weights re-queue the analysis, and every write is audited.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listReviewsRoute } from "@/app/api/v1/environments/[env]/reviews/route";
import { DELETE as clearReviewRoute, PUT as putReviewRoute } from "@/app/api/v1/environments/[env]/reviews/[key]/route";
import { GET as getWeightsRoute, PUT as putWeightsRoute } from "@/app/api/v1/environments/[env]/weights/route";
import { db } from "@/models";
import { ROLES, type Role } from "@/lib/auth/roles";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { reviewsByKey } from "@/lib/data/reviews";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
let environmentId = "";

// A chain with one replica each: web → api → db, plus a spare that nothing needs.
const INVENTORY = `pinchpoint: 1
source: shop-repo
environment: staging
components:
  - key: web
    kind: service
    tier: 1
    needs: [api]
  - key: api
    kind: service
    needs: [db]
  - key: db
    kind: datastore
  - key: spare
    kind: job
    replicas: 2
    zones: [a, b]
`;

const daysFromToday = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

const put = (as: TestUser | { token: string } | null, key: string, body: object) =>
  call(putReviewRoute, { url: `/api/v1/environments/staging/reviews/${key}`, method: "PUT", params: { env: "staging", key }, as, body });
const clear = (as: TestUser | null, key: string) =>
  call(clearReviewRoute, { url: `/api/v1/environments/staging/reviews/${key}`, method: "DELETE", params: { env: "staging", key }, as });
const list = (as: TestUser | null, query = "") => call(listReviewsRoute, { url: `/api/v1/environments/staging/reviews${query}`, params: { env: "staging" }, as });

const reviewCount = () => db().models.RiskReview.count();
const auditCount = () => db().models.AuditEvent.count();
async function lastAudit(action: string) {
  const row = await db().models.AuditEvent.findOne({ where: { action }, order: [["createdAt", "DESC"]] });
  return row ? { actorLabel: row.actorLabel, targetType: row.targetType, targetId: row.targetId, environmentId: row.environmentId, before: row.before, after: row.after } : null;
}

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await pushInventory({ environment: "staging", format: "pinchpoint", body: INVENTORY, dryRun: false, actor: { type: "system", label: "test", canCreateEnvironments: true } });
  await drainAnalysisQueue();
  const env = await db().models.Environment.findOne({ where: { slug: "staging" } });
  environmentId = env?.id ?? "";
});

describe("PUT /api/v1/environments/{env}/reviews/{key}", () => {
  const good = () => ({ status: "accepted", rationale: "Single zone by design until the move in spring", reviewBy: daysFromToday(30) });

  it("answers 401 to an anonymous caller", async () => {
    expect((await put(null, "db", good())).status).toBe(401);
  });

  it.each(["viewer", "engineer", "lead"] as const)("refuses %s with 403 and writes nothing", async (role) => {
    const res = await put(users[role], "db", good());
    expect(res.status).toBe(403);
    expect(await reviewCount()).toBe(0);
  });

  it("refuses API tokens, whatever their scopes", async () => {
    const token = await createApiToken({ scopes: ["read", "inventory:write"], createdBy: users.admin.id });
    expect((await put({ token }, "db", good())).status).toBe(403);
  });

  it("lets an architect accept a risk with a date; the reviewer is the caller; audited", async () => {
    const body = good();
    const res = await put(users.architect, "db", body);
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ key: "db", status: "accepted", rationale: body.rationale, reviewBy: body.reviewBy, overdue: false, reviewer: { email: users.architect.email } });
    expect(await lastAudit("review.create")).toMatchObject({
      actorLabel: users.architect.email,
      targetType: "component",
      targetId: "db",
      environmentId,
      before: null,
      after: { status: "accepted", rationale: body.rationale, reviewBy: body.reviewBy, reviewer: users.architect.email },
    });
  });

  it("lets an admin change it to mitigating; the audit keeps what it was", async () => {
    const reviewBy = daysFromToday(14);
    const res = await put(users.admin, "db", { status: "mitigating", rationale: "Replica being added", reviewBy });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ status: "mitigating", reviewer: { email: users.admin.email } });
    expect(await lastAudit("review.update")).toMatchObject({
      before: { status: "accepted", reviewer: users.architect.email },
      after: { status: "mitigating", rationale: "Replica being added", reviewBy, reviewer: users.admin.email },
    });
    expect(await reviewCount()).toBe(1);
  });

  it("lets a risk be resolved without a date", async () => {
    const res = await put(users.architect, "api", { status: "resolved", rationale: "Now runs in both zones" });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ status: "resolved", reviewBy: null, overdue: false });
  });

  it.each([
    ["no rationale", { status: "accepted", reviewBy: daysFromToday(10) }],
    ["a blank rationale", { status: "accepted", rationale: "   ", reviewBy: daysFromToday(10) }],
    ["accepted without a date", { status: "accepted", rationale: "because" }],
    ["mitigating with a null date", { status: "mitigating", rationale: "because", reviewBy: null }],
    ["a date in the past", { status: "accepted", rationale: "because", reviewBy: daysFromToday(-1) }],
    ["a date more than two years away", { status: "accepted", rationale: "because", reviewBy: daysFromToday(800) }],
    ["a date that does not exist", { status: "accepted", rationale: "because", reviewBy: "2031-02-30" }],
    ["a date in another format", { status: "accepted", rationale: "because", reviewBy: "30/01/2031" }],
    ["an unknown status", { status: "ignored", rationale: "because", reviewBy: daysFromToday(10) }],
    ["an unknown field", { status: "resolved", rationale: "because", reviewer: "someone-else" }],
  ])("answers 422 for %s and writes nothing", async (_label, body) => {
    const reviews = await reviewCount();
    const audits = await auditCount();
    const res = await put(users.architect, "web", body);
    expect(res.status).toBe(422);
    expect(res.json).toMatchObject({ error: "invalid_request", issues: [expect.objectContaining({ path: expect.any(String), message: expect.any(String) })] });
    expect(await reviewCount()).toBe(reviews);
    expect(await auditCount()).toBe(audits);
  });

  it("names the date field when the date is missing", async () => {
    const res = await put(users.architect, "web", { status: "mitigating", rationale: "because" });
    expect(res.json).toMatchObject({ issues: [{ path: "reviewBy" }] });
  });

  it("answers 404 for an unknown component or environment, 400 for a body that is not JSON", async () => {
    expect((await put(users.architect, "ghost", good())).status).toBe(404);
    const env = await call(putReviewRoute, { url: "/api/v1/environments/nowhere/reviews/db", method: "PUT", params: { env: "nowhere", key: "db" }, as: users.architect, body: good() });
    expect(env.status).toBe(404);
    const notJson = await call(putReviewRoute, { url: "/api/v1/environments/staging/reviews/db", method: "PUT", params: { env: "staging", key: "db" }, as: users.architect, body: "{nope", headers: { "content-type": "application/json" } });
    expect(notJson.status).toBe(400);
  });
});

describe("GET /api/v1/environments/{env}/reviews", () => {
  it("answers 401 anonymous and lists reviews for every role", async () => {
    expect((await list(null)).status).toBe(401);
    for (const role of ROLES) {
      const res = await list(users[role]);
      expect(res.status).toBe(200);
      expect((res.json as { items: Array<{ key: string }> }).items.map((i) => i.key)).toEqual(["db", "api"]);
    }
  });

  it("lists only overdue reviews with ?overdue=true, and the badge map flags them", async () => {
    expect(((await list(users.viewer, "?overdue=true")).json as { items: unknown[] }).items).toEqual([]);
    // The API refuses past dates, so the clock is moved by ageing the row itself.
    await db().sequelize.query("UPDATE risk_reviews SET review_by = (now() AT TIME ZONE 'UTC')::date - 3 WHERE key = 'db'");
    const res = await list(users.viewer, "?overdue=true");
    expect(res.json).toMatchObject({ items: [{ key: "db", status: "mitigating", overdue: true }] });
    expect(await reviewsByKey({ environmentId })).toEqual({
      db: { status: "mitigating", reviewBy: daysFromToday(-3), overdue: true },
      api: { status: "resolved", reviewBy: null, overdue: false },
    });
  });

  it("answers 422 for a bad query", async () => {
    expect((await list(users.viewer, "?overdue=maybe")).status).toBe(422);
    expect((await list(users.viewer, "?sort=key")).status).toBe(422);
  });

  it("resets the reminder when the date moves", async () => {
    await db().sequelize.query("UPDATE risk_reviews SET notified_at = now() WHERE key = 'db'");
    await put(users.architect, "db", { status: "mitigating", rationale: "Replica being added, slipped a fortnight", reviewBy: daysFromToday(14) });
    const row = await db().models.RiskReview.findOne({ where: { environmentId, key: "db" } });
    expect(row?.notifiedAt).toBeNull();
  });
});

describe("DELETE /api/v1/environments/{env}/reviews/{key}", () => {
  it("answers 401 anonymous and refuses viewer, engineer and lead", async () => {
    expect((await clear(null, "api")).status).toBe(401);
    for (const role of ["viewer", "engineer", "lead"] as const) expect((await clear(users[role], "api")).status).toBe(403);
    expect(await reviewCount()).toBe(2);
  });

  it("clears a review, audited with what it was; a second clear is 404", async () => {
    const res = await clear(users.architect, "api");
    expect(res.status).toBe(200);
    expect(await lastAudit("review.clear")).toMatchObject({ targetId: "api", before: { status: "resolved", rationale: "Now runs in both zones" }, after: null });
    expect((await clear(users.admin, "api")).status).toBe(404);
    expect((await clear(users.admin, "db")).status).toBe(200);
    expect(await reviewCount()).toBe(0);
  });
});

describe("pinch-score weights", () => {
  const getW = (as: TestUser | null) => call(getWeightsRoute, { url: "/api/v1/environments/staging/weights", params: { env: "staging" }, as });
  const putW = (as: TestUser | null, body: unknown) => call(putWeightsRoute, { url: "/api/v1/environments/staging/weights", method: "PUT", params: { env: "staging" }, as, body: body as object });
  const scores = async () => {
    const rows = await db().sequelize.query<{ key: string; pinch_score: number }>(
      "SELECT m.key, m.pinch_score FROM component_metrics m JOIN snapshots s ON s.id = m.snapshot_id WHERE s.environment_id = :environmentId ORDER BY m.key",
      { type: "SELECT" as never, replacements: { environmentId } },
    );
    return Object.fromEntries(rows.map((r) => [r.key, r.pinch_score]));
  };

  it("shows the defaults of DESIGN §3 to every role; 401 anonymous", async () => {
    expect((await getW(null)).status).toBe(401);
    for (const role of ROLES) {
      const res = await getW(users[role]);
      expect(res.status).toBe(200);
      expect(res.json).toMatchObject({ weights: { betweenness: 0.4, reach: 0.4, single: 0.2 }, custom: false });
    }
  });

  it.each(["viewer", "engineer", "lead"] as const)("refuses %s with 403", async (role) => {
    expect((await putW(users[role], { betweenness: 0, reach: 0, single: 1 })).status).toBe(403);
  });

  it("answers 401 anonymous on PUT", async () => {
    expect((await putW(null, { betweenness: 0, reach: 0, single: 1 })).status).toBe(401);
  });

  it.each([
    ["all zero", { betweenness: 0, reach: 0, single: 0 }],
    ["above one", { betweenness: 1.5, reach: 0, single: 0 }],
    ["negative", { betweenness: -0.1, reach: 0.5, single: 0.5 }],
    ["a missing weight", { betweenness: 0.5, reach: 0.5 }],
    ["an unknown weight", { betweenness: 0.5, reach: 0.5, single: 0, age: 1 }],
    ["strings", { betweenness: "0.5", reach: 0.5, single: 0 }],
  ])("answers 422 for %s and writes nothing", async (_label, body) => {
    const audits = await auditCount();
    const res = await putW(users.architect, body);
    expect(res.status).toBe(422);
    expect(await auditCount()).toBe(audits);
    expect((await db().models.Environment.findByPk(environmentId))?.pinchWeights).toBeNull();
  });

  it("saves, audits and re-queues the newest snapshot; the worker recomputes the scores with them", async () => {
    const before = await scores();
    // With the defaults, `spare` (two replicas in two zones, nothing needs it) scores 0 and `db` does not.
    expect(before.spare).toBe(0);
    expect(before.db).toBeGreaterThan(0);
    const res = await putW(users.architect, { betweenness: 0, reach: 0, single: 1 });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ weights: { betweenness: 0, reach: 0, single: 1 }, custom: true, requeued: { snapshot: 1 } });
    const runs = await db().models.AnalysisRun.findAll({ where: { environmentId } });
    expect(runs.map((r) => r.status)).toEqual(["queued"]);
    expect(await lastAudit("weights.update")).toMatchObject({
      actorLabel: users.architect.email,
      targetType: "environment",
      targetId: "staging",
      before: { betweenness: 0.4, reach: 0.4, single: 0.2 },
      after: { betweenness: 0, reach: 0, single: 1 },
    });
    expect(await drainAnalysisQueue()).toBe(1);
    // Only S counts now: 100 × S, S = 1 for one replica (DESIGN §3).
    expect(await scores()).toEqual({ api: 100, db: 100, spare: 0, web: 100 });
    expect((await getW(users.viewer)).json).toMatchObject({ weights: { betweenness: 0, reach: 0, single: 1 }, custom: true });
  });

  it("lets an admin set them too", async () => {
    const res = await putW(users.admin, { betweenness: 0.4, reach: 0.4, single: 0.2 });
    expect(res.status).toBe(200);
    await drainAnalysisQueue();
  });
});
