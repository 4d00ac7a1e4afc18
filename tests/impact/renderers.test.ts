// The impact as SARIF 2.1.0 and as a Markdown pull-request comment.
//
// The SARIF log is validated against the SARIF 2.1.0 JSON Schema as published on the npm registry
// in @microsoft/jest-sarif (lib/schemas/sarif-2.1.0-rtm.5.json, the 2.1.0 schema at its release
// stage 5, a JSON Schema draft-04 document), with ajv (ajv-draft-04, ajv-formats). That schema
// file has one pattern (`language`) that is valid ECMA-262 only without the `u` flag, so ajv
// compiles patterns without it. Section numbers below are of the OASIS SARIF 2.1.0 standard,
// cited from memory.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import Ajv from "ajv-draft-04";
import addFormats from "ajv-formats";
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { DEFAULT_ANALYSIS_SETTINGS } from "@/lib/analysis/input";
import { DEFAULT_PINCH_WEIGHTS } from "@/lib/analysis/types";
import { impactOf, type ImpactReport } from "@/lib/impact";
import { locatorFor } from "@/lib/impact/locate";
import { impactMarkdown } from "@/lib/impact/markdown";
import { DEFAULT_POLICIES, POLICY_RULES } from "@/lib/impact/policies";
import { impactSarif, pathToUri } from "@/lib/impact/sarif";
import { mergeSources } from "@/lib/inventory/merge";
import type { NormalisedInventory } from "@/lib/inventory/types";

const require = createRequire(import.meta.url);
const schemaPath = require.resolve("@microsoft/jest-sarif/lib/schemas/sarif-2.1.0-rtm.5.json");
const schema = JSON.parse(readFileSync(schemaPath, "utf8")) as Record<string, unknown>;
const ajv = new Ajv({ allErrors: true, strict: false, unicodeRegExp: false });
addFormats(ajv);
const validate = ajv.compile(schema);

const parse = (yaml: string): NormalisedInventory => {
  const r = importInventory({ format: "pinchpoint", body: yaml, contentType: "application/yaml", positions: true });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.inventory;
};

const FILE = (extra: string) => `pinchpoint: 1
source: checkout-repo
components:
  - key: checkout-service
    name: "Checkout | cart"
    kind: service
    tier: 1
    replicas: 3
    zones: [harbor-east, harbor-west]
    needs:
      - session-service
${extra}  - key: session-service
    kind: service
    tier: 1
    replicas: 3
    zones: [harbor-east, harbor-west]
  - key: orders-db
    kind: datastore
    replicas: 1
    zones: [harbor-east]
`;

async function report(blocking: boolean): Promise<ImpactReport> {
  const before = parse(FILE(""));
  const after = parse(FILE("      - orders-db\n"));
  const content = (inv: NormalisedInventory) => mergeSources({ existing: { components: [], dependencies: [] }, source: inv.source, incoming: inv }).content;
  const policies = structuredClone(DEFAULT_POLICIES);
  policies.rules["tier1-single-point-need"].severity = blocking ? "block" : "warn";
  return impactOf({
    environment: "production",
    link: "http://127.0.0.1:3000/environments/production/pinch-points",
    before: content(before),
    after: content(after),
    snapshot: 4,
    stored: null,
    settings: DEFAULT_ANALYSIS_SETTINGS,
    weights: DEFAULT_PINCH_WEIGHTS,
    policies,
    reviews: new Map(),
    locator: locatorFor({ inventory: after, content: content(after) }),
  });
}

describe("SARIF 2.1.0", () => {
  it("a blocking finding: valid against the published 2.1.0 schema, level error (§3.27.10), located at the need's line and column (§3.30.5, §3.30.6)", async () => {
    const r = await report(true);
    const log = impactSarif(r, { file: "services/checkout/pinchpoint.yaml", policiesUrl: "http://127.0.0.1:3000/environments/production/policies" });
    expect(validate(log), JSON.stringify(validate.errors)).toBe(true);
    expect(log.version).toBe("2.1.0");
    const results = log.runs[0]!.results.filter((x) => x.ruleId === "tier1-single-point-need");
    expect(results).toHaveLength(1);
    expect(results[0]).toMatchObject({
      level: "error",
      locations: [{ physicalLocation: { artifactLocation: { uri: "services/checkout/pinchpoint.yaml" }, region: { startLine: 12, startColumn: 9 } } }],
    });
    // ruleIndex points into tool.driver.rules at the rule with the same id (§3.27.6, §3.27.7).
    const rules = log.runs[0]!.tool.driver.rules;
    expect(rules.map((x) => x.id)).toEqual([...POLICY_RULES]);
    for (const res of log.runs[0]!.results) expect(rules[res.ruleIndex]!.id).toBe(res.ruleId);
    expect(rules.find((x) => x.id === "tier1-single-point-need")!.defaultConfiguration).toEqual({ enabled: true, level: "error" });
  });

  it("a warning rule's finding is level warning, and a log with no findings is still valid", async () => {
    const r = await report(false);
    const log = impactSarif(r, { file: "pinchpoint.yaml", policiesUrl: "http://x/p" });
    expect(validate(log)).toBe(true);
    expect(log.runs[0]!.results.every((x) => x.level === "warning")).toBe(true);
    const clean = impactSarif({ ...r, policies: r.policies.map((p) => ({ ...p, status: "pass" as const, findings: [], findingsTotal: 0 })) }, { file: "pinchpoint.yaml", policiesUrl: "http://x/p" });
    expect(validate(clean)).toBe(true);
    expect(clean.runs[0]!.results).toEqual([]);
  });

  it("a file given by the push (`at.file`) wins over the caller's name, and paths become URI references (artifactLocation.uri, §3.4.3)", async () => {
    const r = await report(true);
    const moved = { ...r, policies: r.policies.map((p) => ({ ...p, findings: p.findings.map((f) => ({ ...f, at: { ...f.at, file: "deploy/compose override.yaml" } })) })) };
    const log = impactSarif(moved, { file: "pinchpoint.yaml", policiesUrl: "http://x/p" });
    expect(validate(log)).toBe(true);
    expect(log.runs[0]!.results[0]!.locations[0]!.physicalLocation.artifactLocation.uri).toBe("deploy/compose%20override.yaml");
    expect(pathToUri("a\\b c\\d#e.yaml")).toBe("a/b%20c/d%23e.yaml");
  });

  it("the schema itself catches a broken log (the check is not vacuous)", () => {
    expect(validate({ version: "2.1.0", runs: [{ tool: { driver: {} }, results: [] }] })).toBe(false);
    expect(validate({ version: "2.1.0", runs: [{ tool: { driver: { name: "x" } }, results: [{ message: { text: "m" }, level: "fatal" }] }] })).toBe(false);
  });
});

describe("Markdown pull-request comment", () => {
  it("has the headline, the policy table, the located finding, what moved, and a link back to the environment", async () => {
    const r = await report(true);
    const md = impactMarkdown(r, { file: "services/checkout/pinchpoint.yaml" });
    expect(md).toMatch(/^### Pinchpoint: impact on `production` — \*\*blocked\*\*\n/);
    expect(md).toContain(r.headline);
    expect(md).toContain("| No tier-1 hard need on a single point | block | **fails** (1 finding) |");
    expect(md).toContain("`services/checkout/pinchpoint.yaml:12:9` Tier-1 checkout-service has a hard need on orders-db");
    expect(md).toMatch(/\| Component \| Tier \| Pinch score \| Rank \|\n\|---\|---\|---\|---\|\n\| `orders-db` \|/);
    expect(md).toContain("[Open production in Pinchpoint](http://127.0.0.1:3000/environments/production/pinch-points)");
    expect(md).toContain("Compared with snapshot #4");
    // Every table row has as many cells as its header (a `|` in a name must not add one).
    for (const line of md.split("\n").filter((l) => l.startsWith("| "))) {
      const cells = line.replace(/\\\|/g, "").split("|").length;
      expect(cells === 5 || cells === 6, line).toBe(true);
    }
  });
});
