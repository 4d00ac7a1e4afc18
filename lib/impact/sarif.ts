// The impact's policy findings as a SARIF 2.1.0 log (OASIS Static Analysis Results Interchange
// Format): one run, the policy catalogue as the tool's rules, one result per finding of a rule
// that fails, located at the file, line and column of the need or component that caused it, so a
// code-review system that reads SARIF annotates that line. A `block` rule's findings are errors,
// a `warn` rule's warnings.
import { POLICY_RULES, RULE_INFO, type PolicyRuleId } from "./policies";
import type { ImpactReport } from "./report";

/** Where the OASIS standard publishes the schema this log follows. */
const SARIF_SCHEMA_URI = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json";

interface SarifRegion {
  startLine: number;
  startColumn?: number;
}

interface SarifResult {
  ruleId: PolicyRuleId;
  ruleIndex: number;
  level: "error" | "warning";
  message: { text: string };
  locations: Array<{
    physicalLocation: { artifactLocation: { uri: string }; region?: SarifRegion };
    logicalLocations?: Array<{ name: string; kind: string }>;
  }>;
  partialFingerprints: Record<string, string>;
}

export interface SarifLog {
  $schema: string;
  version: "2.1.0";
  runs: Array<{
    tool: {
      driver: {
        name: string;
        informationUri: string;
        rules: Array<{
          id: PolicyRuleId;
          name: string;
          shortDescription: { text: string };
          fullDescription: { text: string };
          helpUri: string;
          defaultConfiguration: { enabled: boolean; level: "error" | "warning" };
        }>;
      };
    };
    columnKind: "utf16CodeUnits";
    results: SarifResult[];
    properties: Record<string, unknown>;
  }>;
}

/** A relative path as a URI reference: each segment percent-encoded, separators kept. */
export function pathToUri(path: string): string {
  return path
    .replace(/\\/g, "/")
    .split("/")
    .map((segment) => encodeURIComponent(segment))
    .join("/");
}

const pascal = (id: string): string => id.replace(/(^|-)([a-z0-9])/g, (_, __: string, c: string) => c.toUpperCase());

export function impactSarif(report: ImpactReport, { file, policiesUrl }: { file: string; policiesUrl: string }): SarifLog {
  const index = new Map(POLICY_RULES.map((r, i) => [r, i]));
  const byRule = new Map(report.policies.map((p) => [p.rule, p]));
  const results: SarifResult[] = [];
  for (const p of report.policies) {
    if (p.status !== "fail") continue;
    for (const f of p.findings) {
      const region: SarifRegion | undefined = f.at?.line ? { startLine: f.at.line, ...(f.at.column ? { startColumn: f.at.column } : {}) } : undefined;
      results.push({
        ruleId: p.rule,
        ruleIndex: index.get(p.rule)!,
        level: p.severity === "block" ? "error" : "warning",
        message: { text: f.message },
        locations: [
          {
            physicalLocation: { artifactLocation: { uri: pathToUri(f.at?.file ?? file) }, ...(region ? { region } : {}) },
            ...(f.key ? { logicalLocations: [{ name: f.key, kind: "component" }] } : {}),
          },
        ],
        // Stable across runs, so a code-review system matches a finding to the one it saw before.
        partialFingerprints: { "pinchpointFinding/v1": [p.rule, f.key ?? "", f.need ? `${f.need.from}>${f.need.to}` : ""].join("|") },
      });
    }
  }
  return {
    $schema: SARIF_SCHEMA_URI,
    version: "2.1.0",
    runs: [
      {
        tool: {
          driver: {
            name: "Pinchpoint",
            informationUri: report.link,
            rules: POLICY_RULES.map((rule) => {
              const p = byRule.get(rule);
              const info = RULE_INFO[rule];
              return {
                id: rule,
                name: pascal(rule),
                shortDescription: { text: p?.title ?? info.title },
                fullDescription: { text: `${p ? descriptionFrom(rule, p.parameter) : info.description} ${info.why}` },
                helpUri: policiesUrl,
                defaultConfiguration: { enabled: p?.enabled ?? true, level: p?.severity === "block" ? "error" : "warning" },
              };
            }),
          },
        },
        columnKind: "utf16CodeUnits",
        results,
        properties: {
          environment: report.environment,
          comparedWithSnapshot: report.basis.snapshot,
          blocked: report.blocked,
          headline: report.headline,
        },
      },
    ],
  };
}

function descriptionFrom(rule: PolicyRuleId, parameter: number | null): string {
  return parameter === null ? RULE_INFO[rule].description : RULE_INFO[rule].description.replace("{n}", String(parameter));
}
