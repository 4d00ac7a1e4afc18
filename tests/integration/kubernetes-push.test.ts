// The kubernetes format through the push route against PostgreSQL: per-push settings as query
// parameters, the dry-run preview's inferred needs and their reasons, an identical push making no
// snapshot, and Secrets' values never reaching a table or a log line.
import { QueryTypes } from "sequelize";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { openApiDocument } from "@/lib/api/openapi";
import { db } from "@/models";
import { generateKubernetesDump } from "../fixtures/generate";
import { call, createUser, type TestUser } from "../support/api";

let admin: TestUser;
const pushManifest = (body: string, query: string, env = "cluster") =>
  call(push, { url: `/api/v1/environments/${env}/inventory?format=kubernetes&source=cluster-dump${query}`, method: "POST", params: { env }, as: admin, body, headers: { "content-type": "application/yaml" } });

const APP = `apiVersion: v1
kind: ConfigMap
metadata: {name: web-config, namespace: shop}
data:
  ORDERS_ADDR: orders.shop.svc.cluster.local:8080
---
apiVersion: apps/v1
kind: Deployment
metadata: {name: web, namespace: shop}
spec:
  selector: {matchLabels: {app: web}}
  template:
    metadata: {labels: {app: web}}
    spec:
      initContainers:
        - name: wait-db
          image: busybox
          command: ["sh", "-c", "until nc -z orders-db 5432; do sleep 1; done"]
      containers:
        - name: main
          image: example.invalid/web
          envFrom: [{configMapRef: {name: web-config}}]
          env:
            - name: PASSWORD
              valueFrom: {secretKeyRef: {name: db-creds, key: password}}
---
apiVersion: apps/v1
kind: Deployment
metadata: {name: orders, namespace: shop}
spec:
  replicas: 2
  selector: {matchLabels: {app: orders}}
  template:
    metadata: {labels: {app: orders}}
    spec:
      containers: [{name: main, image: example.invalid/orders}]
---
apiVersion: v1
kind: Service
metadata: {name: orders, namespace: shop}
spec:
  selector: {app: orders}
  ports: [{port: 8080}]
---
apiVersion: apps/v1
kind: StatefulSet
metadata: {name: orders-db, namespace: shop}
spec:
  selector: {matchLabels: {app: orders-db}}
  template:
    metadata: {labels: {app: orders-db}}
    spec:
      containers: [{name: main, image: example.invalid/pg}]
---
apiVersion: v1
kind: Service
metadata: {name: orders-db, namespace: shop}
spec:
  selector: {app: orders-db}
  ports: [{port: 5432}]
`;

const MARKER = "MARKER-k8s-7c1e44-never-stored";
const SECRET = `apiVersion: v1
kind: Secret
metadata:
  name: db-creds
  namespace: shop
  annotations:
    kubectl.kubernetes.io/last-applied-configuration: '{"apiVersion":"v1","kind":"Secret","stringData":{"password":"${MARKER}"}}'
type: Opaque
stringData:
  password: ${MARKER}
data:
  token: ${Buffer.from(MARKER).toString("base64")}
`;

beforeAll(async () => {
  admin = await createUser("admin");
});

afterEach(() => {
  vi.restoreAllMocks();
});

describe("kubernetes pushes", () => {
  it("a dry run lists the inferred needs with their reasons and positions, and stores nothing", async () => {
    const res = await pushManifest(APP, "&dry_run=true&teams=shop:storefront");
    expect(res.status).toBe(200);
    const body = res.json as { changed: boolean; snapshot: unknown; inferred: { total: number; needs: unknown[] }; diff: { componentsAdded: { key: string; team: string | null }[] } };
    expect(body.snapshot).toBeNull();
    expect(body.diff.componentsAdded.map((c) => [c.key, c.team])).toEqual([["orders", "storefront"], ["orders-db", "storefront"], ["web", "storefront"]]);
    expect(body.inferred).toEqual({
      total: 2,
      needs: [
        {
          from: "web",
          to: ["orders-db"],
          strength: "startup",
          via: "command",
          reason: "init container wait-db: command[2] names Service shop/orders-db (an init container: needed to start only)",
          at: { line: 18, column: 20 },
        },
        { from: "web", to: ["orders"], strength: "hard", via: "ORDERS_ADDR", reason: "envFrom ConfigMap shop/web-config key ORDERS_ADDR names Service shop/orders", at: { line: 5, column: 3 } },
      ],
    });
    const [row] = await db().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM environments WHERE slug = 'cluster'", { type: QueryTypes.SELECT });
    expect(row?.n).toBe("0");
  });

  it("stores the inferred needs with their provenance and origin; an identical push makes no snapshot", async () => {
    const first = await pushManifest(APP, "");
    expect(first.status).toBe(200);
    expect((first.json as { changed: boolean }).changed).toBe(true);
    const rows = await db().sequelize.query<{ from_key: string; to_key: string; strength: string; via: string | null; provenance: string[]; origin: unknown }>(
      `SELECT d.from_key, d.to_key, d.strength, d.via, d.provenance, d.origin FROM dependencies d JOIN environments e ON e.id = d.environment_id
        WHERE e.slug = 'cluster' ORDER BY d.from_key, d.to_key`,
      { type: QueryTypes.SELECT },
    );
    expect(rows).toEqual([
      { from_key: "web", to_key: "orders", strength: "hard", via: "ORDERS_ADDR", provenance: ["inferred"], origin: { line: 5, column: 3 } },
      { from_key: "web", to_key: "orders-db", strength: "startup", via: "command", provenance: ["inferred"], origin: { line: 18, column: 20 } },
    ]);
    const again = await pushManifest(APP, "");
    expect(again.json).toMatchObject({ changed: false, snapshot: null });
  });

  it("a generated dump of 200 workloads and 300 Services pushed twice makes one snapshot", async () => {
    const dump = generateKubernetesDump(200, 300);
    const first = await pushManifest(dump, "", "dump");
    expect(first.status).toBe(200);
    expect(first.json).toMatchObject({ changed: true, snapshot: { number: 1 } });
    const second = await pushManifest(dump, "", "dump");
    expect(second.json).toMatchObject({ changed: false, snapshot: null });
    const [row] = await db().sequelize.query<{ c: string; d: string }>(
      "SELECT (SELECT count(*) FROM components c JOIN environments e ON e.id = c.environment_id WHERE e.slug = 'dump') AS c, (SELECT count(*) FROM dependencies d JOIN environments e ON e.id = d.environment_id WHERE e.slug = 'dump') AS d",
      { type: QueryTypes.SELECT },
    );
    // Two inferred needs per workload (an env URL and an argument), each on another workload.
    expect([row?.c, row?.d]).toEqual(["200", "400"]);
  });

  it("the OpenAPI document lists the format's query parameters and describes a manifest body", () => {
    const doc = openApiDocument("http://127.0.0.1:3000") as unknown as {
      paths: Record<string, { post: { parameters: { name: string }[]; requestBody: { content: Record<string, { schema: { oneOf: { title?: string }[] } }> } } }>;
    };
    const op = doc.paths["/environments/{env}/inventory"]?.post;
    expect(op?.parameters.map((p) => p.name)).toEqual(expect.arrayContaining(["format", "cluster_domain", "team_key", "teams", "namespace_teams", "aliases"]));
    expect(op?.requestBody.content["application/yaml"]?.schema.oneOf.map((s) => s.title)).toContain("Kubernetes manifests (format=kubernetes)");
  });

  it("kubernetes settings are refused with another format, and a bad one is a located 422 that changes nothing", async () => {
    const wrong = await call(push, { url: "/api/v1/environments/cluster/inventory?format=csv&source=x&teams=shop:a", method: "POST", params: { env: "cluster" }, as: admin, body: "from,to\na,b\n", headers: { "content-type": "text/csv" } });
    expect(wrong.status).toBe(422);
    expect(JSON.stringify(wrong.json)).toMatch(/teams is read only with format=kubernetes/);
    const bad = await pushManifest(APP, "&cluster_domain=not_a_domain");
    expect(bad.status).toBe(422);
    expect((bad.json as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(["cluster_domain"]);
  });

  it("a Secret's values reach no table and no log line, whatever the push's outcome", async () => {
    const logged: string[] = [];
    const capture = (...args: unknown[]) => {
      logged.push(args.map((a) => (typeof a === "string" ? a : JSON.stringify(a))).join(" "));
    };
    for (const method of ["log", "info", "warn", "error", "debug"] as const) vi.spyOn(console, method).mockImplementation(capture);
    const write = (chunk: unknown) => {
      logged.push(String(chunk));
      return true;
    };
    vi.spyOn(process.stdout, "write").mockImplementation(write as typeof process.stdout.write);
    vi.spyOn(process.stderr, "write").mockImplementation(write as typeof process.stderr.write);

    const body = `${SECRET}---\n${APP}`;
    expect((await pushManifest(body, "&dry_run=true", "secrets")).status).toBe(200);
    expect((await pushManifest(body, "", "secrets")).status).toBe(200);
    // A broken copy (the Secret's key twice) is refused; its issues must not quote the value either.
    const broken = await pushManifest(body.replace(`password: ${MARKER}`, `password: ${MARKER}\n  password: ${MARKER}`), "", "secrets");
    expect(broken.status).toBe(422);
    expect(JSON.stringify(broken.json)).not.toContain(MARKER);
    vi.restoreAllMocks();

    const forms = [MARKER, Buffer.from(MARKER).toString("base64")];
    const tables = await db().sequelize.query<{ name: string }>(
      "SELECT table_name::text AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY table_name",
      { type: QueryTypes.SELECT },
    );
    expect(tables.map((t) => t.name)).toEqual(expect.arrayContaining(["snapshots", "components", "dependencies", "import_records", "audit_events"]));
    const found: string[] = [];
    for (const { name } of tables) {
      for (const form of forms) {
        // A row cast to text holds every column, JSON and arrays included.
        const [hit] = await db().sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM "${name}" t WHERE t::text LIKE :pattern`, {
          type: QueryTypes.SELECT,
          replacements: { pattern: `%${form}%` },
        });
        if (hit?.n !== "0") found.push(`${name} holds ${form}`);
      }
    }
    expect(found).toEqual([]);
    // The push did write something: the check above looked at real rows.
    const [row] = await db().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM components c JOIN environments e ON e.id = c.environment_id WHERE e.slug = 'secrets'", { type: QueryTypes.SELECT });
    expect(row?.n).toBe("3");
    for (const form of forms) expect(logged.filter((l) => l.includes(form))).toEqual([]);
  });
});
