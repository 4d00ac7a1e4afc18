// The imports screen's impact panel: before "Push", what the file does to the failure points and
// how it fares against the change policies. In an environment of its own (e2e-impact, created
// here) with "no tier-1 hard need on a single point" at block: an engineer sees the finding at its
// line and cannot push; an architect pushes it with a reason; the policies screen shows the rules.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { DEFAULT_POLICIES } from "@/lib/impact/policies";
import { baseUrl, browserForFile, ownOrigin, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
const ENV = "e2e-impact";

// e2e-imx-web (tier 1) needs e2e-imx-db, which runs one replica in one zone: line 10, column 9.
const RISKY = `pinchpoint: 1
source: e2e-impact-repo
components:
  - key: e2e-imx-web
    kind: service
    tier: 1
    replicas: 2
    zones: [harbor-east, harbor-west]
    needs:
      - e2e-imx-db
      - key: e2e-imx-search
        strength: soft
  - key: e2e-imx-db
    kind: datastore
    tier: 2
    replicas: 1
    zones: [harbor-east]
  - key: e2e-imx-search
    kind: service
    replicas: 2
    zones: [harbor-east, harbor-west]
`;

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

async function upload(page: Page, text: string) {
  await page.goto(`${baseUrl()}/environments/${ENV}/imports`);
  await page.getByTestId("dropzone").waitFor();
  await page.getByLabel("Inventory file").setInputFiles({ name: "pinchpoint.yaml", mimeType: "application/yaml", buffer: Buffer.from(text) });
  await page.getByTestId("impact-panel").waitFor({ timeout: 30_000 });
}

beforeAll(async () => {
  const admin = await signedIn("admin");
  expect((await admin.request.post(`${baseUrl()}/api/v1/environments`, { data: { slug: ENV, name: "Impact checks" }, headers: ownOrigin() })).status()).toBe(201);
  const p = structuredClone(DEFAULT_POLICIES);
  p.rules["tier1-single-point-need"].severity = "block";
  expect((await admin.request.put(`${baseUrl()}/api/v1/environments/${ENV}/policies`, { data: p, headers: ownOrigin() })).status()).toBe(200);
  await admin.context().close();
});

describe("imports screen: impact before push", () => {
  it("an engineer sees the blocking finding at its line and no way to push", async () => {
    const page = await signedIn("engineer");
    await upload(page, RISKY);
    expect(await page.getByTestId("impact-headline").textContent()).toMatch(/^Blocked by 1 policy/);
    const rule = page.getByTestId("impact-policy-tier1-single-point-need");
    expect(await rule.textContent()).toContain("blocks");
    expect(await rule.textContent()).toContain("pinchpoint.yaml:10:9");
    expect(await rule.textContent()).toContain("Tier-1 e2e-imx-web has a hard need on e2e-imx-db");
    await page.getByTestId("push-blocked").waitFor();
    expect(await page.getByTestId("push-button").count()).toBe(0);
    expect(await page.getByTestId("push-override").count()).toBe(0);
    await screenshot(page, "imports-impact-blocked-engineer");
    await page.context().close();
  });

  it("an architect pushes it with a recorded reason", async () => {
    const page = await signedIn("architect");
    await upload(page, RISKY);
    await page.getByTestId("push-override").waitFor();
    // Without a reason the form says so beside the field and pushes nothing.
    await page.getByTestId("push-override-button").click();
    await expect.poll(async () => (await page.getByTestId("error-override_reason").textContent()) ?? "").not.toBe("");
    expect(await page.getByTestId("push-result").count()).toBe(0);
    await page.getByLabel(/Why push it anyway/).fill("The datastore gets a second zone next sprint; accepted for the pilot");
    await screenshot(page, "imports-impact-override-architect");
    await page.getByTestId("push-override-button").click();
    await page.getByTestId("push-result").waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("push-result").textContent()).toMatch(/snapshot #1/);
    const audit = await page.request.get(`${baseUrl()}/api/v1/audit?action=inventory.policy_override`);
    expect(audit.status()).toBe(200);
    expect(JSON.stringify(await audit.json())).toContain("accepted for the pilot");
    await page.context().close();
  });

  it("the same file again changes nothing, so nothing blocks and the plain push button is back", async () => {
    const page = await signedIn("engineer");
    await upload(page, RISKY);
    expect(await page.getByTestId("impact-headline").textContent()).toMatch(/^No change/);
    await page.getByTestId("push-button").waitFor();
    await page.context().close();
  });

  it("the policies screen shows each rule with its severity; a viewer cannot edit", async () => {
    const page = await signedIn("viewer");
    await page.goto(`${baseUrl()}/environments/${ENV}/policies`);
    await page.getByTestId("policy-tier1-single-point-need").waitFor();
    expect(await page.getByTestId("policy-tier1-single-point-need").textContent()).toContain("blocks");
    expect(await page.getByTestId("policies-summary").textContent()).toContain("1 rule blocks");
    expect(await page.getByTestId("policies-save").count()).toBe(0);
    await screenshot(page, "policies-viewer");
    await page.context().close();
  });
});
