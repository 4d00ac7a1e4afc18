// Admin user management over the API: who may call it, what bad input does (422, nothing written),
// the one-time invite link, and the audit trail of every change.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listUsersRoute, POST as inviteRoute } from "@/app/api/v1/users/route";
import { PATCH as updateUserRoute } from "@/app/api/v1/users/[id]/route";
import { POST as reissueRoute } from "@/app/api/v1/users/[id]/invite/route";
import { POST as acceptRoute } from "@/app/api/v1/invites/[token]/route";
import { GET as listEnvironments } from "@/app/api/v1/environments/route";
import { ROLES, type Role } from "@/lib/auth/roles";
import { findOpenInvite } from "@/lib/data/user-admin";
import { verifyPassword } from "@/lib/data/users";
import { db } from "@/models";
import { call, createApiToken, createUser, signInAgain, type TestUser } from "../support/api";

const users = {} as Record<Role, TestUser>;
let token: string;

async function counts() {
  const { User, Invite, AuditEvent } = db().models;
  return { users: await User.count(), invites: await Invite.count(), audit: await AuditEvent.count() };
}

async function invite(email: string, role: Role = "engineer") {
  const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: users.admin, body: { email, name: "Nadia Okafor", role } });
  expect(res.status).toBe(201);
  return res.json as { token: string; url: string; expiresAt: string; user: { id: string; email: string; status: string } };
}

const accept = (secret: string, password: string) =>
  call(acceptRoute, { url: `/api/v1/invites/${secret}`, method: "POST", params: { token: secret }, body: { password } });

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  token = await createApiToken({ scopes: ["read", "inventory:write"], createdBy: users.admin.id });
});

describe("who may manage people", () => {
  const someId = "00000000-0000-4000-8000-000000000000";
  const routes = [
    { name: "GET /users", run: (as: TestUser | { token: string } | null) => call(listUsersRoute, { url: "/api/v1/users", as }) },
    { name: "POST /users", run: (as: TestUser | { token: string } | null) => call(inviteRoute, { url: "/api/v1/users", method: "POST", as, body: { email: "x@test.example", name: "X", role: "viewer" } }) },
    { name: "PATCH /users/{id}", run: (as: TestUser | { token: string } | null) => call(updateUserRoute, { url: `/api/v1/users/${someId}`, method: "PATCH", params: { id: someId }, as, body: { role: "viewer" } }) },
    { name: "POST /users/{id}/invite", run: (as: TestUser | { token: string } | null) => call(reissueRoute, { url: `/api/v1/users/${someId}/invite`, method: "POST", params: { id: someId }, as }) },
  ];

  for (const route of routes) {
    it(`${route.name}: 401 for anonymous, 403 for every other role and for a token`, async () => {
      const before = await counts();
      expect((await route.run(null)).status).toBe(401);
      for (const role of ROLES.filter((r) => r !== "admin")) {
        const res = await route.run(users[role]);
        expect(res.status, role).toBe(403);
        expect(res.json).toMatchObject({ error: "forbidden" });
      }
      expect((await route.run({ token })).status).toBe(403);
      expect(await counts()).toEqual(before);
    });
  }

  it("lists people with role, state and creation time for an admin", async () => {
    const res = await call(listUsersRoute, { url: "/api/v1/users", as: users.admin });
    expect(res.status).toBe(200);
    const items = (res.json as { items: { email: string; role: string; active: boolean; status: string; createdAt: string }[] }).items;
    expect(items.find((u) => u.email === users.lead.email)).toMatchObject({ role: "lead", active: true, status: "active", createdAt: expect.any(String) });
  });
});

describe("inviting", () => {
  it.each([
    ["not an e-mail", { email: "nadia", name: "Nadia", role: "viewer" }, "email"],
    ["an unknown role", { email: "n1@test.example", name: "Nadia", role: "owner" }, "role"],
    ["no name", { email: "n2@test.example", name: " ", role: "viewer" }, "name"],
    ["an unknown field", { email: "n3@test.example", name: "Nadia", role: "viewer", password: "x" }, ""],
  ])("refuses %s with 422 and writes nothing", async (_what, body, path) => {
    const before = await counts();
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: users.admin, body });
    expect(res.status).toBe(422);
    expect(res.json).toMatchObject({ error: "invalid_request", issues: [expect.objectContaining({ path: expect.stringContaining(path) })] });
    expect(await counts()).toEqual(before);
  });

  it("refuses a body that is not JSON with 400 and writes nothing", async () => {
    const before = await counts();
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: users.admin, body: "{not json", headers: { "content-type": "application/json" } });
    expect(res.status).toBe(400);
    expect(await counts()).toEqual(before);
  });

  it("refuses an e-mail that already has an account with 409", async () => {
    const before = await counts();
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: users.admin, body: { email: users.viewer.email.toUpperCase(), name: "Again", role: "viewer" } });
    expect(res.status).toBe(409);
    expect(await counts()).toEqual(before);
  });

  it("creates a password-less user with a link that works exactly once", async () => {
    const created = await invite("Nadia.Okafor@Test.Example", "engineer");
    expect(created.user).toMatchObject({ email: "nadia.okafor@test.example", status: "invited" });
    expect(created.url).toMatch(new RegExp(`/invite/${created.token}$`));
    const hours = (new Date(created.expiresAt).getTime() - Date.now()) / 3_600_000;
    expect(hours).toBeGreaterThan(71.9);
    expect(hours).toBeLessThanOrEqual(72);

    // Only a hash is stored.
    const row = await db().models.Invite.findOne({ where: { userId: created.user.id } });
    expect(row?.secretHash).toMatch(/^[0-9a-f]{64}$/);
    expect(row?.secretHash).not.toContain(created.token);
    // No password yet: sign-in is impossible.
    expect(await verifyPassword({ email: "nadia.okafor@test.example", password: "" })).toBeNull();

    const audit = await db().models.AuditEvent.findOne({ where: { action: "user.invite", targetId: created.user.id } });
    expect(audit?.actorLabel).toBe(users.admin.email);
    expect(audit?.after).toMatchObject({ email: "nadia.okafor@test.example", role: "engineer", active: true });

    expect(await findOpenInvite({ token: created.token })).toMatchObject({ email: "nadia.okafor@test.example" });

    // A too-short password is a 422 that leaves the link open.
    const short = await accept(created.token, "short");
    expect(short.status).toBe(422);
    expect(await findOpenInvite({ token: created.token })).not.toBeNull();

    const first = await accept(created.token, "tide pool lantern keel");
    expect(first.status).toBe(200);
    expect(await verifyPassword({ email: "nadia.okafor@test.example", password: "tide pool lantern keel" })).toMatchObject({ role: "engineer" });
    expect(await db().models.AuditEvent.count({ where: { action: "user.invite.accept", targetId: created.user.id } })).toBe(1);

    const second = await accept(created.token, "another password entirely");
    expect(second.status).toBe(404);
    expect(await verifyPassword({ email: "nadia.okafor@test.example", password: "another password entirely" })).toBeNull();
    expect(await findOpenInvite({ token: created.token })).toBeNull();
  });

  it("two simultaneous uses of one link set the password once", async () => {
    const created = await invite("race@test.example");
    const results = await Promise.all([accept(created.token, "first racing password"), accept(created.token, "second racing password")]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 404]);
  });

  it("refuses an expired link and a malformed one", async () => {
    const created = await invite("late@test.example");
    await db().models.Invite.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: created.user.id } });
    expect((await accept(created.token, "too late for this one")).status).toBe(404);
    expect((await accept("short-token", "whatever password here")).status).toBe(404);
    const list = await call(listUsersRoute, { url: "/api/v1/users", as: users.admin });
    expect((list.json as { items: { email: string; status: string }[] }).items.find((u) => u.email === "late@test.example")?.status).toBe("invite-expired");
  });

  it("a new link replaces the old one", async () => {
    const created = await invite("again@test.example");
    const res = await call(reissueRoute, { url: `/api/v1/users/${created.user.id}/invite`, method: "POST", params: { id: created.user.id }, as: users.admin });
    expect(res.status).toBe(201);
    const fresh = res.json as { token: string };
    expect(fresh.token).not.toBe(created.token);
    expect((await accept(created.token, "old link password")).status).toBe(404);
    expect((await accept(fresh.token, "new link password!")).status).toBe(200);
    // Once the account is set up there is nothing left to invite to.
    const again = await call(reissueRoute, { url: `/api/v1/users/${created.user.id}/invite`, method: "POST", params: { id: created.user.id }, as: users.admin });
    expect(again.status).toBe(409);
  });
});

describe("role changes and deactivation", () => {
  it("changes a role, audited with before and after, effective on the next request", async () => {
    const target = await createUser("viewer");
    const res = await call(updateUserRoute, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: users.admin, body: { role: "lead" } });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ id: target.id, role: "lead" });
    const audit = await db().models.AuditEvent.findOne({ where: { action: "user.role", targetId: target.id } });
    expect(audit?.before).toMatchObject({ role: "viewer", active: true });
    expect(audit?.after).toMatchObject({ role: "lead", active: true });
    expect(audit?.actorLabel).toBe(users.admin.email);
  });

  it("deactivates (the session stops working at once and stays ended) and reactivates (a new sign-in works), both audited", async () => {
    const target = await createUser("engineer");
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: target })).status).toBe(200);
    const off = await call(updateUserRoute, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: users.admin, body: { active: false } });
    expect(off.status).toBe(200);
    expect(off.json).toMatchObject({ active: false, status: "deactivated" });
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: target })).status).toBe(401);
    const on = await call(updateUserRoute, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: users.admin, body: { active: true } });
    expect(on.json).toMatchObject({ active: true });
    // Reactivation does not bring the ended session back: the person signs in again.
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: target })).status).toBe(401);
    expect((await call(listEnvironments, { url: "/api/v1/environments", as: await signInAgain(target) })).status).toBe(200);
    const actions = (await db().models.AuditEvent.findAll({ where: { targetId: target.id }, order: [["createdAt", "ASC"]] })).map((a) => a.action);
    expect(actions).toEqual(["user.deactivate", "user.reactivate"]);
  });

  it("an admin cannot demote or deactivate themselves; nothing is written", async () => {
    const before = await counts();
    for (const body of [{ role: "architect" }, { active: false }]) {
      const res = await call(updateUserRoute, { url: `/api/v1/users/${users.admin.id}`, method: "PATCH", params: { id: users.admin.id }, as: users.admin, body });
      expect(res.status).toBe(409);
      expect((res.json as { message: string }).message).toMatch(/cannot .* your own/);
    }
    expect(await counts()).toEqual(before);
    expect((await db().models.User.findByPk(users.admin.id))?.role).toBe("admin");
  });

  it.each([
    ["an empty body", {}],
    ["an unknown role", { role: "root" }],
    ["a non-boolean active", { active: "no" }],
    ["an unknown field", { role: "viewer", email: "x@test.example" }],
  ])("refuses %s with 422 and writes nothing", async (_what, body) => {
    const target = users.viewer;
    const before = await counts();
    const res = await call(updateUserRoute, { url: `/api/v1/users/${target.id}`, method: "PATCH", params: { id: target.id }, as: users.admin, body });
    expect(res.status).toBe(422);
    expect(await counts()).toEqual(before);
    expect((await db().models.User.findByPk(target.id))?.role).toBe("viewer");
  });

  it("answers 404 for an unknown or malformed id", async () => {
    const unknown = "11111111-1111-4111-8111-111111111111";
    expect((await call(updateUserRoute, { url: `/api/v1/users/${unknown}`, method: "PATCH", params: { id: unknown }, as: users.admin, body: { role: "viewer" } })).status).toBe(404);
    expect((await call(updateUserRoute, { url: "/api/v1/users/nope", method: "PATCH", params: { id: "nope" }, as: users.admin, body: { role: "viewer" } })).status).toBe(404);
  });
});
