// The response headers of every page and API answer. Directive names and values are those of
// Content Security Policy Level 3 (W3C: script-src nonces and 'strict-dynamic', worker-src,
// frame-ancestors), RFC 6797 (Strict-Transport-Security, only over a secure transport, §7.2), and
// the Fetch Standard's X-Content-Type-Options: nosniff.
import { describe, expect, it } from "vitest";
import type { NextConfig } from "next";
import { API_CONTENT_SECURITY_POLICY, FIXED_SECURITY_HEADERS, pageContentSecurityPolicy, strictTransportSecurity } from "@/lib/security-headers";

const directives = (policy: string) => new Map(policy.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name!, values]));

describe("page policy", () => {
  const csp = directives(pageContentSecurityPolicy({ nonce: "abc123", dev: false }));

  it("runs only scripts with the request's nonce (and what they load), never eval in production", () => {
    expect(csp.get("script-src")).toEqual(["'self'", "'nonce-abc123'", "'strict-dynamic'"]);
    expect(pageContentSecurityPolicy({ nonce: "x", dev: true })).toContain("'unsafe-eval'");
  });

  it("lets no one frame a page, embeds no plugin, and posts forms only to itself", () => {
    expect(csp.get("frame-ancestors")).toEqual(["'none'"]);
    expect(csp.get("object-src")).toEqual(["'none'"]);
    expect(csp.get("form-action")).toEqual(["'self'"]);
    expect(csp.get("base-uri")).toEqual(["'none'"]);
  });

  it("allows the map's layout worker from our own origin", () => {
    expect(csp.get("worker-src")).toContain("'self'");
  });
});

describe("fixed headers", () => {
  it("next.config.mjs sends the same list lib/security-headers.ts names, on every path, and the API policy on /api", async () => {
    // @ts-expect-error -- plain JavaScript config without a declaration file
    const { default: nextConfig } = (await import("@/next.config.mjs")) as { default: NextConfig };
    const rules = (await nextConfig.headers!()) as Array<{ source: string; headers: Array<{ key: string; value: string }> }>;
    expect(rules.find((r) => r.source === "/:path*")?.headers).toEqual(FIXED_SECURITY_HEADERS);
    expect(rules.find((r) => r.source === "/api/:path*")?.headers).toEqual([{ key: "Content-Security-Policy", value: API_CONTENT_SECURITY_POLICY }]);
    expect(FIXED_SECURITY_HEADERS).toContainEqual({ key: "X-Content-Type-Options", value: "nosniff" });
    expect(FIXED_SECURITY_HEADERS.map((h) => h.key)).toContain("Referrer-Policy");
  });

  it("Strict-Transport-Security only when the public address is https", () => {
    expect(strictTransportSecurity("https://pinchpoint.harbor-pantry.example")).toBe("max-age=31536000");
    expect(strictTransportSecurity("http://127.0.0.1:3000")).toBeNull();
    expect(strictTransportSecurity("not a url")).toBeNull();
  });
});
