// After sign-in only paths on this site are followed (WHATWG URL parsing: a backslash is a slash).
import { describe, expect, it } from "vitest";
import { safeRedirect, sameOriginPath } from "@/lib/auth/callback";

describe("sameOriginPath", () => {
  it.each([
    ["/environments/production/map?focus=dns-resolver", "/environments/production/map?focus=dns-resolver"],
    [undefined, "/"],
    ["", "/"],
    ["//evil.example/x", "/"],
    ["/\\evil.example", "/"],
    ["https://evil.example/", "/"],
    ["javascript:alert(1)", "/"],
    ["teams", "/teams"],
  ])("%s → %s", (input, expected) => {
    expect(sameOriginPath(input)).toBe(expected);
  });
});

describe("safeRedirect (next-auth's redirect callback)", () => {
  const baseUrl = "http://127.0.0.1:3000";
  it.each([
    ["/environments/production", "http://127.0.0.1:3000/environments/production"],
    ["http://127.0.0.1:3000/teams", "http://127.0.0.1:3000/teams"],
    ["https://evil.example/", "http://127.0.0.1:3000/"],
    ["//evil.example/x", "http://127.0.0.1:3000/"],
    // Malformed: the host of "http://[" is an unclosed IPv6 literal (WHATWG URL, host parsing).
    ["http://[", "http://127.0.0.1:3000"],
    ["http://%%%", "http://127.0.0.1:3000"],
  ])("%s → %s, never a thrown error", (url, expected) => {
    expect(safeRedirect({ url, baseUrl })).toBe(expected);
  });
});
