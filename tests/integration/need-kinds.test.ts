// Start-up-only needs, aliases and single warnings through the push path (DESIGN §10), against PostgreSQL.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { GET as getSettings, PATCH as patchSettings } from "@/app/api/v1/environments/[env]/settings/route";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

let admin: TestUser;
let architect: TestUser;
let engineer: TestUser;
const pushYaml = (body: string, query = "") =>
  call(push, { url: `/api/v1/environments/kinds/inventory${query}`, method: "POST", params: { env: "kinds" }, as: admin, body, headers: { "content-type": "application/yaml" } });

const CART = `pinchpoint: 1
source: cart-repo
components:
  - key: cart
    kind: service
    aliases: [cartservice]
  - key: schema-job
    kind: job
`;
const FRONT = `pinchpoint: 1
source: front-repo
components:
  - key: web
    kind: service
    needs:
      - cartservice
      - { key: schema-job, strength: startup }
      - payments
`;

const rows = () =>
  db().sequelize.query<{ from_key: string; to_key: string; strength: string; written_to: string | null; provenance: string[] }>(
    `SELECT d.from_key, d.to_key, d.strength, d.written_to, d.provenance FROM dependencies d
       JOIN environments e ON e.id = d.environment_id WHERE e.slug = 'kinds' ORDER BY d.from_key, d.to_key`,
    { type: QueryTypes.SELECT },
  );

beforeAll(async () => {
  admin = await createUser("admin");
  architect = await createUser("architect");
  engineer = await createUser("engineer");
});

describe("need kinds and aliases through a push", () => {
  it("stores start-up needs and needs written as aliases resolved, keeping the name written", async () => {
    expect((await pushYaml(CART)).status).toBe(200);
    const res = await pushYaml(FRONT);
    expect(res.status).toBe(200);
    expect(await rows()).toEqual([
      { from_key: "web", to_key: "cart", strength: "hard", written_to: "cartservice", provenance: ["declared"] },
      { from_key: "web", to_key: "payments", strength: "hard", written_to: null, provenance: ["declared"] },
      { from_key: "web", to_key: "schema-job", strength: "startup", written_to: null, provenance: ["declared"] },
    ]);
    // One warning for the undeclared need, not the importer's and the merge's copies of it.
    const warnings = (res.json as { warnings: { message: string }[] }).warnings;
    expect(warnings.filter((w) => w.message.includes("payments"))).toHaveLength(1);
  });

  it("an identical push changes nothing; dropping the alias re-resolves the other source's needs", async () => {
    const again = await pushYaml(FRONT);
    expect((again.json as { changed: boolean }).changed).toBe(false);
    const res = await pushYaml(CART.replace("    aliases: [cartservice]\n", ""));
    expect((res.json as { changed: boolean }).changed).toBe(true);
    expect((await rows()).map((r) => `${r.to_key}:${r.written_to}`)).toEqual(["cartservice:null", "payments:null", "schema-job:null"]);
    const [placeholder] = await db().sequelize.query<{ kind: string }>(
      "SELECT kind FROM components c JOIN environments e ON e.id = c.environment_id WHERE e.slug = 'kinds' AND c.key = 'cartservice'",
      { type: QueryTypes.SELECT },
    );
    expect(placeholder?.kind).toBe("undeclared");
  });

  it("an alias that another source uses as a key is a 409 that names both, and writes nothing", async () => {
    const before = await rows();
    const res = await pushYaml(`pinchpoint: 1\nsource: rival-repo\ncomponents:\n  - key: basket\n    kind: service\n    aliases: [cart]\n`);
    expect(res.status).toBe(409);
    expect((res.json as { message: string }).message).toMatch(/"cart" is a component key \(source "cart-repo"\) and an alias of "basket" \(source "rival-repo"\)/);
    expect(await rows()).toEqual(before);
  });
});

describe("environment settings", () => {
  const patch = (as: TestUser, body: unknown) =>
    call(patchSettings, { url: "/api/v1/environments/kinds/settings", method: "PATCH", params: { env: "kinds" }, as, body: body as object });

  it("reads every default, and an architect's change re-queues the newest snapshot's analysis, audited", async () => {
    const read = await call(getSettings, { url: "/api/v1/environments/kinds/settings", params: { env: "kinds" }, as: engineer });
    expect(read.json).toMatchObject({ settings: { inferredNeeds: "hard", observedNeeds: "soft", analysisView: null, traceWindowDays: 7 } });
    const res = await patch(architect, { inferredNeeds: "soft" });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ settings: { inferredNeeds: "soft" }, requeued: { snapshot: expect.any(Number) } });
    const [audit] = await db().sequelize.query<{ action: string }>("SELECT action FROM audit_events WHERE action = 'settings.update'", { type: QueryTypes.SELECT });
    expect(audit?.action).toBe("settings.update");
    // A change the analysis does not read re-queues nothing.
    expect((await patch(architect, { traceWindowDays: 14 })).json).toMatchObject({ requeued: null });
  });

  it("refuses engineers, unknown fields and empty changes, and changes nothing", async () => {
    expect((await patch(engineer, { inferredNeeds: "hard" })).status).toBe(403);
    const bad = await patch(architect, { inferredNeeds: "maybe", colour: "red" });
    expect(bad.status).toBe(422);
    expect((await patch(architect, {})).status).toBe(422);
    const read = await call(getSettings, { url: "/api/v1/environments/kinds/settings", params: { env: "kinds" }, as: engineer });
    expect(read.json).toMatchObject({ settings: { inferredNeeds: "soft", traceWindowDays: 14 } });
  });
});
