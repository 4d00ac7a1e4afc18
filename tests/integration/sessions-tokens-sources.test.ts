// Ending sessions on the server, tokens capped by their creator's current rights, who may replace
// a source, and to whom a lead may hand a component. Each was a finding of a security review:
// a copied cookie kept working for 12 h after sign-out; a token kept its rights after its creator
// was demoted or deactivated; any engineer could empty another team's source; a lead could give
// a component to any team.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listEnvironments } from "@/app/api/v1/environments/route";
import { POST as pushRoute } from "@/app/api/v1/environments/[env]/inventory/route";
import { PATCH as annotate } from "@/app/api/v1/environments/[env]/components/[key]/route";
import { PATCH as updateUser } from "@/app/api/v1/users/[id]/route";
import { authOptions } from "@/lib/auth/options";
import { acceptInvite, inviteUser } from "@/lib/data/user-admin";
import { addMembership, upsertTeams } from "@/lib/data/teams";
import { pushInventory } from "@/lib/data/push";
import { db } from "@/models";
import { call, createApiToken, createUser, signInAgain, type TestUser } from "../support/api";

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
const read = (as: TestUser | { token: string }) => call(listEnvironments, { url: "/api/v1/environments", as });
const setUser = (admin: TestUser, target: TestUser, body: object) =>
  call(updateUser, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: admin, body });
const pushAs = (as: TestUser | { token: string }, body: string, env = "prod") =>
  call(pushRoute, { url: `/api/v1/environments/${env}/inventory`, method: "POST", params: { env }, as, body, headers: { "content-type": "application/yaml" } });

const CHECKOUT = "pinchpoint: 1\nsource: checkout-repo\ncomponents:\n  - { key: cart, kind: service, team: checkout, needs: [orders-db] }\n  - { key: orders-db, kind: datastore, team: checkout }\n";
const EMPTY_CHECKOUT = "pinchpoint: 1\nsource: checkout-repo\ncomponents: []\n";

let admin: TestUser;
let otherAdmin: TestUser;

beforeAll(async () => {
  admin = await createUser("admin");
  otherAdmin = await createUser("admin");
  await upsertTeams({ teams: ["checkout", "payments", "search"].map((slug) => ({ slug, name: slug, email: null, oncall: null, description: null })) });
  await pushInventory({ environment: "prod", format: "pinchpoint", body: CHECKOUT, dryRun: false, actor: system });
});

const teamId = async (slug: string) => (await db().models.Team.findOne({ where: { slug } }))!.id;

describe("sessions end on the server", () => {
  it("sign-out: a copy of the cookie stops working at once", async () => {
    const user = await createUser("viewer");
    const copy = { ...user };
    expect((await read(user)).status).toBe(200);
    // What next-auth runs on POST /api/auth/signout, with the session's decoded token.
    await authOptions.events!.signOut!({ token: { sub: user.id }, session: null as never });
    expect((await read(copy)).status).toBe(401);
    expect((await read(await signInAgain(user))).status).toBe(200);
  });

  it("a role change ends the sessions open under the old role", async () => {
    const user = await createUser("architect");
    expect((await read(user)).status).toBe(200);
    expect((await setUser(admin, user, { role: "viewer" })).status).toBe(200);
    expect((await read(user)).status).toBe(401);
    expect((await read(await signInAgain(user))).status).toBe(200);
  });

  it("deactivation ends them, and reactivation does not bring them back", async () => {
    const user = await createUser("engineer");
    expect((await setUser(admin, user, { active: false })).status).toBe(200);
    expect((await read(user)).status).toBe(401);
    expect((await setUser(admin, user, { active: true })).status).toBe(200);
    expect((await read(user)).status).toBe(401);
  });

  it("setting a password ends any session opened before it", async () => {
    const invited = await inviteUser({ input: { email: "new-hire@harbor-pantry.example", name: "New Hire", role: "viewer" }, actor: { type: "user", id: admin.id, email: admin.email, name: "admin", role: "admin", label: admin.email } });
    const before = await db().models.User.findByPk(invited.user.id);
    await acceptInvite({ token: invited.token, input: { password: "a long enough password" } });
    const after = await db().models.User.findByPk(invited.user.id);
    expect(after!.sessionVersion).toBe(before!.sessionVersion + 1);
  });

  it("a cookie without a session version (issued before this rule) is refused", async () => {
    const user = await createUser("viewer");
    const { encode } = await import("next-auth/jwt");
    const jwt = await encode({ token: { sub: user.id, email: user.email, role: "viewer" }, secret: process.env.NEXTAUTH_SECRET ?? "" });
    expect((await read({ ...user, cookie: `next-auth.session-token=${jwt}` })).status).toBe(401);
  });
});

describe("API tokens never exceed their creator's current rights", () => {
  it("a write token stops pushing when its creator is demoted to viewer, and reads on", async () => {
    const creator = await createUser("admin");
    const writer = await createApiToken({ scopes: ["inventory:write"], createdBy: creator.id });
    const reader = await createApiToken({ scopes: ["read"], createdBy: creator.id });
    expect((await pushAs({ token: writer }, "pinchpoint: 1\nsource: capped-repo\ncomponents: []\n")).status).toBe(200);
    expect((await setUser(admin, creator, { role: "viewer" })).status).toBe(200);
    const refused = await pushAs({ token: writer }, "pinchpoint: 1\nsource: capped-repo\ncomponents: []\n");
    expect(refused.status).toBe(403);
    expect((refused.json as { message: string }).message).toContain("no longer has");
    expect((await read({ token: reader })).status).toBe(200);
  });

  it("every token of a deactivated creator stops working; reactivation restores them", async () => {
    const creator = await createUser("admin");
    const token = await createApiToken({ scopes: ["read"], createdBy: creator.id });
    expect((await setUser(admin, creator, { active: false })).status).toBe(200);
    const res = await read({ token });
    expect(res.status).toBe(401);
    expect((res.json as { message: string }).message).toContain("no longer has an active account");
    expect((await setUser(otherAdmin, creator, { active: true })).status).toBe(200);
    expect((await read({ token })).status).toBe(200);
  });

  it("an unbound token creates environments only while its creator is an admin", async () => {
    const creator = await createUser("admin");
    const token = await createApiToken({ scopes: ["inventory:write"], createdBy: creator.id });
    expect((await setUser(admin, creator, { role: "architect" })).status).toBe(200);
    const res = await pushAs({ token }, "pinchpoint: 1\nsource: new-repo\ncomponents: []\n", "brand-new");
    expect(res.status).toBe(404);
  });
});

describe("replacing another team's source", () => {
  it("is refused to an engineer outside the teams the source's components name; nothing changes", async () => {
    const outsider = await createUser("engineer");
    await addMembership({ userId: outsider.id, teamId: await teamId("search"), isLead: false });
    const res = await pushAs(outsider, EMPTY_CHECKOUT);
    expect(res.status).toBe(403);
    expect((res.json as { message: string }).message).toContain('declares components of "checkout"');
    expect(await db().models.Component.count({ where: { key: ["cart", "orders-db"] } })).toBe(2);
  });

  it("is refused to an unbound write token whose creator is an engineer outside those teams (a token acts as its creator)", async () => {
    const creator = await createUser("admin");
    const token = await createApiToken({ scopes: ["inventory:write"], createdBy: creator.id });
    expect((await setUser(admin, creator, { role: "engineer" })).status).toBe(200);
    expect((await pushAs({ token }, EMPTY_CHECKOUT)).status).toBe(403);
  });

  it("is allowed to a member of the team, to an architect and to an admin's token", async () => {
    const member = await createUser("engineer");
    await addMembership({ userId: member.id, teamId: await teamId("checkout"), isLead: false });
    expect((await pushAs(member, CHECKOUT.replace("needs: [orders-db]", "needs: []"))).status).toBe(200);
    expect((await pushAs(await createUser("architect"), CHECKOUT)).status).toBe(200);
    const token = await createApiToken({ scopes: ["inventory:write"], createdBy: admin.id });
    expect((await pushAs({ token }, CHECKOUT)).status).toBe(200);
  });

  it("a new source, or one whose components name no team, is open to anyone who may push", async () => {
    const engineer = await createUser("engineer");
    expect((await pushAs(engineer, "pinchpoint: 1\nsource: scratch-repo\ncomponents:\n  - { key: scratch, kind: job }\n")).status).toBe(200);
    expect((await pushAs(await createUser("engineer"), "pinchpoint: 1\nsource: scratch-repo\ncomponents: []\n")).status).toBe(200);
  });
});

describe("a lead hands a component only to teams they lead", () => {
  const patch = (as: TestUser, body: object) =>
    call(annotate, { url: "/api/v1/environments/prod/components/cart", method: "PATCH", params: { env: "prod", key: "cart" }, as, body });

  it("refuses a lead of checkout giving cart to payments, which they do not lead; allows a team they lead and clearing", async () => {
    const lead = await createUser("lead");
    await addMembership({ userId: lead.id, teamId: await teamId("checkout"), isLead: true });
    await addMembership({ userId: lead.id, teamId: await teamId("search"), isLead: true });
    const refused = await patch(lead, { team: "payments" });
    expect(refused.status).toBe(403);
    expect((refused.json as { message: string }).message).toContain("only to teams they lead");
    expect((await db().models.ComponentAnnotation.findOne({ where: { key: "cart" } }))?.ownerTeam ?? null).toBe(null);
    const led = await patch(lead, { team: "search" });
    expect(led.status).toBe(200);
    expect(led.json).toMatchObject({ team: "search" });
    // Back to what the file declares (checkout), the file's word rather than the lead's.
    expect((await patch(lead, { team: null })).json).toMatchObject({ team: "checkout" });
  });

  it("lets an architect give it to any team", async () => {
    expect((await patch(await createUser("architect"), { team: "payments" })).json).toMatchObject({ team: "payments" });
  });
});
