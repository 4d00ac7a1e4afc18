// The CI example's gate against the served app: examples/ci/push-inventory.sh --gate dry-runs a
// changed copy of the checkout team's file with impact=true, prints the Markdown comment, writes
// the SARIF file and fails when a blocking change policy fails. With "no tier-1 hard need on a
// single point" at block, a hard need from tier-1 checkout-service onto data-lake (a datastore on
// one replica in one zone, examples/harbor-pantry/data-platform.yaml) fails the gate at that
// need's line; a soft need on the same datastore passes.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICIES } from "@/lib/impact/policies";
import type { SarifLog } from "@/lib/impact/sarif";
import { baseUrl, browserForFile, ownOrigin } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
const root = path.resolve(__dirname, "../..");
const REL = "services/checkout/pinchpoint.yaml";
let page: Page;
let token: string;
let dir: string;

const seedFile = readFileSync(path.join(root, "examples/harbor-pantry/checkout.yaml"), "utf8");

/** The checkout file with one more need under checkout-service, and the line it lands on. */
function withNeed(need: string): { text: string; line: number } {
  const start = seedFile.indexOf("  - key: checkout-service\n");
  const anchor = "      - tax-calculator\n";
  const at = seedFile.indexOf(anchor, start) + anchor.length;
  const text = seedFile.slice(0, at) + need + seedFile.slice(at);
  return { text, line: seedFile.slice(0, at).split("\n").length };
}

const policies = async (body: unknown) => {
  const res = await page.request.put(`${baseUrl()}/api/v1/environments/production/policies`, { data: body, headers: ownOrigin() });
  expect(res.status()).toBe(200);
};

beforeAll(async () => {
  page = await signedInPage(browser(), "admin");
  const res = await page.request.post(`${baseUrl()}/api/v1/tokens`, { data: { name: "e2e-ci-gate", scopes: ["inventory:write"], environment: "production", source: "checkout-repo" }, headers: ownOrigin() });
  expect(res.status()).toBe(201);
  token = ((await res.json()) as { token: string }).token;
  const p = structuredClone(DEFAULT_POLICIES);
  p.rules["tier1-single-point-need"].severity = "block";
  await policies(p);
  dir = mkdtempSync(path.join(tmpdir(), "pp-gate-"));
  mkdirSync(path.join(dir, "services/checkout"), { recursive: true });
});

afterAll(async () => {
  // Other files push to production too: leave it with the defaults.
  await policies(DEFAULT_POLICIES);
});

const gate = (text: string, sarif: string) => {
  writeFileSync(path.join(dir, REL), text);
  return spawnSync("sh", [path.join(root, "examples/ci/push-inventory.sh"), "--gate", "--sarif", sarif, REL], {
    cwd: dir,
    env: { ...process.env, PINCHPOINT_URL: baseUrl(), PINCHPOINT_TOKEN: token, PINCHPOINT_ENV: "production", GITHUB_ACTIONS: "" },
    encoding: "utf8",
    timeout: 60_000,
  });
};

describe("examples/ci/push-inventory.sh --gate", () => {
  it("fails on a tier-1 hard need on a single-instance datastore, naming the need's file:line, with a SARIF result there", () => {
    const { text, line } = withNeed("      - data-lake\n");
    const out = gate(text, "risky.sarif");
    expect({ status: out.status, stderr: out.stderr }).toMatchObject({ status: 4, stderr: expect.stringContaining("gate: FAILED") });
    expect(out.stdout).toContain("### Pinchpoint: impact on `production` — **blocked**");
    expect(out.stdout).toContain(`\`${REL}:${line}:9\` Tier-1 checkout-service has a hard need on data-lake`);
    expect(out.stdout).toContain(`${REL}:${line}:9: error: Tier-1 checkout-service has a hard need on data-lake`);
    const log = JSON.parse(readFileSync(path.join(dir, "risky.sarif"), "utf8")) as SarifLog;
    expect(log.runs[0]!.results.filter((r) => r.ruleId === "tier1-single-point-need")).toEqual([
      expect.objectContaining({ level: "error", locations: [expect.objectContaining({ physicalLocation: { artifactLocation: { uri: REL }, region: { startLine: line, startColumn: 9 } } })] }),
    ]);
  });

  it("passes a harmless change (a soft need on the same datastore) and still writes the SARIF file", () => {
    const { text } = withNeed("      - key: data-lake\n        strength: soft\n");
    const out = gate(text, "harmless.sarif");
    expect({ status: out.status, stderr: out.stderr }).toMatchObject({ status: 0 });
    expect(out.stdout).toMatch(/gate: passed/);
    expect(out.stdout).not.toContain("**blocked**");
    expect(existsSync(path.join(dir, "harmless.sarif"))).toBe(true);
    const log = JSON.parse(readFileSync(path.join(dir, "harmless.sarif"), "utf8")) as SarifLog;
    expect(log.runs[0]!.results.filter((r) => r.level === "error")).toEqual([]);
  });

  it("nothing was stored by either gate: the checkout file pushed as it is still changes nothing", async () => {
    const res = await page.request.post(`${baseUrl()}/api/v1/environments/production/inventory?dry_run=true`, { data: seedFile, headers: { "content-type": "application/yaml", ...ownOrigin() } });
    expect(((await res.json()) as { changed: boolean }).changed).toBe(false);
  });
});
