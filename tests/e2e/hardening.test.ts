// The served app (scripts/serve.ts, as npm start runs it) against the findings of a security and
// fault review, in Debian's Chromium where a browser is the point: a foreign page's no-cors write,
// the page policy with the map's worker and the mail frame working under it, the sign-in limit
// per connection address, a malformed callbackUrl, a copied cookie after sign-out, and the
// overview's notice when no analysis worker is running.
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile, screenshot } from "./browser";
import { http as httpTo, signInOverHttp as signInTo } from "./http";
import { DEMO_PASSWORD, signedInPage } from "./pages/signin";

const browser = browserForFile();

const http = (path: string, opts: Parameters<typeof httpTo>[2] & { from: string }) => httpTo(baseUrl(), path, opts);
const signInOverHttp = (opts: Parameters<typeof signInTo>[1]) => signInTo(baseUrl(), opts);

describe("a foreign page's write with the admin's cookie", () => {
  let foreign: Server;
  let capture: Server;
  let foreignUrl = "";
  let captureUrl = "";
  let captured: Record<string, string | string[] | undefined> = {};

  beforeAll(async () => {
    // Another port of the same host: the same site, so Chromium sends the SameSite=Lax session cookie
    // (cookies do not look at ports). The page sends the same no-cors fetch twice: to a third port
    // of the host, where the headers Chromium puts on such a request are recorded, and to the app.
    capture = createServer((req, res) => {
      captured = req.headers;
      res.end();
    });
    await new Promise<void>((r) => capture.listen(0, "127.0.0.1", () => r()));
    captureUrl = `http://127.0.0.1:${(capture.address() as AddressInfo).port}/capture`;
    foreign = createServer((_, res) => {
      res.setHeader("content-type", "text/html");
      res.end(`<!doctype html><script>
        const send = (url) => fetch(url, { method: "POST", mode: "no-cors", credentials: "include",
          body: JSON.stringify({ email: "mallory@evil.example", name: "Mallory", role: "admin" }) });
        send(${JSON.stringify(captureUrl)}).then(() => send(${JSON.stringify(baseUrl())} + "/api/v1/users"));
      </script>`);
    });
    await new Promise<void>((r) => foreign.listen(0, "127.0.0.1", () => r()));
    foreignUrl = `http://127.0.0.1:${(foreign.address() as AddressInfo).port}/`;
  });
  afterAll(async () => {
    await new Promise((r) => foreign.close(r));
    await new Promise((r) => capture.close(r));
  });

  it("is refused: Chromium sends the cookie with text/plain and the foreign Origin, and no admin is invited", async () => {
    const page = await signedInPage(browser(), "admin");
    const answered = page.waitForResponse((r) => r.url().endsWith("/api/v1/users") && r.request().method() === "POST");
    await page.goto(foreignUrl);
    expect((await answered).status()).toBe(403);
    expect(captured["content-type"]).toMatch(/^text\/plain/);
    expect(captured["origin"]).toBe(foreignUrl.replace(/\/$/, ""));
    expect(captured["sec-fetch-site"]).toBe("same-site");
    expect(captured["sec-fetch-mode"]).toBe("no-cors");
    expect(String(captured["cookie"] ?? "")).toContain("next-auth.session-token=");
    await page.goto(`${baseUrl()}/admin/users`);
    const users = (await page.evaluate(async () => (await fetch("/api/v1/users")).json())) as { items: Array<{ email: string }> };
    expect(users.items.map((u) => u.email)).not.toContain("mallory@evil.example");
    await page.context().close();
  });
});

describe("security headers and the page policy", () => {
  let page: Page;
  const violations: string[] = [];

  beforeAll(async () => {
    page = await signedInPage(browser(), "admin");
    page.on("console", (m) => {
      if (/Content Security Policy|Refused to (load|execute|frame|connect|create a worker)/i.test(m.text())) violations.push(m.text());
    });
  });
  afterAll(() => page.context().close());

  it("sends a per-request nonce policy, frame-ancestors 'none', nosniff and Referrer-Policy on pages; no HSTS over plain http", async () => {
    const first = await http("/signin", { from: "127.0.0.1" });
    const second = await http("/signin", { from: "127.0.0.1" });
    const csp = String(first.headers["content-security-policy"]);
    expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(second.headers["content-security-policy"]).not.toBe(csp);
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1] ?? "";
    expect(first.body).toContain(`nonce="${nonce}"`);
    expect(first.headers["x-content-type-options"]).toBe("nosniff");
    expect(first.headers["referrer-policy"]).toBe("same-origin");
    expect(first.headers["x-frame-options"]).toBe("DENY");
    expect(first.headers["strict-transport-security"]).toBeUndefined();
    const api = await http("/api/v1/openapi.json", { from: "127.0.0.1" });
    expect(api.headers["content-security-policy"]).toBe("default-src 'none'; frame-ancestors 'none'");
    expect(api.headers["x-content-type-options"]).toBe("nosniff");
  });

  it("the map lays out in its web worker under the policy, with no violation reported", async () => {
    // A focus is laid out in the browser (the whole map opens on positions the worker stored).
    await page.goto(`${baseUrl()}/environments/production/map?focus=session-service`);
    await page.getByText(/laid out in/).waitFor({ timeout: 60_000 });
    await screenshot(page, "hardening-map-under-csp");
    expect(violations).toEqual([]);
  });

  it("the mail viewer's sandboxed frame shows a message under the policy", async () => {
    // An invite queues an e-mail; the worker delivers it to the sink the mail page reads.
    const invited = await page.evaluate(async () => {
      const res = await fetch("/api/v1/users", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email: "csp-check@harbor-pantry.example", name: "Frame Check", role: "viewer" }) });
      return res.status;
    });
    expect(invited).toBe(201);
    const deadline = Date.now() + 30_000;
    for (;;) {
      await page.goto(`${baseUrl()}/admin/mail`);
      if (((await page.getByTestId("mail-list").textContent().catch(() => "")) ?? "").includes("csp-check@harbor-pantry.example")) break;
      if (Date.now() > deadline) throw new Error("the invite e-mail did not reach the sink within 30 s");
      await page.waitForTimeout(1_000);
    }
    await page.getByTestId("mail-list").getByText("csp-check@harbor-pantry.example").first().click();
    await page.waitForURL(/m=/);
    const frame = page.frameLocator("iframe[title^='HTML part']");
    await expect.poll(async () => (await frame.locator("body").textContent()) ?? "").toContain("invite");
    await screenshot(page, "hardening-mail-frame-under-csp");
    expect(violations).toEqual([]);
  });
});

describe("the sign-in limit per address", () => {
  it("counts the connection's address: 22 guesses with made-up X-Forwarded-For are limited after 20", async () => {
    const errors: Array<string | null> = [];
    for (let i = 0; i < 22; i++) {
      // A different unknown account each time, so only the per-address limit (20) can apply.
      const r = await signInOverHttp({ email: `nobody-${i}@guess.example`, password: "wrong password", from: "127.0.0.2", headers: { "x-forwarded-for": `198.51.100.${i}` } });
      errors.push(r.error);
    }
    expect(errors.slice(0, 20).every((e) => e?.startsWith("That e-mail and password"))).toBe(true);
    expect(errors[20]).toMatch(/^Too many failed attempts/);
    expect(errors[21]).toMatch(/^Too many failed attempts/);
    // Another connection address is not held to that one's failures.
    const other = await signInOverHttp({ email: "nobody@guess.example", password: "wrong password", from: "127.0.0.3" });
    expect(other.error).toMatch(/^That e-mail and password/);
  });
});

describe("sign-in and sign-out", () => {
  it.each(["http://[", "http://%%%"])("a malformed callbackUrl (%s) signs in and lands on the app, not a 500", async (callbackUrl) => {
    const r = await signInOverHttp({ email: "viewer@harbor-pantry.example", password: DEMO_PASSWORD, from: "127.0.0.4", callbackUrl });
    expect(r.status).toBeLessThan(500);
    expect(r.error).toBeNull();
    expect(new URL(r.url).origin).toBe(baseUrl());
    expect(r.session).not.toBeNull();
  });

  it("signing out ends the session on the server: a copy of the cookie stops working at once", async () => {
    const page = await signedInPage(browser(), "architect");
    const cookie = (await page.context().cookies()).find((c) => c.name === "next-auth.session-token")!;
    const copy = `${cookie.name}=${cookie.value}`;
    expect((await http("/api/v1/environments", { from: "127.0.0.5", headers: { cookie: copy } })).status).toBe(200);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/signin");
    expect((await http("/api/v1/environments", { from: "127.0.0.5", headers: { cookie: copy } })).status).toBe(401);
    await page.context().close();
  });
});

describe("health and the analysis worker", () => {
  it("GET /api/health answers without a sign-in, with the worker's heartbeat and the queue", async () => {
    const res = await http("/api/health", { from: "127.0.0.1" });
    expect(res.status).toBe(200);
    expect(JSON.parse(res.body)).toMatchObject({ status: "ok", database: { status: "ok" }, worker: { status: "ok" }, queue: { analysisQueued: expect.any(Number) } });
  });

  it("the overview says when no worker has been seen for a minute", async () => {
    const page = await signedInPage(browser(), "viewer");
    await expect.poll(() => page.getByTestId("stat-components").textContent()).toMatch(/\d/);
    expect(await page.getByTestId("worker-missing").count()).toBe(0);
    // The answer /api/health gives when the last worker reported 3 minutes ago (lib/data/health.ts).
    await page.route("**/api/health", (route) =>
      route.fulfill({
        json: { status: "degraded", app: { uptimeSeconds: 1, pid: 1 }, database: { status: "ok", latencyMs: 1 }, worker: { status: "missing", live: 0, lastSeenAt: new Date(Date.now() - 180_000).toISOString(), secondsSinceSeen: 180 }, queue: { analysisQueued: 2, analysisRunning: 0, oldestQueuedSeconds: 170, mailQueued: 0 } },
      }),
    );
    await page.reload();
    await expect.poll(() => page.getByTestId("worker-missing").textContent()).toContain("No analysis worker has been seen for 3 min");
    expect(await page.getByTestId("worker-missing").textContent()).toContain("2 waiting");
    await expect.poll(() => page.getByTestId("stat-components").textContent()).toMatch(/\d/);
    await screenshot(page, "hardening-overview-worker-missing");
    await page.context().close();
  });
});


