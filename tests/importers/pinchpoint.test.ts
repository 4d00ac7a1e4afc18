import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { MAX_BODY_BYTES, MAX_COMPONENTS } from "@/lib/inventory/limits";
import { generateInventoryJson, generateInventoryYaml } from "../fixtures/generate";
import { expectIssues, expectOk, fixture, located } from "./helpers";

// Expected behaviour comes from the contract (DESIGN §2: unknown fields, self-dependency, duplicate
// keys, version, located issues). Outside references: YAML 1.2.2 requires mapping keys to be unique
// (§3.2.1.1, from memory); RFC 8259 §2 grammar has no trailing comma in arrays or objects;
// the "billion laughs" alias bomb is the usual entity-expansion attack (common practice to test).
const pinch = (body: string | Buffer, extra: { contentType?: string; source?: string; environment?: string } = {}) =>
  importInventory({ format: "pinchpoint", body, ...extra });

describe("format 1: good files", () => {
  it("reads the YAML example with defaults merged, shorthand and any_of needs", () => {
    const inv = expectOk(pinch(fixture("pinchpoint/storefront.yaml")));
    expect(inv.source).toBe("storefront-repo");
    expect(inv.environment).toBe("production");
    expect(inv.observedEdges).toEqual([]);
    const [web, gateway, basket] = inv.components;
    expect(web).toEqual({
      key: "web-frontend",
      name: "Web frontend",
      kind: "service",
      team: "storefront",
      tier: 1,
      replicas: 3,
      zones: ["zone-a", "zone-b"],
      tags: ["customer-facing"],
      aliases: [],
      links: {
        repo: "https://git.harbor-pantry.example/storefront",
        runbook: "https://wiki.harbor-pantry.example/runbooks/web-frontend",
      },
      needs: [
        { type: "single", key: "api-gateway", strength: "hard", via: null },
        { type: "single", key: "recommendations", strength: "soft", via: "http" },
        { type: "any_of", keys: ["search-primary", "search-fallback"], strength: "hard", via: null },
      ],
    });
    // Defaults fill what a component leaves out; name defaults to the key.
    expect(gateway).toMatchObject({ name: "api-gateway", team: "storefront", tags: [], needs: [{ key: "session-store" }, { key: "basket", via: "grpc" }] });
    // An explicit `team: null` beats the default team: the component is unowned.
    expect(basket).toMatchObject({ team: null, tier: 3, replicas: 1, zones: [] });
  });

  it("reads JSON with the same parser rules", () => {
    const inv = expectOk(pinch(fixture("pinchpoint/storefront.json")));
    expect(inv.components.map((c) => c.key)).toEqual(["checkout", "orders-db"]);
    expect(inv.components[1]).toMatchObject({ name: "Orders database", team: null, tier: 1, replicas: 1, links: {}, needs: [] });
  });

  it("accepts a byte-order mark and CRLF line endings", () => {
    const inv = expectOk(pinch(fixture("pinchpoint/bom-crlf.yaml")));
    expect(inv.components.map((c) => [c.key, c.kind])).toEqual([["pantry-api", "service"], ["pantry-db", "datastore"]]);
  });

  it("takes the environment from the push when the file names none, and agrees when both do", () => {
    const text = "pinchpoint: 1\nsource: ops-repo\ncomponents: []\n";
    expect(expectOk(pinch(text, { environment: "staging" })).environment).toBe("staging");
    expect(expectOk(pinch(text)).environment).toBeNull();
  });

  it("allows YAML merge keys and small aliases", () => {
    const text = [
      "pinchpoint: 1",
      "source: ops-repo",
      "defaults: &d { tier: 2 }",
      "components:",
      "  - key: a",
      "    kind: service",
      "    zones: &z [zone-a, zone-b]",
      "  - key: b",
      "    kind: service",
      "    zones: *z",
    ].join("\n");
    const inv = expectOk(pinch(text));
    expect(inv.components.map((c) => [c.tier, c.zones])).toEqual([[2, ["zone-a", "zone-b"]], [2, ["zone-a", "zone-b"]]]);
  });

  it("keeps needs on keys the file does not declare (the data layer makes placeholders)", () => {
    const inv = expectOk(pinch("pinchpoint: 1\nsource: a-repo\ncomponents:\n  - key: a\n    kind: job\n    needs: [elsewhere]\n"));
    expect(inv.components[0]?.needs).toEqual([{ type: "single", key: "elsewhere", strength: "hard", via: null }]);
  });

  it("merges a repeated need into the first with a located warning; hard wins", () => {
    const text = [
      "pinchpoint: 1",
      "source: a-repo",
      "components:",
      "  - key: a",
      "    kind: service",
      "    needs:",
      "      - { key: b, strength: soft, via: http }",
      "      - b",
      "      - any_of: [c, d]",
      "      - any_of: [d, c]",
    ].join("\n");
    const inv = expectOk(pinch(text));
    expect(inv.components[0]?.needs).toEqual([
      { type: "single", key: "b", strength: "hard", via: "http" },
      { type: "any_of", keys: ["c", "d"], strength: "hard", via: null },
    ]);
    expect(inv.warnings).toEqual([
      located("components[0].needs[1]", 8, 9, /repeats needs\[0\]/),
      located("components[0].needs[3]", 10, 9, /repeats needs\[2\]/),
    ]);
  });

  // JSON keeps this quick on a shared machine; YAML of the same size is measured, not tested (see the report).
  it(`accepts ${MAX_COMPONENTS} components (generated) and refuses one more with 413`, () => {
    const inv = expectOk(pinch(generateInventoryJson(MAX_COMPONENTS)));
    expect(inv.components).toHaveLength(MAX_COMPONENTS);
    const issues = expectIssues(pinch(generateInventoryJson(MAX_COMPONENTS + 1)), 413);
    expect(issues).toEqual([located("components", 1, 43, /50001 components .* at most 50000/)]);
  }, 60_000);

  it("reads a generated YAML inventory of 2,000 components", () => {
    const inv = expectOk(pinch(generateInventoryYaml(2_000)));
    expect(inv.components).toHaveLength(2_000);
    expect(inv.components[1_999]?.needs).toEqual([{ type: "single", key: "platform-dns", strength: "hard", via: null }]);
  });
});

// Each case: a hostile or broken input and the located issue(s) it must produce.
// Lines and columns were read off the fixture files by hand (1-based).
describe("format 1: bad inputs give located issues, all in one pass", () => {
  const cases: { name: string; file: string; status?: 413 | 422; issues: unknown[] }[] = [
    {
      name: "billion-laughs alias bomb (refused by the alias expansion cap)",
      file: "billion-laughs.yaml",
      status: 413,
      issues: [located("f[1]", 8, 12, /aliases expand to more than \d+ nodes/)],
    },
    { name: "wrong format version", file: "wrong-version.yaml", issues: [located("pinchpoint", 1, 13, /unsupported format version 2.*pinchpoint: 1/)] },
    { name: "missing format version", file: "missing-version.yaml", issues: [located("pinchpoint", 1, 1, /missing required field "pinchpoint"/)] },
    {
      name: "YAML duplicate mapping key",
      file: "duplicate-mapping-key.yaml",
      issues: [located("components[0].kind", 7, 5, /duplicate mapping key/)],
    },
    {
      name: "unknown fields at three depths",
      file: "unknown-fields.yaml",
      issues: [
        located("owner", 3, 1, /unknown field "owner"/),
        located("components[0].colour", 7, 5, /unknown field "colour"/),
        located("components[0].needs[0].timeout", 10, 9, /unknown field "timeout"/),
      ],
    },
    {
      name: "bad kinds, including the reserved `undeclared`",
      file: "bad-kind.yaml",
      issues: [
        located("components[0].kind", 5, 11, /invalid kind "microservice"/),
        located("components[1].kind", 7, 11, /reserved for placeholders/),
      ],
    },
    {
      name: "self-dependencies in shorthand, object and any_of form",
      file: "self-dependency.yaml",
      issues: [
        located("components[0].needs[1]", 8, 9, /needs itself/),
        located("components[1].needs[0].key", 12, 14, /needs itself/),
        located("components[1].needs[1].any_of[0]", 14, 18, /contains "search" itself/),
      ],
    },
    {
      name: "duplicate component key, both places reported",
      file: "duplicate-component.yaml",
      issues: [
        located("components[0].key", 4, 10, /duplicate component key "basket".*components\[2\] \(line 8\)/),
        located("components[2].key", 8, 10, /duplicate component key "basket".*components\[0\] \(line 4\)/),
      ],
    },
    {
      name: "bad slugs, key pattern, tiers, replicas, links, any_of, need shapes",
      file: "bad-values.yaml",
      issues: [
        located("environment", 3, 14, /invalid environment "Production"/),
        located("defaults.team", 5, 9, /invalid team "Store Front"/),
        located("components[0].key", 7, 10, /invalid key "Web_Frontend"/),
        located("components[0].tier", 9, 11, /tier must be from 1/),
        located("components[0].replicas", 10, 15, /invalid replicas 1.5/),
        located("components[0].links.runbook", 12, 16, /http:\/\/ or https:\/\//),
        located("components[0].links.repo", 13, 13, /invalid link "not a url"/),
        located("components[1].tier", 16, 11, /tier must be from 1/),
        located("components[1].replicas", 17, 15, /replicas must be at least 1/),
        located("components[1].needs[0].any_of", 19, 17, /at least two members/),
        located("components[1].needs[1].any_of[1]", 20, 29, /listed twice/),
        located("components[1].needs[2]", 21, 9, /a need is a component key/),
        located("components[1].needs[3].strength", 22, 37, /invalid strength "strong"/),
      ],
    },
    {
      name: "missing required fields point at the mapping that lacks them",
      file: "missing-fields.yaml",
      issues: [
        located("source", 1, 1, /missing required field "source"/),
        located("components[0].key", 3, 5, /missing required field "key"/),
        located("components[0].kind", 3, 5, /missing required field "kind"/),
        located("components[1].kind", 4, 5, /missing required field "kind"/),
      ],
    },
    { name: "a list instead of a mapping", file: "not-a-mapping.yaml", issues: [located("", 1, 1, /must be a mapping/)] },
    { name: "alias with no anchor", file: "unresolved-alias.yaml", issues: [located("components[0].zones", 6, 12, /\*zones has no anchor/)] },
    { name: "two YAML documents", file: "multiple-documents.yaml", issues: [located("", 4, 1, /multiple documents/)] },
    { name: "bad indentation", file: "bad-indentation.yaml", issues: [located("components[0].kind[\"service tier\"]", 5, 11, /Nested mappings/), located("components[0].kind[\"service tier\"]", 5, 11, /Implicit keys/)] },
    { name: "unclosed flow sequence", file: "unclosed-flow.yaml", issues: [located("", 7, 1, /Flow sequence/)] },
    { name: "JSON with a trailing comma", file: "trailing-comma.json", issues: [located("", 5, 45, /trailing comma/)] },
    { name: "JSON duplicate member name", file: "duplicate-key.json", issues: [located("components[0].kind", 5, 45, /duplicate member name "kind"/)] },
    {
      name: "JSON unknown field and bad kind, located through the YAML parser",
      file: "unknown-field.json",
      issues: [located("components[1].kind", 6, 34, /invalid kind "servce"/), located("components[1].owner", 6, 44, /unknown field "owner"/)],
    },
    { name: "JSON with a single-quoted string", file: "bad-token.json", issues: [located("", 4, 48, /expected a value, found "'"/)] },
    { name: "CRLF file with a bad kind keeps line numbers", file: "crlf-bad-kind.yaml", issues: [located("components[1].kind", 8, 11, /invalid kind "datastrore"/)] },
    { name: "empty body", file: "empty.yaml", issues: [located("", 1, 1, /empty/)] },
    { name: "binary garbage (PNG header)", file: "garbage.bin", issues: [located("", 1, 1, /not UTF-8/)] },
    { name: "Latin-1 byte in a key", file: "latin1.yaml", issues: [located("", 4, 13, /not UTF-8/)] },
  ];

  it.each(cases)("$name", ({ file, status, issues }) => {
    const got = expectIssues(pinch(fixture(`pinchpoint/bad/${file}`)), status ?? 422);
    expect(got).toEqual(issues);
  });

  it("a recursive alias is refused, not looped over", () => {
    const got = expectIssues(pinch("pinchpoint: 1\nsource: x\ncomponents: &c\n  - key: a\n    kind: service\n    tags: *c\n"), 422);
    expect(got).toEqual([located("components[0].tags", 6, 11, /refers to a node that contains it/)]);
  });

  it("one wide anchor aliased many times is capped too (the bomb without nesting)", () => {
    const big = Array.from({ length: 5_000 }, (_, i) => `t${i}`).join(", ");
    const uses = Array.from({ length: 60 }, (_, i) => `  - key: c${i}\n    kind: service\n    tags: *tags`).join("\n");
    const text = `pinchpoint: 1\nsource: x\ndefaults:\n  tags: &tags [${big}]\ncomponents:\n${uses}\n`;
    const got = expectIssues(pinch(text), 413);
    expect(got[0]).toMatchObject({ path: expect.stringMatching(/^components\[\d+\]\.tags$/), message: expect.stringMatching(/aliases expand/) });
  });

  // Nesting is checked before parsing, so a few MB of brackets cost one linear pass, not a parse.
  it.each([
    ["YAML flow", `pinchpoint: 1\nsource: x\ncomponents: ${"[".repeat(1_000_000)}${"]".repeat(1_000_000)}\n`, 3, 13 + 64],
    ["JSON", `{"pinchpoint":1,"source":"x","components":${"[".repeat(1_000_000)}${"]".repeat(1_000_000)}}`, 1, 42 + 64],
    ["compact block sequences", `pinchpoint: 1\nsource: x\ncomponents:\n${"- ".repeat(1_000_000)}x\n`, 4, 2 * 64 + 1],
  ])("deep %s nesting is refused with a located 422", (_label, text, line, column) => {
    expect(expectIssues(pinch(text), 422)).toEqual([located("", line, column, /nested more than 64 levels/)]);
  });

  it("brackets inside quoted strings and comments do not count as nesting", () => {
    const text = `pinchpoint: 1\nsource: x\n# ${"[".repeat(100)}\ncomponents:\n  - key: a\n    kind: service\n    name: '${"{".repeat(80)} it''s'\n    tags: ["${"[".repeat(60)}"]\n`;
    expect(expectOk(pinch(text)).components[0]?.name).toBe(`${"{".repeat(80)} it's`);
  });

  it("a body over 20 MiB is refused with 413 before any parsing", () => {
    const body = Buffer.alloc(MAX_BODY_BYTES + 1, 0x20);
    expect(expectIssues(pinch(body), 413)).toEqual([expect.objectContaining({ message: expect.stringMatching(/at most 20971520/) })]);
    // Exactly the limit is allowed through to the parser (here: an empty document of spaces).
    expect(expectIssues(pinch(Buffer.alloc(MAX_BODY_BYTES, 0x20)), 422)[0]?.message).toMatch(/empty/);
  });

  it("source or environment disagreeing with the push is located in the file", () => {
    const text = "pinchpoint: 1\nsource: storefront-repo\nenvironment: production\ncomponents: []\n";
    expect(expectIssues(pinch(text, { environment: "staging", source: "other-repo" }), 422)).toEqual([
      located("source", 2, 9, /the file says source "storefront-repo" but the push names "other-repo"/),
      located("environment", 3, 14, /"production" but the push names "staging"/),
    ]);
  });

  it("a file full of errors reports them all, capped at 1000 plus a count", () => {
    const comps = Array.from({ length: 1_500 }, (_, i) => `  - key: c${i}\n    kind: nope`).join("\n");
    const got = expectIssues(pinch(`pinchpoint: 1\nsource: x\ncomponents:\n${comps}\n`), 422);
    expect(got).toHaveLength(1_001);
    expect(got[1_000]?.message).toBe("500 more issues not shown");
  });
});
