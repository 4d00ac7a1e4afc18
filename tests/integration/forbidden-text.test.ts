// NUL bytes, other control characters and lone surrogates in every text field of the API and in
// pushed files: a 422 naming the field, never a 500 (PostgreSQL refuses NUL) nor a value stored
// altered (a lone surrogate became U+FFFD). Rule and sources: tests/lib/forbidden-text.test.ts.
import { beforeAll, describe, expect, it } from "vitest";
import { POST as pushRoute } from "@/app/api/v1/environments/[env]/inventory/route";
import { GET as listComponents } from "@/app/api/v1/environments/[env]/components/route";
import { PATCH as annotate } from "@/app/api/v1/environments/[env]/components/[key]/route";
import { PUT as review } from "@/app/api/v1/environments/[env]/reviews/[key]/route";
import { POST as createTeam } from "@/app/api/v1/teams/route";
import { POST as invite } from "@/app/api/v1/users/route";
import { PATCH as renameEnvironment } from "@/app/api/v1/environments/[env]/route";
import { db } from "@/models";
import { pushInventory } from "@/lib/data/push";
import { call, createUser, type TestUser } from "../support/api";

let admin: TestUser;

beforeAll(async () => {
  admin = await createUser("admin");
  await pushInventory({
    environment: "prod",
    format: "pinchpoint",
    body: "pinchpoint: 1\nsource: s\ncomponents:\n  - { key: a, kind: service }\n",
    dryRun: false,
    actor: { type: "system", label: "test", canCreateEnvironments: true },
  });
});

const issuesOf = (json: unknown) => (json as { issues?: Array<{ path: string; message: string }> }).issues ?? [];

describe("JSON bodies", () => {
  const cases = [
    { what: "component notes", handler: annotate, url: "/api/v1/environments/prod/components/a", method: "PATCH", params: { env: "prod", key: "a" }, body: { notes: "on call: \u0000 see runbook" }, path: "body.notes" },
    { what: "a team name (lone surrogate)", handler: createTeam, url: "/api/v1/teams", method: "POST", params: {}, body: { slug: "ghost", name: "Gh\ud800st" }, path: "body.name" },
    { what: "a team description", handler: createTeam, url: "/api/v1/teams", method: "POST", params: {}, body: { slug: "bell", name: "Bell", description: "ring \u0007" }, path: "body.description" },
    { what: "a review rationale", handler: review, url: "/api/v1/environments/prod/reviews/a", method: "PUT", params: { env: "prod", key: "a" }, body: { status: "accepted", rationale: "fine\u001b[0m", reviewBy: null }, path: "body.rationale" },
    { what: "an invited person's name", handler: invite, url: "/api/v1/users", method: "POST", params: {}, body: { email: "nul@harbor-pantry.example", name: "N\u0000L", role: "viewer" }, path: "body.name" },
    { what: "an environment's name", handler: renameEnvironment, url: "/api/v1/environments/prod", method: "PATCH", params: { env: "prod" }, body: { name: "Prod\udc00" }, path: "body.name" },
  ] as const;

  it.each(cases)("$what: 422 naming $path, nothing stored", async ({ handler, url, method, params, body, path }) => {
    const before = await db().models.AuditEvent.count();
    const res = await call(handler as never, { url, method, params, as: admin, body });
    expect(res.status).toBe(422);
    expect(issuesOf(res.json)).toEqual([expect.objectContaining({ path })]);
    expect(await db().models.AuditEvent.count()).toBe(before);
  });
});

describe("query strings", () => {
  it("a NUL in ?q= is a 422 naming query.q", async () => {
    const res = await call(listComponents, { url: "/api/v1/environments/prod/components?q=a%00b", params: { env: "prod" }, as: admin });
    expect(res.status).toBe(422);
    expect(issuesOf(res.json)).toEqual([expect.objectContaining({ path: "query.q", message: expect.stringContaining("U+0000") })]);
  });
});

describe("pushed files", () => {
  it.each([
    ["YAML \\0", 'name: "a\\0b"', "application/yaml"],
    ["YAML \\u0000", 'name: "\\u0000"', "application/yaml"],
    ["YAML \\ud800", 'name: "\\ud800"', "application/yaml"],
  ])("%s in a name is a 422 located at components[0].name", async (_, field, contentType) => {
    const body = `pinchpoint: 1\nsource: s\ncomponents:\n  - key: a\n    kind: service\n    ${field}\n`;
    const res = await call(pushRoute, { url: "/api/v1/environments/prod/inventory", method: "POST", params: { env: "prod" }, as: admin, body, headers: { "content-type": contentType } });
    expect(res.status).toBe(422);
    expect(issuesOf(res.json)).toEqual([expect.objectContaining({ path: "components[0].name", line: 6 })]);
  });

  it("JSON \\u0000 and a lone \\ud800 are refused the same way", async () => {
    for (const value of ["\\u0000", "\\ud800"]) {
      const body = `{"pinchpoint":1,"source":"s","components":[{"key":"a","kind":"service","name":"x${value}"}]}`;
      const res = await call(pushRoute, { url: "/api/v1/environments/prod/inventory", method: "POST", params: { env: "prod" }, as: admin, body, headers: { "content-type": "application/json" } });
      expect(res.status).toBe(422);
      expect(issuesOf(res.json)[0]).toMatchObject({ path: "components[0].name" });
    }
  });
});
