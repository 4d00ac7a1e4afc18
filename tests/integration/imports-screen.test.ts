// What the imports screen relies on: format detection on real fixture files, and the push API
// answering a browser session (dry run writes nothing; viewers refused; history lists the push).
import { readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as pushRoute } from "@/app/api/v1/environments/[env]/inventory/route";
import { GET as importsRoute } from "@/app/api/v1/environments/[env]/imports/route";
import { contentTypeFor, detectFormat, sourceNamedIn, suggestSource } from "@/components/imports/detect";
import { ROLES, type Role } from "@/lib/auth/roles";
import { pushInventory } from "@/lib/data/push";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

const fixtures = path.resolve(__dirname, "../fixtures");
const read = (p: string) => readFileSync(path.join(fixtures, p), "utf8");
const users = {} as Record<Role, TestUser>;

const GOOD = `pinchpoint: 1
source: imports-repo
components:
  - key: imp-web
    kind: service
    needs: [imp-api]
  - key: imp-api
    kind: service
    needs: [imp-db]
`;

async function counts() {
  const { Snapshot, ImportRecord, Component } = db().models;
  return { snapshots: await Snapshot.count(), imports: await ImportRecord.count(), components: await Component.count() };
}

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  await pushInventory({ environment: "staging", format: "pinchpoint", body: "pinchpoint: 1\nsource: base\ncomponents:\n  - key: base\n    kind: service\n", dryRun: false, actor: { type: "system", label: "test", canCreateEnvironments: true } });
});

describe("format detection", () => {
  it("recognises each fixture format from name and content", () => {
    expect(detectFormat("storefront.yaml", read("pinchpoint/storefront.yaml")).format).toBe("pinchpoint");
    expect(detectFormat("storefront.json", read("pinchpoint/storefront.json")).format).toBe("pinchpoint");
    expect(detectFormat("list-form.yaml", read("compose/list-form.yaml")).format).toBe("compose");
    expect(detectFormat("map-form.yaml", read("compose/map-form.yaml")).format).toBe("compose");
    expect(detectFormat("edges.csv", read("csv/edges.csv")).format).toBe("csv");
    expect(detectFormat("crlf.csv", read("csv/crlf.csv")).format).toBe("csv");
    expect(detectFormat("checkout-trace.json", read("otlp/checkout-trace.json")).format).toBe("otlp");
    expect(detectFormat("docker-compose.yml", "services:\n  web:\n    image: x\n").format).toBe("compose");
    expect(detectFormat("edges.txt", "from,to,strength\na,b,hard\n").format).toBe("csv");
    expect(detectFormat("traces.json", '{"resourceSpans": []}').format).toBe("otlp");
    expect(detectFormat("inventory.json", '{"pinchpoint": 1, "services": []}').format).toBe("pinchpoint");
  });

  it("proposes kubernetes for a dropped manifest: multi-document YAML, a List dump, JSON", () => {
    const manifest = "# rendered by a chart\n---\napiVersion: apps/v1\nkind: Deployment\nmetadata:\n  name: web\n---\napiVersion: v1\nkind: Service\nmetadata:\n  name: web\n";
    expect(detectFormat("web.yaml", manifest)).toEqual({ format: "kubernetes", why: "apiVersion and kind at the top level of a document" });
    expect(detectFormat("dump.yaml", "apiVersion: v1\nitems:\n- apiVersion: v1\n  kind: Service\nkind: List\n").format).toBe("kubernetes");
    expect(detectFormat("dump.json", '{\n  "apiVersion": "v1",\n  "items": [],\n  "kind": "List"\n}').format).toBe("kubernetes");
    expect(contentTypeFor("kubernetes", '{"apiVersion": "v1"}')).toBe("application/json");
    // A Compose file's services: and a format 1 file are still read as before.
    expect(detectFormat("compose.yaml", "services:\n  web:\n    image: x\n").format).toBe("compose");
  });

  it("picks the content type the importers read and a source name shaped to the pattern", () => {
    expect(contentTypeFor("pinchpoint", "pinchpoint: 1")).toBe("application/yaml");
    expect(contentTypeFor("pinchpoint", ' {"pinchpoint":1}')).toBe("application/json");
    expect(contentTypeFor("csv", "from,to")).toBe("text/csv");
    expect(suggestSource("My Stack (prod).Compose.yaml")).toMatch(/^[a-z0-9][a-z0-9._-]{0,127}$/);
    // A Compose file that names its own source keeps it.
    expect(sourceNamedIn("name: x\nx-pinchpoint:\n  team: t\n  source: dispatch-compose\nservices: {}\n")).toBe("dispatch-compose");
    expect(sourceNamedIn("x-pinchpoint: { source: 'a-repo', team: t }\nservices: {}\n")).toBe("a-repo");
    expect(sourceNamedIn("services:\n  a:\n    x-pinchpoint: { source: not-top-level }\n")).toBeNull();
    expect(detectFormat("edges.txt", "caller;provider;strength\na;b;hard\n").format).toBe("csv");
  });
});

describe("the push API as the screen calls it", () => {
  const push = (as: TestUser | null, body: string, query = "dry_run=true") =>
    call(pushRoute, { url: `/api/v1/environments/staging/inventory?${query}`, method: "POST", params: { env: "staging" }, as, body, headers: { "content-type": "application/yaml" } });

  it("refuses anonymous (401) and viewers (403) and writes nothing", async () => {
    const before = await counts();
    expect((await push(null, GOOD)).status).toBe(401);
    expect((await push(users.viewer, GOOD)).status).toBe(403);
    expect(await counts()).toEqual(before);
  });

  it("a dry run by an engineer previews the diff and a placeholder warning, and writes nothing", async () => {
    const before = await counts();
    const res = await push(users.engineer, GOOD);
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ changed: true, dryRun: true, snapshot: null, diff: { counts: { componentsAdded: 3, dependenciesAdded: 2 } } });
    expect((res.json as { warnings: { message: string }[] }).warnings.length).toBeGreaterThan(0);
    expect(await counts()).toEqual(before);
  });

  it("a broken file gives located issues (line and column) for each problem", async () => {
    const broken = GOOD.replace("    needs: [imp-api]\n", "    needs: [imp-api]\n    colour: blue\n").replace("key: imp-api\n    kind: service", "key: imp-api\n    kind: servise");
    const res = await push(users.engineer, broken);
    expect(res.status).toBe(422);
    const issues = (res.json as { issues: { line?: number; path: string }[] }).issues;
    expect(issues).toEqual(expect.arrayContaining([expect.objectContaining({ line: 7, path: "components[0].colour" }), expect.objectContaining({ line: 9, path: "components[1].kind" })]));
  });

  it("the real push shows in the history with who, source, format and snapshot", async () => {
    const res = await push(users.engineer, GOOD, "");
    expect(res.status).toBe(200);
    const number = (res.json as { snapshot: { number: number } }).snapshot.number;
    const history = await call(importsRoute, { url: "/api/v1/environments/staging/imports?limit=1&offset=0", params: { env: "staging" }, as: users.viewer });
    expect(history.json).toMatchObject({ total: 2, items: [{ source: "imports-repo", format: "pinchpoint", actor: users.engineer.email, changed: true, snapshot: number }] });
  });
});
