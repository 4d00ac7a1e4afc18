// Teams and the unowned queue over the real route handlers and PostgreSQL: who may read, create,
// edit and staff a team; a lead edits only their own team and claims unowned components only for
// it; every write leaves an audit event with before and after; bad input writes nothing.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listTeamsRoute, POST as createTeamRoute } from "@/app/api/v1/teams/route";
import { GET as teamRoute, PATCH as patchTeamRoute } from "@/app/api/v1/teams/[slug]/route";
import { POST as addMemberRoute } from "@/app/api/v1/teams/[slug]/members/route";
import { DELETE as removeMemberRoute } from "@/app/api/v1/teams/[slug]/members/[userId]/route";
import { GET as unownedRoute } from "@/app/api/v1/teams/unowned/route";
import { PATCH as annotateRoute } from "@/app/api/v1/environments/[env]/components/[key]/route";
import { db } from "@/models";
import { ROLES, type Role } from "@/lib/auth/roles";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { addMembership, upsertTeams } from "@/lib/data/teams";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
let otherLead: TestUser;

const INVENTORY = `pinchpoint: 1
source: shop-repo
environment: staging
components:
  - key: web
    kind: service
    team: shop
    tier: 1
    needs: [api, cache]
  - key: api
    kind: service
    needs: [db]
  - key: cache
    kind: cache
  - key: db
    kind: datastore
    team: data
`;

type TeamList = { items: Array<{ slug: string; memberCount: number; leadCount: number; componentCount: number; pinchPointCount: number }>; unownedCount: number };
type TeamDetailBody = {
  slug: string;
  oncall: string | null;
  members: Array<{ userId: string; email: string; isLead: boolean }>;
  components: { total: number; limit: number; offset: number; items: Array<{ environment: string; key: string; pinchScore: number | null; pinchPoint: boolean }> };
  pinchPoints: Array<{ key: string }>;
};

async function auditCount(action?: string): Promise<number> {
  return db().models.AuditEvent.count(action ? { where: { action } } : {});
}

async function lastAudit(action: string) {
  const row = await db().models.AuditEvent.findOne({ where: { action }, order: [["createdAt", "DESC"]] });
  return row ? { actorLabel: row.actorLabel, targetId: row.targetId, before: row.before, after: row.after, environmentId: row.environmentId } : null;
}

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  otherLead = await createUser("lead");
  const teams = await upsertTeams({
    teams: [
      { slug: "shop", name: "Shop", email: "shop@test.example", oncall: "rota shop", description: null },
      { slug: "data", name: "Data", email: null, oncall: null, description: null },
    ],
  });
  const shop = teams.find((t) => t.slug === "shop");
  const data = teams.find((t) => t.slug === "data");
  if (!shop || !data) throw new Error("teams not created");
  await addMembership({ userId: users.lead.id, teamId: shop.id, isLead: true });
  await addMembership({ userId: users.engineer.id, teamId: shop.id, isLead: false });
  await addMembership({ userId: otherLead.id, teamId: data.id, isLead: true });
  await pushInventory({ environment: "staging", format: "pinchpoint", body: INVENTORY, dryRun: false, actor: { type: "system", label: "test", canCreateEnvironments: true } });
  await drainAnalysisQueue();
});

describe("GET /api/v1/teams", () => {
  it("answers 401 to an anonymous caller", async () => {
    expect((await call(listTeamsRoute, { url: "/api/v1/teams" })).status).toBe(401);
  });

  it.each(ROLES)("lists teams with counts for %s", async (role) => {
    const res = await call(listTeamsRoute, { url: "/api/v1/teams", as: users[role] });
    expect(res.status).toBe(200);
    const body = res.json as TeamList;
    expect(body.items.find((t) => t.slug === "shop")).toMatchObject({ memberCount: 2, leadCount: 1, componentCount: 1 });
    expect(body.items.find((t) => t.slug === "data")).toMatchObject({ memberCount: 1, leadCount: 1, componentCount: 1 });
    // api and cache are declared with no team
    expect(body.unownedCount).toBe(2);
  });

  it("lets a read token list teams too", async () => {
    const token = await createApiToken({ scopes: ["read"], createdBy: users.admin.id });
    expect((await call(listTeamsRoute, { url: "/api/v1/teams", as: { token } })).status).toBe(200);
  });
});

describe("POST /api/v1/teams", () => {
  const body = { slug: "platform", name: "Platform", email: "platform@test.example", oncall: "rota platform" };

  it("answers 401 to an anonymous caller", async () => {
    expect((await call(createTeamRoute, { url: "/api/v1/teams", method: "POST", body })).status).toBe(401);
  });

  it.each(ROLES.filter((r) => r !== "admin"))("refuses %s with 403 and writes nothing", async (role) => {
    const before = await db().models.Team.count();
    const res = await call(createTeamRoute, { url: "/api/v1/teams", method: "POST", as: users[role], body });
    expect(res.status).toBe(403);
    expect(await db().models.Team.count()).toBe(before);
  });

  it("answers 422 with located issues for bad input and writes nothing", async () => {
    const teams = await db().models.Team.count();
    const audits = await auditCount();
    for (const bad of [
      { slug: "Not A Slug", name: "x" },
      { slug: "ok-slug", name: "" },
      { slug: "ok-slug", name: "x", email: "not-an-address" },
      { slug: "ok-slug", name: "x", colour: "red" },
      { slug: "unowned", name: "Collides with a route" },
    ]) {
      const res = await call(createTeamRoute, { url: "/api/v1/teams", method: "POST", as: users.admin, body: bad });
      expect(res.status, JSON.stringify(bad)).toBe(422);
      expect(res.json).toMatchObject({ error: "invalid_request", issues: [expect.objectContaining({ path: expect.any(String) })] });
    }
    expect(await db().models.Team.count()).toBe(teams);
    expect(await auditCount()).toBe(audits);
  });

  it("lets an admin create a team, audited with its fields, and refuses a second with the same slug", async () => {
    const res = await call(createTeamRoute, { url: "/api/v1/teams", method: "POST", as: users.admin, body });
    expect(res.status).toBe(201);
    expect(res.json).toMatchObject({ slug: "platform", name: "Platform", email: "platform@test.example", oncall: "rota platform", description: null });
    expect(await lastAudit("team.create")).toMatchObject({ actorLabel: users.admin.email, targetId: "platform", before: null, after: { slug: "platform", oncall: "rota platform" } });
    const again = await call(createTeamRoute, { url: "/api/v1/teams", method: "POST", as: users.admin, body });
    expect(again.status).toBe(409);
  });
});

describe("GET /api/v1/teams/{slug}", () => {
  it.each(ROLES)("shows members, leads and components to %s", async (role) => {
    const res = await call(teamRoute, { url: "/api/v1/teams/shop", params: { slug: "shop" }, as: users[role] });
    expect(res.status).toBe(200);
    const body = res.json as TeamDetailBody;
    expect(body.members).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ email: users.lead.email, isLead: true }),
        expect.objectContaining({ email: users.engineer.email, isLead: false }),
      ]),
    );
    expect(body.components).toEqual({ total: 1, limit: 50, offset: 0, items: [expect.objectContaining({ environment: "staging", key: "web", pinchScore: expect.any(Number) })] });
    // Four components: every analysed one is in the top ten by pinch score.
    expect(body.pinchPoints.map((p) => p.key)).toEqual(["web"]);
  });

  it("answers 401 anonymous, 404 for an unknown team", async () => {
    expect((await call(teamRoute, { url: "/api/v1/teams/shop", params: { slug: "shop" } })).status).toBe(401);
    expect((await call(teamRoute, { url: "/api/v1/teams/nobody", params: { slug: "nobody" }, as: users.viewer })).status).toBe(404);
  });
});

describe("PATCH /api/v1/teams/{slug}", () => {
  const patch = (as: TestUser | null, slug: string, body: object) =>
    call(patchTeamRoute, { url: `/api/v1/teams/${slug}`, method: "PATCH", params: { slug }, as, body });

  it("answers 401 to an anonymous caller", async () => {
    expect((await patch(null, "shop", { oncall: "x" })).status).toBe(401);
  });

  it.each(["viewer", "engineer", "architect"] as const)("refuses %s (not admin, not a lead of the team)", async (role) => {
    const res = await patch(users[role], "shop", { oncall: "rota hijacked" });
    expect(res.status).toBe(403);
    expect((await db().models.Team.findOne({ where: { slug: "shop" } }))?.oncall).toBe("rota shop");
  });

  it("lets a lead change their own team's contact details, audited with before and after", async () => {
    const res = await patch(users.lead, "shop", { oncall: "rota shop-primary, +44 20 7946 0999", email: "shop-oncall@test.example", description: "The shop." });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ oncall: "rota shop-primary, +44 20 7946 0999", email: "shop-oncall@test.example" });
    expect(await lastAudit("team.update")).toMatchObject({
      actorLabel: users.lead.email,
      targetId: "shop",
      before: { oncall: "rota shop", email: "shop@test.example", description: null },
      after: { oncall: "rota shop-primary, +44 20 7946 0999", email: "shop-oncall@test.example", description: "The shop." },
    });
  });

  it("refuses a lead another team, and the team's name", async () => {
    expect((await patch(users.lead, "data", { oncall: "rota data" })).status).toBe(403);
    expect((await patch(users.lead, "shop", { name: "Renamed" })).status).toBe(403);
    expect((await db().models.Team.findOne({ where: { slug: "shop" } }))?.name).toBe("Shop");
  });

  it("lets an admin rename any team and clear a field with an empty string", async () => {
    const res = await patch(users.admin, "data", { name: "Data platform", oncall: "" });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ name: "Data platform", oncall: null });
  });

  it("answers 422 for bad input and changes nothing", async () => {
    const audits = await auditCount();
    for (const bad of [{}, { email: "nope" }, { oncall: "x".repeat(201) }, { slug: "other" }]) {
      const res = await patch(users.admin, "shop", bad);
      expect(res.status, JSON.stringify(bad)).toBe(422);
    }
    expect(await auditCount()).toBe(audits);
    expect((await db().models.Team.findOne({ where: { slug: "shop" } }))?.email).toBe("shop-oncall@test.example");
  });

  it("answers 404 for an unknown team", async () => {
    expect((await patch(users.admin, "nobody", { oncall: "x" })).status).toBe(404);
  });
});

describe("team membership (admin)", () => {
  it.each(ROLES.filter((r) => r !== "admin"))("refuses %s", async (role) => {
    const add = await call(addMemberRoute, { url: "/api/v1/teams/data/members", method: "POST", params: { slug: "data" }, as: users[role], body: { email: users.viewer.email } });
    expect(add.status).toBe(403);
    const remove = await call(removeMemberRoute, { url: `/api/v1/teams/shop/members/${users.engineer.id}`, method: "DELETE", params: { slug: "shop", userId: users.engineer.id }, as: users[role] });
    expect(remove.status).toBe(403);
  });

  it("answers 401 anonymous", async () => {
    const add = await call(addMemberRoute, { url: "/api/v1/teams/data/members", method: "POST", params: { slug: "data" }, body: { email: users.viewer.email } });
    expect(add.status).toBe(401);
  });

  it("adds a member, makes them lead, removes them — each audited", async () => {
    const add = await call(addMemberRoute, { url: "/api/v1/teams/data/members", method: "POST", params: { slug: "data" }, as: users.admin, body: { email: users.viewer.email.toUpperCase() } });
    expect(add.status).toBe(200);
    expect(await lastAudit("team.member.add")).toMatchObject({ targetId: "data", before: null, after: { email: users.viewer.email, lead: false } });
    const lead = await call(addMemberRoute, { url: "/api/v1/teams/data/members", method: "POST", params: { slug: "data" }, as: users.admin, body: { email: users.viewer.email, lead: true } });
    expect(lead.json).toMatchObject({ isLead: true });
    expect(await lastAudit("team.member.update")).toMatchObject({ before: { lead: false }, after: { lead: true } });
    const remove = await call(removeMemberRoute, { url: `/api/v1/teams/data/members/${users.viewer.id}`, method: "DELETE", params: { slug: "data", userId: users.viewer.id }, as: users.admin });
    expect(remove.status).toBe(200);
    expect(await lastAudit("team.member.remove")).toMatchObject({ before: { email: users.viewer.email, lead: true }, after: null });
    const again = await call(removeMemberRoute, { url: `/api/v1/teams/data/members/${users.viewer.id}`, method: "DELETE", params: { slug: "data", userId: users.viewer.id }, as: users.admin });
    expect(again.status).toBe(404);
  });

  it("answers 422 for an unknown user or bad body, writing nothing", async () => {
    const audits = await auditCount();
    for (const body of [{ email: "ghost@test.example" }, { email: "not-an-address" }, { email: users.viewer.email, lead: "yes" }]) {
      const res = await call(addMemberRoute, { url: "/api/v1/teams/data/members", method: "POST", params: { slug: "data" }, as: users.admin, body });
      expect(res.status, JSON.stringify(body)).toBe(422);
    }
    expect(await auditCount()).toBe(audits);
  });
});

describe("the unowned queue", () => {
  const claim = (as: TestUser, key: string, team: string | null) =>
    call(annotateRoute, { url: `/api/v1/environments/staging/components/${key}`, method: "PATCH", params: { env: "staging", key }, as, body: { team } });
  const unownedKeys = async () =>
    ((await call(unownedRoute, { url: "/api/v1/teams/unowned", as: users.viewer })).json as { items: Array<{ key: string }> }).items.map((i) => i.key).sort();

  it("answers 401 anonymous and lists unowned components for every role", async () => {
    expect((await call(unownedRoute, { url: "/api/v1/teams/unowned" })).status).toBe(401);
    for (const role of ROLES) {
      const res = await call(unownedRoute, { url: "/api/v1/teams/unowned", as: users[role] });
      expect(res.status).toBe(200);
      expect(res.json).toMatchObject({ items: expect.arrayContaining([expect.objectContaining({ environment: "staging", key: "api", pinchScore: expect.any(Number) })]) });
    }
    expect(await unownedKeys()).toEqual(["api", "cache"]);
  });

  it("filters by environment and answers 422 for an unknown query field", async () => {
    const none = await call(unownedRoute, { url: "/api/v1/teams/unowned?environment=elsewhere", as: users.viewer });
    expect(none.json).toMatchObject({ items: [] });
    expect((await call(unownedRoute, { url: "/api/v1/teams/unowned?team=shop", as: users.viewer })).status).toBe(422);
  });

  it("refuses a lead claiming for a team they do not lead, and engineers and viewers outright", async () => {
    expect((await claim(users.lead, "api", "data")).status).toBe(403);
    expect((await claim(users.engineer, "api", "shop")).status).toBe(403);
    expect((await claim(users.viewer, "api", "shop")).status).toBe(403);
    expect(await unownedKeys()).toEqual(["api", "cache"]);
  });

  it("lets a lead claim an unowned component for their own team, audited", async () => {
    const res = await claim(users.lead, "api", "shop");
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ key: "api", team: "shop" });
    expect(await lastAudit("component.annotate")).toMatchObject({ actorLabel: users.lead.email, targetId: "api", before: { team: null }, after: { team: "shop" } });
    expect(await unownedKeys()).toEqual(["cache"]);
    // Now owned by shop: the data team's lead cannot take it.
    expect((await claim(otherLead, "api", "data")).status).toBe(403);
  });

  it("lets an architect assign any team", async () => {
    const res = await claim(users.architect, "cache", "data");
    expect(res.status).toBe(200);
    expect(await unownedKeys()).toEqual([]);
    const list = (await call(listTeamsRoute, { url: "/api/v1/teams", as: users.viewer })).json as TeamList;
    expect(list.unownedCount).toBe(0);
    expect(list.items.find((t) => t.slug === "shop")?.componentCount).toBe(2);
  });
});
