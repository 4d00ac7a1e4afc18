// Cross-site request forgery (issue: a page on the same site could make a signed-in admin's browser
// invite a new admin). The requests below are byte for byte what Chromium sends for
// fetch(url, { method: "POST", mode: "no-cors", credentials: "include", body }) from a page on
// another port of the same host: a CORS-safelisted text/plain body (no preflight), the page's
// Origin, Sec-Fetch-Site: same-site (ports do not make another site; the session cookie, which is
// SameSite=Lax, goes along), Sec-Fetch-Mode: no-cors. Fetch Metadata Request Headers (W3C), §2.1
// Sec-Fetch-Site; Fetch Standard, "CORS-safelisted request-header" for text/plain.
import { beforeAll, describe, expect, it } from "vitest";
import { POST as inviteRoute } from "@/app/api/v1/users/route";
import { POST as drillsRoute } from "@/app/api/v1/environments/[env]/drills/route";
import { db } from "@/models";
import { pushInventory } from "@/lib/data/push";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

let admin: TestUser;
let readToken: string;

const foreignPage = (origin: string, site: string) => ({
  origin,
  referer: `${origin}/`,
  "sec-fetch-site": site,
  "sec-fetch-mode": "no-cors",
  "sec-fetch-dest": "empty",
  "content-type": "text/plain;charset=UTF-8",
});

const newAdmin = (email: string) => JSON.stringify({ email, name: "Mallory", role: "admin" });
const exists = async (email: string) => (await db().models.User.count({ where: { email } })) > 0;

beforeAll(async () => {
  admin = await createUser("admin");
  readToken = await createApiToken({ scopes: ["read"], createdBy: admin.id });
  await pushInventory({
    environment: "production",
    format: "pinchpoint",
    body: "pinchpoint: 1\nsource: s\ncomponents:\n  - { key: a, kind: service }\n",
    dryRun: false,
    actor: { type: "system", label: "test", canCreateEnvironments: true },
  });
});

describe("a cookie-authenticated write from another origin", () => {
  it("is refused when a page on another port of the same host sends it with no-cors (nothing is created)", async () => {
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, ownPage: false, headers: foreignPage("http://127.0.0.1:4000", "same-site"), body: newAdmin("mallory@evil.example") });
    expect(res.status).toBe(403);
    expect(res.json).toMatchObject({ error: "forbidden", message: expect.stringContaining("Sec-Fetch-Site: same-site") });
    expect(await exists("mallory@evil.example")).toBe(false);
  });

  it("is refused from a sibling subdomain and from another site", async () => {
    for (const [origin, site] of [["http://wiki.127.0.0.1.nip.example:3000", "same-site"], ["https://evil.example", "cross-site"]] as const) {
      const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, ownPage: false, headers: foreignPage(origin, site), body: newAdmin(`m-${site}@evil.example`) });
      expect(res.status).toBe(403);
    }
    expect(await db().models.User.count({ where: { name: "Mallory" } })).toBe(0);
  });

  it("is refused from a browser that sends Origin but no Sec-Fetch-Site, when the Origin is not the app's", async () => {
    const headers: Record<string, string> = { origin: "http://127.0.0.1:4000", "content-type": "text/plain;charset=UTF-8" };
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, ownPage: false, headers, body: newAdmin("old-browser@evil.example") });
    expect(res.status).toBe(403);
    expect(await exists("old-browser@evil.example")).toBe(false);
  });

  it("is refused when it carries neither header (a replayed cookie)", async () => {
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, ownPage: false, headers: { "content-type": "application/json" }, body: newAdmin("replayed@evil.example") });
    expect(res.status).toBe(403);
    expect((res.json as { message: string }).message).toContain("neither Origin nor Sec-Fetch-Site");
  });
});

describe("our own pages", () => {
  it("write with Sec-Fetch-Site: same-origin, or with the app's Origin alone", async () => {
    const ok = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, body: { email: "colleague@harbor-pantry.example", name: "Colleague", role: "viewer" } });
    expect(ok.status).toBe(201);
    const originOnly = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, ownPage: false, headers: { origin: "http://127.0.0.1:3000" }, body: { email: "second@harbor-pantry.example", name: "Second", role: "viewer" } });
    expect(originOnly.status).toBe(201);
  });

  it("must send JSON as application/json: a text/plain body is 415 even from our own origin", async () => {
    const res = await call(inviteRoute, { url: "/api/v1/users", method: "POST", as: admin, headers: { "content-type": "text/plain;charset=UTF-8" }, body: newAdmin("plain@harbor-pantry.example") });
    expect(res.status).toBe(415);
    expect(res.json).toMatchObject({ error: "unsupported_media_type" });
    expect(await exists("plain@harbor-pantry.example")).toBe(false);
  });
});

describe("API tokens", () => {
  it("need no Origin: a script with a Bearer token carries no ambient credential", async () => {
    const res = await call(drillsRoute, { url: "/api/v1/environments/production/drills", method: "POST", params: { env: "production" }, as: { token: readToken }, body: { fail: { components: ["a"] } } });
    expect(res.status).not.toBe(403);
    expect(res.status).not.toBe(401);
  });
});
