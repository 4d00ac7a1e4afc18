// A layered Compose project pushed as one multipart request (three files and an .env) against
// PostgreSQL: the result must equal the same project written out by hand as one file, merged by the
// Compose Specification's rules (13-merge.md, 12-interpolation.md), so that pushing that file next
// changes nothing.
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as push } from "@/app/api/v1/environments/[env]/inventory/route";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

let admin: TestUser;

const BASE = `name: harbor-dispatch
services:
  checkout:
    image: harbor-pantry/checkout:4.2
    depends_on:
      payments: { condition: service_healthy }
      schema-migrate: { condition: service_completed_successfully }
      collector: { condition: service_started }
  payments:
    image: harbor-pantry/payments:7.0
    environment:
      - PAYMENTS_DB=postgres://\${DB_USER}@payments-db:5432/payments
  payments-db:
    image: postgres:\${PG_VERSION:-17}
  schema-migrate:
    image: harbor-pantry/checkout-migrations:4.2
    command: ["migrate", "--db", "payments-db:5432"]
  collector:
    image: otel/opentelemetry-collector-contrib:0.120.0
  debug-shell:
    image: busybox
    profiles: [debug]
    depends_on: [checkout]
`;
const OVERRIDE = `services:
  checkout:
    environment:
      ORDERS_URL: http://orders:\${ORDERS_PORT}/v1
  orders:
    image: harbor-pantry/orders:2.0
    depends_on: [payments-db]
`;
const PROD = `x-pinchpoint:
  team: checkout
services:
  checkout:
    deploy: { replicas: 3 }
    x-pinchpoint: { tier: 1, zones: [harbor-east, harbor-west] }
  payments:
    scale: 2
`;
const DOTENV = `# harbor dispatch\nDB_USER=dispatch\nORDERS_PORT=8080\n`;

// The same project merged by hand: environment of checkout from the override, replicas and the
// extension from the prod file, every variable replaced by its .env value or default.
const PREMERGED = `x-pinchpoint:
  team: checkout
services:
  checkout:
    image: harbor-pantry/checkout:4.2
    depends_on:
      payments: { condition: service_healthy }
      schema-migrate: { condition: service_completed_successfully }
      collector: { condition: service_started }
    environment:
      ORDERS_URL: http://orders:8080/v1
    deploy: { replicas: 3 }
    x-pinchpoint: { tier: 1, zones: [harbor-east, harbor-west] }
  payments:
    image: harbor-pantry/payments:7.0
    environment: [PAYMENTS_DB=postgres://dispatch@payments-db:5432/payments]
    scale: 2
  payments-db:
    image: postgres:17
  schema-migrate:
    image: harbor-pantry/checkout-migrations:4.2
    command: ["migrate", "--db", "payments-db:5432"]
  collector:
    image: otel/opentelemetry-collector-contrib:0.120.0
  debug-shell:
    image: busybox
    profiles: [debug]
    depends_on: [checkout]
  orders:
    image: harbor-pantry/orders:2.0
    depends_on: [payments-db]
`;

async function multipart(files: [string, string][]): Promise<{ body: Buffer; contentType: string }> {
  const form = new FormData();
  for (const [name, text] of files) form.append("file", new Blob([text]), name);
  const req = new Request("http://127.0.0.1/", { method: "POST", body: form });
  return { body: Buffer.from(await req.arrayBuffer()), contentType: req.headers.get("content-type") ?? "" };
}

const url = (query: string) => `/api/v1/environments/dispatch/inventory?format=compose&source=dispatch-compose${query}`;

beforeAll(async () => {
  admin = await createUser("admin");
});

describe("a layered Compose project in one push", () => {
  it("three files and an .env equal the same project pre-merged into one file", async () => {
    const { body, contentType } = await multipart([
      ["compose.yaml", BASE],
      ["compose.override.yaml", OVERRIDE],
      ["compose.prod.yaml", PROD],
      [".env", DOTENV],
    ]);
    const dry = await call(push, { url: url("&dry_run=1"), method: "POST", params: { env: "dispatch" }, as: admin, body, headers: { "content-type": contentType } });
    expect(dry.status).toBe(200);
    const preview = dry.json as { dryRun: boolean; notes: { kind: string; component: string; target?: string }[]; warnings: { message: string }[] };
    expect(preview.dryRun).toBe(true);
    expect(preview.notes.map((n) => [n.kind, n.component, n.target ?? null])).toEqual(
      expect.arrayContaining([
        ["startup-need", "checkout", "schema-migrate"],
        ["kind-from-image", "payments-db", null],
        ["kind-from-image", "collector", null],
        ["kind-from-completion", "schema-migrate", null],
        ["soft-on-telemetry", "checkout", "collector"],
        ["left-out", "debug-shell", null],
      ]),
    );
    expect(preview.warnings.filter((w) => /profiles/.test(w.message))).toHaveLength(1);
    // Inferred needs come with their reasons in the dry run (lib/inventory/inferred.ts).
    const inferred = (dry.json as { inferred: { needs: { from: string; to: string[]; reason: string; at: { file?: string } }[] } }).inferred.needs;
    expect(inferred.map((n) => [n.from, n.to.join(), n.reason, n.at.file])).toEqual(
      expect.arrayContaining([
        ["payments", "payments-db", "PAYMENTS_DB names service payments-db", "compose.yaml"],
        ["checkout", "orders", "ORDERS_URL names service orders", "compose.override.yaml"],
        ["schema-migrate", "payments-db", "command names service payments-db", "compose.yaml"],
      ]),
    );

    // dry_run=0 is a real push, as dry_run=false is.
    const first = await call(push, { url: url("&dry_run=0"), method: "POST", params: { env: "dispatch" }, as: admin, body, headers: { "content-type": contentType } });
    expect(first.status).toBe(200);
    expect(first.json).toMatchObject({ changed: true, snapshot: { number: 1 } });

    const rows = await db().sequelize.query<{ from_key: string; to_key: string; strength: string; via: string | null; provenance: string[]; origin: unknown }>(
      `SELECT d.from_key, d.to_key, d.strength, d.via, d.provenance, d.origin FROM dependencies d JOIN environments e ON e.id = d.environment_id
        WHERE e.slug = 'dispatch' ORDER BY d.from_key, d.to_key`,
      { type: QueryTypes.SELECT },
    );
    expect(rows.map((r) => [r.from_key, r.to_key, r.strength, r.via, r.provenance])).toEqual([
      ["checkout", "collector", "soft", null, ["declared"]],
      ["checkout", "orders", "hard", "ORDERS_URL", ["inferred"]],
      ["checkout", "payments", "hard", null, ["declared"]],
      ["checkout", "schema-migrate", "startup", null, ["declared"]],
      ["orders", "payments-db", "hard", null, ["declared"]],
      ["payments", "payments-db", "hard", "PAYMENTS_DB", ["inferred"]],
      ["schema-migrate", "payments-db", "hard", "command", ["inferred"]],
    ]);
    // An inferred need keeps the file and line that named it.
    expect(rows.find((r) => r.to_key === "orders")?.origin).toEqual({ file: "compose.override.yaml", line: 4, column: 19 });

    const again = await call(push, { url: url(""), method: "POST", params: { env: "dispatch" }, as: admin, body: PREMERGED, headers: { "content-type": "application/yaml" } });
    expect(again.status).toBe(200);
    expect(again.json).toMatchObject({ changed: false, snapshot: null });
  });

  it("the same project as a multi-document YAML body (no .env: variables fall back to their defaults, with a warning)", async () => {
    const res = await call(push, {
      url: `/api/v1/environments/dispatch-docs/inventory?format=compose&source=dispatch-compose&dry_run=true&profiles=debug`,
      method: "POST",
      params: { env: "dispatch-docs" },
      as: admin,
      body: `${BASE}---\n${OVERRIDE}---\n${PROD}`,
      headers: { "content-type": "application/yaml" },
    });
    expect(res.status).toBe(200);
    const json = res.json as { warnings: { message: string; file?: string }[]; diff: { componentsAdded: { key: string }[] } };
    expect(json.diff.componentsAdded.map((c) => c.key)).toContain("debug-shell");
    expect(json.warnings.map((w) => w.message)).toEqual(
      expect.arrayContaining([expect.stringMatching(/variable DB_USER is not set/), expect.stringMatching(/variable ORDERS_PORT is not set/)]),
    );
  });

  it("refuses a bad profiles list and says what a source name must look like", async () => {
    const bad = await call(push, { url: url("&profiles=a,,b"), method: "POST", params: { env: "dispatch" }, as: admin, body: BASE, headers: { "content-type": "application/yaml" } });
    expect(bad.status).toBe(422);
    const src = await call(push, { url: `/api/v1/environments/dispatch/inventory?format=compose&source=Bad_Name`, method: "POST", params: { env: "dispatch" }, as: admin, body: BASE, headers: { "content-type": "application/yaml" } });
    expect(JSON.stringify(src.json)).toMatch(/1-128 characters of a-z, 0-9/);
  });
});
