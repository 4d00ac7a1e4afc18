// The imports screen as a new engineer meets it: a broken file first (errors at the right lines,
// with the offending lines shown), then a good one → dry-run preview → push → history.
// Writes only source `e2e-imports-repo` with keys `e2e-imp-*` in `production`, which no other test reads.
import { readFileSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { baseUrl, screenshot, browserForFile, SCREENSHOT_DIR } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

// Line 7 has an unknown field, line 12 a kind that does not exist.
const BROKEN = `pinchpoint: 1
source: e2e-imports-repo
components:
  - key: e2e-imp-web
    kind: service
    needs: [e2e-imp-api]
    colour: blue
  - key: e2e-imp-api
    kind: service
    needs: [e2e-imp-db]
  - key: e2e-imp-db
    kind: databse
`;

const WITH_PLACEHOLDER = `pinchpoint: 1
source: e2e-imports-repo
components:
  - key: e2e-imp-web
    kind: service
    team: storefront
    needs: [e2e-imp-api]
  - key: e2e-imp-api
    kind: service
    needs: [e2e-imp-db, e2e-imp-ledger]
  - key: e2e-imp-db
    kind: datastore
`;

// Every key declared, so the real push adds no placeholder to the shared demo environment.
const GOOD = WITH_PLACEHOLDER.replace("needs: [e2e-imp-db, e2e-imp-ledger]", "needs: [e2e-imp-db]");

async function upload(page: Page, name: string, text: string) {
  await page.getByLabel("Inventory file").setInputFiles({ name, mimeType: "application/yaml", buffer: Buffer.from(text) });
}

const signedIn = (role: string): Promise<Page> => signedInPage(browser(), role, { width: 1366, height: 900 });

describe("imports screen", () => {
  it("shows a broken file's errors at their lines, previews a good one, pushes it, and lists it", async () => {
    const page = await signedIn("engineer");
    await page.goto(`${baseUrl()}/environments/production/imports`);
    await page.getByTestId("dropzone").waitFor();

    await upload(page, "storefront-inventory.yaml", BROKEN);
    await page.getByTestId("import-errors").waitFor({ timeout: 15_000 });
    const locations = await page.getByTestId("issue-location").allTextContents();
    expect(locations).toEqual(["line 7:5", "line 12:11"]);
    const issues = await page.getByTestId("import-issue").allTextContents();
    expect(issues[0]).toContain("colour");
    expect(issues[1]).toContain("databse");
    // The highlighted line in each excerpt is the offending one.
    const hitLines = await page.locator("[data-hit]").evaluateAll((els) => els.map((e) => [e.getAttribute("data-line"), e.textContent?.trim()]));
    expect(hitLines).toEqual([
      ["7", expect.stringContaining("colour: blue")],
      ["12", expect.stringContaining("kind: databse")],
    ]);
    expect(await page.getByTestId("push-button").count()).toBe(0);
    await screenshot(page, "imports-broken-file");

    await upload(page, "storefront-inventory.yaml", WITH_PLACEHOLDER);
    await page.getByTestId("preview-title").waitFor({ timeout: 15_000 });
    const warnings = await page.getByTestId("import-warning").allTextContents();
    expect(warnings.join(" ")).toContain("e2e-imp-ledger");
    await screenshot(page, "imports-preview-with-warning");

    await upload(page, "storefront-inventory.yaml", GOOD);
    await expect.poll(() => page.getByTestId("import-warning").count(), { timeout: 15_000 }).toBe(0);
    await page.getByTestId("preview-title").waitFor();
    const added = await page.getByTestId("diff-added").allTextContents();
    expect(added.map((t) => t.match(/e2e-imp-(?:web|api|db)/)?.[0]).sort()).toEqual(["e2e-imp-api", "e2e-imp-db", "e2e-imp-web"]);
    await screenshot(page, "imports-preview");

    // The push asks again, repeating what it changes.
    await page.getByTestId("push-button").click();
    expect(await page.getByTestId("push-confirmation").textContent()).toMatch(/Changes: \+\d+ \/ −\d+ \/ ~\d+ components; \+\d+ \/ −\d+ needs/);
    await page.getByTestId("push-confirm").click();
    const result = page.getByTestId("push-result");
    await result.waitFor({ timeout: 15_000 });
    const pushed = (await result.textContent()) ?? "";
    const snapshot = pushed.match(/snapshot #(\d+)/)?.[1];
    expect(snapshot).toBeDefined();
    const firstRow = page.getByTestId("history-row").first();
    await expect.poll(async () => (await firstRow.textContent()) ?? "", { timeout: 15_000 }).toContain("e2e-imports-repo");
    expect(await firstRow.textContent()).toContain(`snapshot #${snapshot}`);
    expect(await firstRow.textContent()).toContain("engineer@harbor-pantry.example");
    await screenshot(page, "imports-pushed");
    await page.context().close();
  });

  it("recognises a dropped Kubernetes manifest, proposes the kubernetes format and lists the inferred needs with their reasons", async () => {
    const page = await signedIn("engineer");
    await page.goto(`${baseUrl()}/environments/production/imports`);
    await page.getByTestId("dropzone").waitFor();
    const text = readFileSync(path.resolve(__dirname, "../../examples/kubernetes/recipes.yaml"), "utf8");
    // A real drop: a DataTransfer holding the file, dispatched on the drop zone.
    const transfer = await page.evaluateHandle((t) => {
      const dt = new DataTransfer();
      dt.items.add(new File([t], "recipes.yaml", { type: "application/yaml" }));
      return dt;
    }, text);
    await page.dispatchEvent('[data-testid="dropzone"]', "drop", { dataTransfer: transfer });
    await page.getByTestId("preview-title").waitFor({ timeout: 15_000 });
    expect(await page.getByRole("form", { name: "Upload settings" }).getByLabel("Format").inputValue()).toBe("kubernetes");
    expect(await page.getByTestId("picked-file").locator("xpath=..").textContent()).toMatch(/read as kubernetes manifests/i);
    const rows = await page.getByTestId("inferred-need").allTextContents();
    expect(rows).toHaveLength(3);
    expect(rows.join("\n")).toContain("recipes-api → recipes-db");
    expect(rows.join("\n")).toContain("envFrom ConfigMap recipes/recipes-api-config key RECIPES_DB_URL names Service recipes/recipes-db");
    expect(await page.content()).not.toContain("not-a-real-password");
    await screenshot(page, "imports-kubernetes-preview");
    await page.context().close();
  });

  it("a layered Compose project: its files chosen together, the dry run lists what was inferred with reasons", async () => {
    const dir = new URL("../../examples/compose/harbor-dispatch/", import.meta.url);
    const page = await signedIn("engineer");
    await page.goto(`${baseUrl()}/environments/production/imports`);
    await page.getByTestId("dropzone").waitFor();
    await page.getByLabel("Inventory file").setInputFiles(
      ["compose.yaml", "compose.prod.yaml", ".env", "dispatch-routes.env"].map((name) => ({ name, mimeType: "text/plain", buffer: readFileSync(new URL(name, dir)) })),
    );
    await page.getByTestId("preview-title").waitFor({ timeout: 15_000 });
    expect(await page.getByTestId("picked-file").textContent()).toContain("compose.yaml and 3 more");
    const notes = page.getByTestId("importer-notes");
    await notes.waitFor();
    // One group per kind of inference, each row with its reason.
    expect((await page.getByTestId("inferred-need").allTextContents()).join("\n")).toMatch(/dispatch-api → dispatch-routes.*ROUTES_URL names service dispatch-routes.*compose\.yaml:24/);
    expect(await page.getByTestId("notes-startup-need").textContent()).toMatch(/dispatch-api → dispatch-migrate.*service_completed_successfully/);
    expect(await page.getByTestId("notes-soft-on-telemetry").textContent()).toMatch(/dispatch-api → otel-collector/);
    expect(await page.getByTestId("notes-kind-from-image").textContent()).toMatch(/dispatch-db.*postgres:17 looks like a database/);
    expect(await page.getByTestId("notes-left-out").textContent()).toMatch(/dispatch-db-console.*only in profile tools/);
    await notes.scrollIntoViewIfNeeded();
    await screenshot(page, "imports-compose-preview");
    await notes.screenshot({ path: `${SCREENSHOT_DIR}/imports-compose-notes.png` });
    await page.context().close();
  });

  it("a viewer sees the history and a plain note instead of the upload", async () => {
    const page = await signedIn("viewer");
    await page.goto(`${baseUrl()}/environments/production/imports`);
    await page.getByTestId("upload-not-allowed").waitFor();
    expect(await page.getByTestId("dropzone").count()).toBe(0);
    await expect.poll(() => page.getByTestId("history-row").count(), { timeout: 15_000 }).toBeGreaterThan(0);
    await screenshot(page, "imports-viewer");
    await page.context().close();
  });
});
