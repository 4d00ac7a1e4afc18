// After sign-in only paths on this site are followed (WHATWG URL parsing: a backslash is a slash).
import { describe, expect, it } from "vitest";
import { sameOriginPath } from "@/lib/auth/callback";

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
