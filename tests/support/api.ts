// Calling route handlers in-process with real requests: a real next-auth session cookie (signed
// with the app's secret, exactly as the sign-in endpoint issues it) or a real API token.
import { encode } from "next-auth/jwt";
import { NextRequest } from "next/server";
import { db } from "@/models";
import type { Role, TokenScope } from "@/lib/auth/roles";
import { createToken } from "@/lib/data/tokens";
import { hashPassword } from "@/lib/data/users";

export interface TestUser {
  id: string;
  email: string;
  role: Role;
  cookie: string;
}

let counter = 0;

export async function createUser(role: Role, email?: string): Promise<TestUser> {
  counter++;
  const address = email ?? `${role}-${counter}-${process.pid}@test.example`;
  const row = await db().models.User.create({
    email: address,
    name: `${role} ${counter}`,
    role,
    passwordHash: await hashPassword("correct horse battery"),
    oidcSubject: null,
  });
  const jwt = await encode({ token: { sub: row.id, email: row.email, name: row.name, role, sv: row.sessionVersion }, secret: process.env.NEXTAUTH_SECRET ?? "" });
  return { id: row.id, email: row.email, role, cookie: `next-auth.session-token=${jwt}` };
}

/** The cookie a fresh sign-in would give this user now (next-auth's jwt callback puts the current session version in it). */
export async function signInAgain(user: TestUser): Promise<TestUser> {
  const row = await db().models.User.findByPk(user.id);
  if (!row) throw new Error(`no user ${user.id}`);
  const jwt = await encode({ token: { sub: row.id, email: row.email, name: row.name, role: row.role, sv: row.sessionVersion }, secret: process.env.NEXTAUTH_SECRET ?? "" });
  return { ...user, role: row.role, cookie: `next-auth.session-token=${jwt}` };
}

export async function createApiToken(opts: { scopes: TokenScope[]; environmentId?: string | null; source?: string | null; createdBy: string }): Promise<string> {
  const { token } = await createToken({ name: `t${++counter}`, scopes: opts.scopes, environmentId: opts.environmentId ?? null, source: opts.source ?? null, createdBy: opts.createdBy });
  return token;
}

type Handler<P> = (req: NextRequest, ctx: { params: Promise<P> }) => Promise<Response>;

export interface CallOptions<P> {
  url: string;
  method?: string;
  params?: P;
  as?: TestUser | { token: string } | null;
  body?: string | Buffer | object;
  headers?: Record<string, string>;
  /**
   * A signed-in browser's write from one of our own pages carries these (lib/auth/same-origin.ts);
   * false sends the request without them, as a script replaying the cookie would.
   */
  ownPage?: boolean;
}

/** What Chromium attaches to a fetch() from a page served by the app itself. */
const OWN_PAGE_HEADERS = { origin: "http://127.0.0.1:3000", "sec-fetch-site": "same-origin", "sec-fetch-mode": "cors" } as const;

export async function call<P>(handler: Handler<P>, opts: CallOptions<P>): Promise<{ status: number; json: unknown; headers: Headers }> {
  const headers = new Headers(opts.headers);
  if (opts.as && "cookie" in opts.as) {
    headers.set("cookie", opts.as.cookie);
    if (opts.ownPage !== false) for (const [k, v] of Object.entries(OWN_PAGE_HEADERS)) if (!headers.has(k)) headers.set(k, v);
  }
  if (opts.as && "token" in opts.as) headers.set("authorization", `Bearer ${opts.as.token}`);
  let body: BodyInit | undefined;
  if (typeof opts.body === "string" || Buffer.isBuffer(opts.body)) body = opts.body as BodyInit;
  else if (opts.body !== undefined) {
    body = JSON.stringify(opts.body);
    if (!headers.has("content-type")) headers.set("content-type", "application/json");
  }
  const req = new NextRequest(new URL(opts.url, "http://127.0.0.1:3000"), { method: opts.method ?? "GET", headers, body });
  const res = await handler(req, { params: Promise.resolve((opts.params ?? {}) as P) });
  const text = await res.text();
  let json: unknown = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = text;
  }
  return { status: res.status, json, headers: res.headers };
}
