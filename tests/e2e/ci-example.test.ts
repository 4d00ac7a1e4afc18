// The CI example really works: examples/ci/push-inventory.sh, with an API token an admin made,
// dry-runs a team's file against the served app (nothing changes: it is the seed's own file) and
// turns a broken file into file:line:column messages with a failing exit status.
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile, ownOrigin } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

const root = path.resolve(__dirname, "../..");
let page: Page;
let token: string;
let k8sToken: string;

beforeAll(async () => {
  page = await signedInPage(browser(), "admin");
  const res = await page.request.post(`${baseUrl()}/api/v1/tokens`, { data: { name: "e2e-ci-example", scopes: ["inventory:write"], environment: "production", source: "checkout-repo" }, headers: ownOrigin() });
  expect(res.status()).toBe(201);
  token = ((await res.json()) as { token: string }).token;
  const k8s = await page.request.post(`${baseUrl()}/api/v1/tokens`, { data: { name: "e2e-ci-k8s", scopes: ["inventory:write"], environment: "production", source: "recipes-k8s" }, headers: ownOrigin() });
  k8sToken = ((await k8s.json()) as { token: string }).token;
});

const run = (args: string[], withToken = () => token) =>
  spawnSync("sh", [path.join(root, "examples/ci/push-inventory.sh"), ...args], {
    env: { ...process.env, PINCHPOINT_URL: baseUrl(), PINCHPOINT_TOKEN: withToken(), PINCHPOINT_ENV: "production", PINCHPOINT_MODE: "dry-run" },
    encoding: "utf8",
    timeout: 30_000,
  });

describe("examples/ci/push-inventory.sh", () => {
  it("dry-runs the checkout team's file: accepted, nothing would change", () => {
    const out = run(["--dry-run", path.join(root, "examples/harbor-pantry/checkout.yaml")]);
    expect({ status: out.status, stderr: out.stderr }).toMatchObject({ status: 0 });
    expect(out.stdout + out.stderr).toMatch(/changed\W+false/i);
  });

  it("dry-runs the example Compose project, its files in one request, and prints what was inferred", async () => {
    const res = await page.request.post(`${baseUrl()}/api/v1/tokens`, { data: { name: "e2e-ci-compose", scopes: ["inventory:write"], environment: "production" }, headers: ownOrigin() });
    const composeToken = ((await res.json()) as { token: string }).token;
    const dir = path.join(root, "examples/compose/harbor-dispatch");
    const out = spawnSync(
      "sh",
      [path.join(root, "examples/ci/push-inventory.sh"), "--dry-run", "--format", "compose", ...["compose.yaml", "compose.prod.yaml", ".env", "dispatch-routes.env"].map((f) => path.join(dir, f))],
      { env: { ...process.env, PINCHPOINT_URL: baseUrl(), PINCHPOINT_TOKEN: composeToken, PINCHPOINT_ENV: "production" }, encoding: "utf8", timeout: 30_000 },
    );
    if (out.status !== 0) throw new Error(`exit ${out.status}:\n${out.stdout}\n${out.stderr}`);
    expect(out.stdout).toMatch(/dry-run 4 files/);
    expect(out.stdout).toMatch(/compose\.yaml:24: dispatch-api -> dispatch-routes \(hard, via ROUTES_URL\): ROUTES_URL names service dispatch-routes/);
    expect(out.stdout).toMatch(/startup-need: dispatch-api → dispatch-migrate/);
    expect(out.stdout).toMatch(/compose\.yaml:58:3: warning: 1 service is only in profiles/);
  });

  it("reports a broken file as file:line:column messages and fails", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "pp-ci-"));
    const file = path.join(dir, "broken.yaml");
    writeFileSync(file, "pinchpoint: 1\nsource: checkout-repo\ncomponents:\n  - key: cart-service\n    kind: spaceship\n");
    const out = run(["--dry-run", file]);
    expect(out.status).toBe(1);
    expect(out.stdout + out.stderr).toContain(`${file}:5:11`);
  });

  it("dry-runs the Kubernetes example with the kubernetes format and lists the inferred needs with their reasons", () => {
    const file = path.join(root, "examples/kubernetes/recipes.yaml");
    const out = run(["--dry-run", "--format", "kubernetes", "--source", "recipes-k8s", "--param", "teams=recipes:catalog", file], () => k8sToken);
    expect({ status: out.status, stderr: out.stderr }).toMatchObject({ status: 0 });
    expect(out.stdout).toContain("inferred needs: 3");
    expect(out.stdout).toContain(`${file}:20: recipes-api -> recipes-db (hard, via RECIPES_DB_URL): envFrom ConfigMap recipes/recipes-api-config key RECIPES_DB_URL names Service recipes/recipes-db`);
    expect(out.stdout).not.toContain("not-a-real-password");
  });
});
