// The authorization matrix (DESIGN §5): every route handler × the five roles × token scopes.
// The table below is the contract. The test fails when a route file exists without an entry
// (or an entry without a route), when a handler is not wrapped by withPermission, or when the
// server lets a caller through that the table refuses.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { ROLES, roleHas, type Permission, type Role } from "@/lib/auth/roles";
import type { RouteRule } from "@/lib/auth/with-permission";
import { OPERATIONS, ROOT_OPERATIONS } from "@/lib/api/openapi";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

const MATRIX: Record<string, Partial<Record<"GET" | "POST" | "PUT" | "PATCH" | "DELETE", RouteRule>>> = {
  "audit": { GET: "reviews:write" },
  "environments": { GET: "read", POST: "admin" },
  "environments/[env]": { GET: "read", PATCH: "admin", DELETE: "admin" },
  "environments/[env]/boot-order": { GET: "read" },
  "environments/[env]/components": { GET: "read" },
  "environments/[env]/components/[key]": { GET: "read", PATCH: "components:annotate" },
  "environments/[env]/components/[key]/blast-radius": { GET: "read" },
  "environments/[env]/components/[key]/history": { GET: "read" },
  "environments/[env]/drills": { POST: "read" },
  "environments/[env]/chain": { GET: "read" },
  "environments/[env]/drift": { GET: "read" },
  "environments/[env]/alerts": { POST: "inventory:write" },
  "environments/[env]/incidents": { GET: "read" },
  "environments/[env]/incidents/current": { GET: "read" },
  "environments/[env]/incidents/[number]": { GET: "read" },
  "environments/[env]/incidents/[number]/resolve": { POST: "inventory:write" },
  "environments/[env]/graph": { GET: "read" },
  "environments/[env]/imports": { GET: "read" },
  "environments/[env]/inventory": { POST: "inventory:write" },
  "environments/[env]/otlp/v1/traces": { POST: "inventory:write" },
  "environments/[env]/map/layouts": { GET: "read" },
  "environments/[env]/map/positions": { GET: "read", PUT: "components:annotate" },
  "environments/[env]/rankings": { GET: "read" },
  "environments/[env]/rankings/export": { GET: "read" },
  "environments/[env]/rankings/history": { GET: "read" },
  "environments/[env]/reviews": { GET: "read" },
  "environments/[env]/reviews/[key]": { PUT: "reviews:write", DELETE: "reviews:write" },
  "environments/[env]/snapshots": { GET: "read" },
  "environments/[env]/snapshots/[a]/diff/[b]": { GET: "read" },
  "environments/[env]/weights": { GET: "read", PUT: "reviews:write" },
  "environments/[env]/policies": { GET: "read", PUT: "reviews:write" },
  "environments/[env]/settings": { GET: "read", PATCH: "reviews:write" },
  "invites/[token]": { POST: "public" },
  "openapi.json": { GET: "public" },
  "schema/inventory": { GET: "public" },
  "teams": { GET: "read", POST: "admin" },
  "teams/[slug]": { GET: "read", PATCH: "components:annotate" },
  "teams/[slug]/members": { POST: "admin" },
  "teams/[slug]/members/[userId]": { DELETE: "admin" },
  "teams/unowned": { GET: "read" },
  "tokens": { GET: "admin", POST: "admin" },
  "tokens/[id]": { DELETE: "admin" },
  "users": { GET: "admin", POST: "admin" },
  "users/[id]": { PATCH: "admin" },
  "users/[id]/invite": { POST: "admin" },
};

const API_ROOT = path.resolve(__dirname, "../../app/api/v1");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
type Method = (typeof METHODS)[number];
type Wrapped = ((req: never, ctx: never) => Promise<Response>) & { permission?: RouteRule };

function routeFiles(dir = API_ROOT): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return routeFiles(full);
    return name === "route.ts" ? [path.relative(API_ROOT, dir)] : [];
  });
}

const PARAM_VALUES: Record<string, string> = {
  env: "production",
  key: "checkout-service",
  a: "1",
  b: "2",
  id: "00000000-0000-4000-8000-000000000000",
  userId: "00000000-0000-4000-8000-000000000000",
  slug: "checkout",
  token: "not-a-real-invite",
  number: "1",
};

function paramsOf(route: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const m of route.matchAll(/\[(\w+)\]/g)) out[m[1]!] = PARAM_VALUES[m[1]!] ?? "x";
  return out;
}

const urlOf = (route: string) => `/api/v1/${route.replace(/\[(\w+)\]/g, (_, p: string) => PARAM_VALUES[p] ?? "x")}`;

async function load(route: string): Promise<Partial<Record<Method, Wrapped>>> {
  return (await import(/* @vite-ignore */ path.join(API_ROOT, route, "route.ts"))) as Partial<Record<Method, Wrapped>>;
}

const users = {} as Record<Role, TestUser>;
const tokens = {} as Record<"read" | "inventory:write", string>;

beforeAll(async () => {
  for (const role of ROLES) users[role] = await createUser(role);
  tokens.read = await createApiToken({ scopes: ["read"], createdBy: users.admin.id });
  tokens["inventory:write"] = await createApiToken({ scopes: ["inventory:write"], createdBy: users.admin.id });
});

const WRAPPER_REFUSAL = /^This needs the /;
const isWrapperRefusal = (res: { status: number; json: unknown }) =>
  res.status === 403 && WRAPPER_REFUSAL.test(String((res.json as { message?: string } | null)?.message ?? ""));

describe("authorization matrix", () => {
  const files = routeFiles().sort();

  it("has an entry for every route file and a route file for every entry", () => {
    expect(files).toEqual(Object.keys(MATRIX).sort());
  });

  it("documents every operation in openapi.json with the same rule", () => {
    const documented = Object.fromEntries(
      Object.entries(OPERATIONS).map(([p, methods]) => [
        p.slice(1).replace(/\{(\w+)\}/g, "[$1]"),
        Object.fromEntries(Object.entries(methods).map(([m, op]) => [m.toUpperCase(), op?.rule])),
      ]),
    );
    expect(documented).toEqual(MATRIX);
  });

  it("wraps every exported handler with withPermission and the rule the table gives", async () => {
    for (const route of files) {
      const mod = await load(route);
      const exported = METHODS.filter((m) => typeof mod[m] === "function");
      expect({ route, methods: exported }).toEqual({ route, methods: Object.keys(MATRIX[route] ?? {}).sort((a, b) => METHODS.indexOf(a as Method) - METHODS.indexOf(b as Method)) });
      for (const m of exported) expect({ route, m, permission: mod[m]?.permission }).toEqual({ route, m, permission: MATRIX[route]?.[m] });
    }
  });

  const cases = Object.entries(MATRIX).flatMap(([route, methods]) => Object.entries(methods).map(([method, rule]) => ({ route, method: method as Method, rule: rule as RouteRule })));

  it.each(cases.filter((c) => c.rule !== "public"))("$method $route: anonymous 401, roles and scopes as the table says", async ({ route, method, rule }) => {
    const handler = (await load(route))[method]!;
    const base = { url: urlOf(route), method, params: paramsOf(route), body: method === "GET" || method === "DELETE" ? undefined : {} };
    const anonymous = await call(handler as never, base);
    expect({ route, method, status: anonymous.status }).toEqual({ route, method, status: 401 });
    for (const role of ROLES) {
      const res = await call(handler as never, { ...base, as: users[role] });
      const allowed = roleHas(role, rule as Permission);
      expect({ route, method, role, refused: isWrapperRefusal(res) || res.status === 401 }).toEqual({ route, method, role, refused: !allowed });
    }
    for (const scope of ["read", "inventory:write"] as const) {
      const res = await call(handler as never, { ...base, as: { token: tokens[scope] } });
      expect({ route, method, scope, refused: isWrapperRefusal(res) }).toEqual({ route, method, scope, refused: scope !== rule });
    }
  });
});

describe("cross-site writes", () => {
  // Every write route, whatever its rule: the request a page on another port of the same host
  // makes with fetch(…, { mode: "no-cors", credentials: "include" }) (see cross-site-writes.test.ts).
  const writes = Object.entries(MATRIX).flatMap(([route, methods]) =>
    Object.entries(methods)
      .filter(([method, rule]) => method !== "GET" && rule !== "public")
      .map(([method]) => ({ route, method: method as Method })),
  );

  it.each(writes)("$method $route refuses an admin's cookie sent from another origin", async ({ route, method }) => {
    const handler = (await load(route))[method]!;
    const res = await call(handler as never, {
      url: urlOf(route),
      method,
      params: paramsOf(route),
      as: users.admin,
      ownPage: false,
      headers: { origin: "http://127.0.0.1:4000", "sec-fetch-site": "same-site", "sec-fetch-mode": "no-cors", "content-type": "text/plain;charset=UTF-8" },
      body: method === "DELETE" ? undefined : "{}",
    });
    expect({ route, method, status: res.status, message: String((res.json as { message?: string } | null)?.message ?? "") }).toEqual({
      route,
      method,
      status: 403,
      message: expect.stringContaining("Refused a change made with your session cookie"),
    });
  });
});

describe("routes outside /api/v1", () => {
  // next-auth's own endpoints aside, every route under app/api is in one of the two tables.
  const ROOT_MATRIX: Record<string, Partial<Record<Method, RouteRule>>> = { health: { GET: "public" } };
  const root = path.resolve(__dirname, "../../app/api");
  const found = readdirSync(root).filter((d) => d !== "v1" && d !== "auth" && statSync(path.join(root, d)).isDirectory());

  it("are listed, documented in openapi.json with the same rule, and wrapped by withPermission", async () => {
    expect(found.sort()).toEqual(Object.keys(ROOT_MATRIX).sort());
    const documented = Object.fromEntries(
      Object.entries(ROOT_OPERATIONS).map(([p, methods]) => [p.replace(/^\/api\//, ""), Object.fromEntries(Object.entries(methods).map(([m, op]) => [m.toUpperCase(), op?.rule]))]),
    );
    expect(documented).toEqual(ROOT_MATRIX);
    for (const [route, methods] of Object.entries(ROOT_MATRIX)) {
      const mod = (await import(/* @vite-ignore */ path.join(root, route, "route.ts"))) as Partial<Record<Method, Wrapped>>;
      for (const [m, rule] of Object.entries(methods)) expect({ route, m, permission: mod[m as Method]?.permission }).toEqual({ route, m, permission: rule });
    }
  });
});

describe("server actions", () => {
  // A server action is a public endpoint that withPermission never sees. Pinchpoint has none: every
  // write is a route handler above. A "use server" directive anywhere (a file's or a function's) fails
  // here until whoever adds it gives actions a permission wrapper and a check in this matrix.
  const roots = ["app", "components", "lib"].map((d) => path.resolve(__dirname, "../..", d));
  const walk = (dir: string): string[] =>
    readdirSync(dir).flatMap((name) => {
      const full = path.join(dir, name);
      return statSync(full).isDirectory() ? walk(full) : /\.tsx?$/.test(name) ? [full] : [];
    });

  it("no file declares a server action", () => {
    const files = roots.flatMap(walk);
    expect(files.length).toBeGreaterThan(100);
    const withActions = files.filter((f) => /^\s*["']use server["'];?\s*$/m.test(readFileSync(f, "utf8")));
    expect(withActions).toEqual([]);
  });
});
