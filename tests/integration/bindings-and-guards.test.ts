// Findings of a security review, held in place: a token bound to one environment reads only that
// one; a lead moves only their own team's pins; the last admin cannot be removed; JSON bodies
// have a size limit.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as environments } from "@/app/api/v1/environments/route";
import { GET as rankings } from "@/app/api/v1/environments/[env]/rankings/route";
import { GET as components } from "@/app/api/v1/environments/[env]/components/route";
import { POST as drills } from "@/app/api/v1/environments/[env]/drills/route";
import { PUT as positions } from "@/app/api/v1/environments/[env]/map/positions/route";
import { GET as teams } from "@/app/api/v1/teams/route";
import { PATCH as patchUser } from "@/app/api/v1/users/[id]/route";
import { db } from "@/models";
import { pushInventory } from "@/lib/data/push";
import { addMembership, upsertTeams } from "@/lib/data/teams";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
const file = (env: string) => `pinchpoint: 1
source: ${env}-repo
components:
  - { key: web, kind: service, team: shop, needs: [db] }
  - { key: db, kind: datastore, team: data }
`;

let admin: TestUser;
let lead: TestUser;
let boundToken: string;

beforeAll(async () => {
  admin = await createUser("admin");
  lead = await createUser("lead");
  const [shop] = await upsertTeams({ teams: [{ slug: "shop", name: "Shop", email: null, oncall: null, description: null }, { slug: "data", name: "Data", email: null, oncall: null, description: null }] });
  await addMembership({ userId: lead.id, teamId: shop!.id, isLead: true });
  await pushInventory({ environment: "alpha", format: "pinchpoint", body: file("alpha"), dryRun: false, actor: system });
  await pushInventory({ environment: "beta", format: "pinchpoint", body: file("beta"), dryRun: false, actor: system });
  const alpha = await db().models.Environment.findOne({ where: { slug: "alpha" } });
  boundToken = await createApiToken({ scopes: ["read"], environmentId: alpha!.id, createdBy: admin.id });
});

describe("a token bound to an environment", () => {
  it("reads its own environment", async () => {
    const res = await call(components, { url: "/api/v1/environments/alpha/components", params: { env: "alpha" }, as: { token: boundToken } });
    expect(res.status).toBe(200);
  });

  it("is refused on another environment's reads, drills included", async () => {
    expect((await call(components, { url: "/api/v1/environments/beta/components", params: { env: "beta" }, as: { token: boundToken } })).status).toBe(403);
    expect((await call(rankings, { url: "/api/v1/environments/beta/rankings", params: { env: "beta" }, as: { token: boundToken } })).status).toBe(403);
    expect((await call(drills, { url: "/api/v1/environments/beta/drills", method: "POST", params: { env: "beta" }, as: { token: boundToken }, body: { fail: { components: ["db"] } } })).status).toBe(403);
  });

  it("lists only its environment, and is refused on routes that read across environments", async () => {
    const list = await call(environments, { url: "/api/v1/environments", as: { token: boundToken } });
    expect((list.json as { items: Array<{ slug: string }> }).items.map((e) => e.slug)).toEqual(["alpha"]);
    expect((await call(teams, { url: "/api/v1/teams", as: { token: boundToken } })).status).toBe(403);
  });
});

describe("map positions", () => {
  it("lets a lead move their own team's components only, keeping others' pins", async () => {
    const put = (as: TestUser, body: object) => call(positions, { url: "/api/v1/environments/alpha/map/positions", method: "PUT", params: { env: "alpha" }, as, body });
    const architect = await createUser("architect");
    expect((await put(architect, { web: { x: 1, y: 1 }, db: { x: 2, y: 2 } })).status).toBe(200);
    const moveOthers = await put(lead, { web: { x: 5, y: 5 }, db: { x: 9, y: 9 } });
    expect(moveOthers.status).toBe(403);
    expect((moveOthers.json as { message: string }).message).toContain("db");
    const moveOwn = await put(lead, { web: { x: 5, y: 5 } });
    expect(moveOwn.status).toBe(200);
    expect(moveOwn.json).toEqual({ positions: { db: { x: 2, y: 2 }, web: { x: 5, y: 5 } } });
  });
});

describe("admins", () => {
  it("cannot leave the estate without an active admin, even when two admins demote each other at once", async () => {
    await db().models.User.update({ role: "viewer" }, { where: { role: "admin" } });
    const a = await createUser("admin");
    const b = await createUser("admin");
    const demote = (actor: TestUser, target: TestUser) =>
      call(patchUser, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: actor, body: { role: "viewer" } });
    const results = await Promise.all([demote(a, b), demote(b, a)]);
    // One wins. The other is refused: 403 when it checked before the winner's demotion committed,
    // 401 when after (the demotion ends the loser's sessions at once).
    const [won, refused] = results.map((r) => r.status).sort();
    expect(won).toBe(200);
    expect([401, 403]).toContain(refused);
    expect(await db().models.User.count({ where: { role: "admin", active: true } })).toBe(1);
  });
});

describe("JSON bodies", () => {
  it("refuses one over 1 MiB with 413", async () => {
    const res = await call(drills, { url: "/api/v1/environments/alpha/drills", method: "POST", params: { env: "alpha" }, as: admin, body: JSON.stringify({ fail: { components: ["db"] }, pad: "x".repeat(1_100_000) }), headers: { "content-type": "application/json" } });
    expect(res.status).toBe(413);
  });
});
