// Every JSON answer has the shape openapi.json documents: on the seeded Harbor Pantry demo (with
// an open incident), each documented GET and a write of every kind is called through its real
// route handler, and its answer is parsed with the response schema lib/api/openapi.ts names for
// it (the same schema the screens parse with). The compiler holds the handlers to these schemas
// (lib/api/respond.ts); this holds what actually leaves the server, dates and all.
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { z } from "zod";
import { OPERATIONS, ROOT_OPERATIONS } from "@/lib/api/openapi";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { seedDemo } from "@/lib/data/seed";
import { DEFAULT_POLICIES } from "@/lib/impact/policies";
import { db } from "@/models";
import { call, createUser, type TestUser } from "../support/api";

type Method = "get" | "post" | "put" | "patch" | "delete";
type Handler = Parameters<typeof call>[0];

const API = path.resolve(__dirname, "../../app/api/v1");
const ids: Record<string, string> = { env: "production", key: "dns-resolver", slug: "checkout", a: "1", b: "2", number: "1" };

async function handlerOf(p: string, method: Method): Promise<Handler> {
  const file = path.join(API, p.replace(/\{(\w+)\}/g, "[$1]"), "route.ts");
  const mod = (await import(/* @vite-ignore */ file)) as Record<string, Handler>;
  const h = mod[method.toUpperCase()];
  if (!h) throw new Error(`${method} ${p}: no handler in ${file}`);
  return h;
}

const urlOf = (p: string, values: Record<string, string>) => `/api/v1${p.replace(/\{(\w+)\}/g, (_, k: string) => values[k] ?? k)}`;
const paramsOf = (p: string, values: Record<string, string>) => Object.fromEntries([...p.matchAll(/\{(\w+)\}/g)].map((m) => [m[1]!, values[m[1]!] ?? ""]));

function schemaOf(p: string, method: Method): z.ZodType {
  const response = OPERATIONS[p]?.[method]?.response;
  if (!response || typeof response === "string") throw new Error(`${method} ${p} has no JSON response schema`);
  return response;
}

/** The answer's problems under its schema, as `path: message` lines (none: it conforms). */
function problems(schema: z.ZodType, value: unknown): string[] {
  const parsed = schema.safeParse(value);
  return parsed.success ? [] : parsed.error.issues.slice(0, 10).map((i) => `${i.path.join(".") || "(root)"}: ${i.message}`);
}

let admin: TestUser;

beforeAll(async () => {
  await seedDemo({ examplesDir: path.resolve(__dirname, "../../examples/harbor-pantry"), log: () => undefined });
  await drainAnalysisQueue();
  admin = await createUser("admin");
  // An open incident, so that the incident routes answer with one.
  const alerts = await call(await handlerOf("/environments/{env}/alerts", "post"), {
    url: "/api/v1/environments/production/alerts",
    method: "POST",
    params: { env: "production" },
    as: admin,
    body: { alerts: [{ component: "dns-resolver", status: "firing", summary: "resolution failing" }, { component: "session-service", status: "firing" }] },
  });
  expect(alerts.status).toBe(200);
  expect(problems(schemaOf("/environments/{env}/alerts", "post"), alerts.json)).toEqual([]);
}, 120_000);

describe("response schemas", () => {
  const gets = Object.entries(OPERATIONS).flatMap(([p, methods]) => (methods.get && typeof methods.get.response !== "string" ? [p] : []));

  it("cover every JSON answer of the API", () => {
    for (const [p, methods] of Object.entries(OPERATIONS)) for (const [m, op] of Object.entries(methods)) expect({ op: `${m} ${p}`, response: op?.response !== undefined }).toEqual({ op: `${m} ${p}`, response: true });
    expect(gets.length).toBeGreaterThan(25);
  });

  // Routes whose query has required parameters are asked a real question.
  const requiredQuery: Record<string, string> = { "/environments/{env}/chain": "?from=payment-orchestrator&to=payments-db" };
  it.each(gets)("GET %s answers what its schema says", async (p) => {
    const res = await call(await handlerOf(p, "get"), { url: `${urlOf(p, ids)}${requiredQuery[p] ?? ""}`, params: paramsOf(p, ids), as: admin });
    expect({ p, status: res.status }).toEqual({ p, status: 200 });
    expect({ p, problems: problems(schemaOf(p, "get"), res.json) }).toEqual({ p, problems: [] });
  });

  it("holds with the list parameters and the other variants too", async () => {
    const variants: Array<[string, string]> = [
      ["/environments/{env}/components", "?sort=team&order=desc&limit=5&offset=5&kind=service&tier=2"],
      ["/environments/{env}/boot-order", "?stages=false"],
      ["/environments/{env}/boot-order", "?components=true"],
      ["/environments/{env}/rankings", "?sort=pinchScore&limit=3&team=checkout"],
      ["/environments/{env}/incidents", "?status=open&sort=peakFiring"],
      ["/teams/unowned", "?environment=production&sort=key&limit=2"],
      ["/teams/{slug}", "?sort=tier&limit=2&offset=1"],
      ["/audit", "?action=environment&sort=actor&order=asc"],
    ];
    for (const [p, query] of variants) {
      const res = await call(await handlerOf(p, "get"), { url: `${urlOf(p, ids)}${query}`, params: paramsOf(p, ids), as: admin });
      expect({ p, query, status: res.status }).toEqual({ p, query, status: 200 });
      expect({ p, query, problems: problems(schemaOf(p, "get"), res.json) }).toEqual({ p, query, problems: [] });
    }
  });

  it("holds for writes of every kind", async () => {
    const env = { env: "production" };
    const member = await createUser("engineer");
    const writes: Array<{ p: string; method: Method; values?: Record<string, string>; body?: unknown; query?: string; status?: number }> = [
      { p: "/environments/{env}/drills", method: "post", body: { fail: { components: ["dns-resolver"], zones: ["harbor-east"] } } },
      { p: "/environments/{env}/inventory", method: "post", query: "?dry_run=true&impact=true", body: "pinchpoint: 1\nsource: schema-check\ncomponents:\n  - key: schema-check-svc\n    kind: service\n    needs: [dns-resolver]\n" },
      { p: "/environments/{env}/components/{key}", method: "patch", body: { notes: "checked by the response-schemas test" } },
      { p: "/environments/{env}/reviews/{key}", method: "put", body: { status: "accepted", rationale: "a second resolver ships next quarter", reviewBy: new Date(Date.now() + 30 * 86_400_000).toISOString().slice(0, 10) } },
      { p: "/environments/{env}/reviews/{key}", method: "delete" },
      { p: "/environments/{env}/settings", method: "patch", body: { traceWindowDays: 7 } },
      { p: "/environments/{env}/weights", method: "put", body: { betweenness: 0.4, reach: 0.4, single: 0.2 } },
      { p: "/environments/{env}/policies", method: "put", body: DEFAULT_POLICIES },
      { p: "/environments/{env}/map/positions", method: "put", body: { "dns-resolver": { x: 10, y: 20 } } },
      { p: "/environments/{env}/incidents/{number}/resolve", method: "post", body: { reason: "the test closes it by hand" } },
      { p: "/environments", method: "post", body: { slug: "schema-check", name: "Schema check" }, status: 201 },
      { p: "/environments/{env}", method: "patch", values: { env: "schema-check" }, body: { name: "Schema check, renamed" } },
      { p: "/environments/{env}", method: "delete", values: { env: "schema-check" }, query: "?confirm=schema-check" },
      { p: "/teams", method: "post", body: { slug: "schema-check", name: "Schema check" }, status: 201 },
      { p: "/teams/{slug}", method: "patch", values: { slug: "schema-check" }, body: { oncall: "rota schema-check" } },
      { p: "/teams/{slug}/members", method: "post", values: { slug: "schema-check" }, body: { email: member.email } },
      { p: "/teams/{slug}/members/{userId}", method: "delete", values: { slug: "schema-check", userId: member.id } },
      { p: "/tokens", method: "post", body: { name: "schema check", scopes: ["read"] }, status: 201 },
      { p: "/users", method: "post", body: { email: "schema-check@test.example", name: "Schema Check", role: "viewer" }, status: 201 },
    ];
    for (const w of writes) {
      const values = { ...ids, ...env, ...w.values };
      const res = await call(await handlerOf(w.p, w.method), {
        url: `${urlOf(w.p, values)}${w.query ?? ""}`,
        method: w.method.toUpperCase(),
        params: paramsOf(w.p, values),
        as: admin,
        body: w.body as object | string | undefined,
        headers: typeof w.body === "string" ? { "content-type": "application/yaml" } : undefined,
      });
      const op = `${w.method} ${w.p}`;
      expect({ op, status: res.status }).toEqual({ op, status: w.status ?? 200 });
      expect({ op, problems: problems(schemaOf(w.p, w.method), res.json) }).toEqual({ op, problems: [] });
    }
    // The writes that need an id made above: revoke the token, re-invite and change the user.
    const token = await db().models.ApiToken.findOne({ where: { name: "schema check" } });
    const user = await db().models.User.findOne({ where: { email: "schema-check@test.example" } });
    const followUps: Array<{ p: string; method: Method; values: Record<string, string>; body?: unknown; status?: number }> = [
      { p: "/tokens/{id}", method: "delete", values: { id: token!.id } },
      { p: "/users/{id}/invite", method: "post", values: { id: user!.id }, status: 201 },
      { p: "/users/{id}", method: "patch", values: { id: user!.id }, body: { role: "engineer" } },
    ];
    for (const w of followUps) {
      const res = await call(await handlerOf(w.p, w.method), { url: urlOf(w.p, w.values), method: w.method.toUpperCase(), params: w.values, as: admin, body: w.body as object | undefined });
      const op = `${w.method} ${w.p}`;
      expect({ op, status: res.status }).toEqual({ op, status: w.status ?? 200 });
      expect({ op, problems: problems(schemaOf(w.p, w.method), res.json) }).toEqual({ op, problems: [] });
    }
    // The invitee accepts a fresh link (public route, no session).
    const link = await call(await handlerOf("/users/{id}/invite", "post"), { url: urlOf("/users/{id}/invite", { id: user!.id }), method: "POST", params: { id: user!.id }, as: admin });
    const secret = (link.json as { token: string }).token;
    const accepted = await call(await handlerOf("/invites/{token}", "post"), { url: `/api/v1/invites/${secret}`, method: "POST", params: { token: secret }, body: { password: "a long enough password" } });
    expect(accepted.status).toBe(200);
    expect(problems(schemaOf("/invites/{token}", "post"), accepted.json)).toEqual([]);
  });

  it("holds for the health check outside /api/v1", async () => {
    const { GET } = (await import("@/app/api/health/route")) as { GET: Handler };
    const res = await call(GET, { url: "/api/health" });
    const schema = ROOT_OPERATIONS["/api/health"]?.get?.response as z.ZodType;
    expect(problems(schema, res.json)).toEqual([]);
  });
});
