import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { expectIssues, expectOk, fixture, located } from "./helpers";

const compose = (body: string | Buffer, source: string | undefined = "harbor-compose", environment?: string) =>
  importInventory({ format: "compose", body, source, environment });

const hard = (key: string) => ({ type: "single", key, strength: "hard", via: null });
const soft = (key: string) => ({ type: "single", key, strength: "soft", via: null });

// Behaviour of depends_on and links follows the Compose Specification (services.md,
// "depends_on" short and long syntax, "links"), read from the spec text, not from a tool.
describe("compose importer", () => {
  it("list form: each service a component, depends_on and links (svc:alias) hard needs, keys lower-cased", () => {
    const inv = expectOk(compose(fixture("compose/list-form.yaml"), "harbor-compose", "production"));
    expect(inv).toMatchObject({ source: "harbor-compose", environment: "production", observedEdges: [], warnings: [] });
    expect(inv.components.map((c) => [c.key, c.name, c.kind])).toEqual([
      ["storefront", "storefront", "service"],
      ["basket", "basket", "service"],
      // Kinds from the image table in importers/compose/kinds.ts: valkey is a cache, postgres a datastore.
      ["session-store", "Session-Store", "cache"],
      ["orders-db", "orders-db", "datastore"],
      ["search", "search", "service"],
    ]);
    expect(inv.components[0]?.needs).toEqual([hard("basket"), hard("session-store"), hard("search")]);
    // deploy.replicas is read; merge keys (<<: *common) and x- extensions are no trouble.
    expect(inv.components[1]).toMatchObject({ replicas: 3, tier: 3, team: null, needs: [hard("orders-db")] });
  });

  // services.depends_on, long syntax: service_completed_successfully "is expected to run to successful
  // completion before starting a dependent service" → needed to start only; required: false → Compose
  // "only warns you when the dependency service isn't started" → soft.
  it("map form: required: false is soft, service_completed_successfully start-up only, other conditions hard; links merge with depends_on", () => {
    const inv = expectOk(compose(fixture("compose/map-form.yaml")));
    const checkout = inv.components.find((c) => c.key === "checkout");
    expect(checkout?.needs).toEqual([
      hard("payments"),
      { type: "single", key: "migrations", strength: "startup", via: null },
      soft("recommendations"),
      hard("fraud-check"),
      hard("loyalty-api"),
    ]);
    // What others wait to complete is a one-shot job.
    expect(inv.components.find((c) => c.key === "migrations")?.kind).toBe("job");
    // loyalty-api is linked but not defined here: kept as a need, with a located warning.
    expect(inv.warnings).toEqual([located("services.checkout.links[1]", 18, 9, /"loyalty-api" is not a service in this project/)]);
  });

  it("a need named twice with different strengths ends hard", () => {
    const inv = expectOk(compose("services:\n  a:\n    depends_on:\n      b: { required: false }\n    links: [b]\n  b: {}\n"));
    expect(inv.components[0]?.needs).toEqual([hard("b")]);
  });

  it("bad names, conditions, self-dependency, shapes and lower-case collisions are all located", () => {
    const issues = expectIssues(compose(fixture("compose/bad.yaml")), 422);
    expect(issues).toEqual([
      located('services["web_Frontend!"]', 2, 3, /cannot be a component key/),
      located("services.api.depends_on.db.condition", 7, 20, /invalid condition "service_ready"/),
      located("services.api.depends_on.api", 8, 12, /depends on itself/),
      located("services.api.links[0]", 9, 13, /a link must be a string/),
      located("services.worker", 10, 3, /"worker" and "Worker" both become key "worker"/),
      located("services.worker.depends_on", 11, 17, /depends_on must be a list/),
      located("services.Worker", 12, 3, /"worker" and "Worker" both become key "worker"/),
    ]);
  });

  it("needs a source from the push, and a mapping of services", () => {
    expect(expectIssues(compose("services: {}\n", ""), 422)).toEqual([expect.objectContaining({ path: "source", message: expect.stringMatching(/names no source/) })]);
    expect(expectIssues(compose("services: {}\n", "Bad Source"), 422)[0]?.message).toMatch(/invalid source/);
    expect(expectIssues(compose("name: x\nvolumes: {}\n"), 422)).toEqual([located("services", 1, 1, /^the file holds no services$/)]);
    expect(expectIssues(compose("# nothing here yet\n# services will come\n"), 422)).toEqual([located("services", 1, 1, /^the file holds no services$/)]);
  });

  it("shares the YAML guards: alias bombs and duplicate keys", () => {
    const issues = expectIssues(compose(fixture("pinchpoint/bad/billion-laughs.yaml")), 413);
    expect(issues[0]?.message).toMatch(/aliases expand/);
    expect(expectIssues(compose("services:\n  a: {}\n  a: {}\n"), 422)).toEqual([located("services.a", 3, 3, /duplicate mapping key/)]);
  });
});
