// Control characters and lone surrogates in files, raw or escaped, are one located 422, never a
// value stored (or a database error later). Escapes: YAML 1.2.2 §5.7 Escaped Characters ("\0",
// "\x00", "\u0000"); JSON, RFC 8259 §7 ("\u0000", and a lone "\uD800" is grammatical but not a
// character). Rule sources in tests/lib/forbidden-text.test.ts.
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";

const yaml = (name: string) => `pinchpoint: 1\nsource: s\ncomponents:\n  - key: a\n    kind: service\n    name: ${name}\n`;
const push = (body: string, format: "pinchpoint" | "compose" = "pinchpoint", contentType?: string) =>
  importInventory({ format, body, contentType, source: format === "compose" ? "s" : undefined });

describe("escaped control characters and lone surrogates", () => {
  it.each([
    ['"a\\0b"', "U+0000"],
    ['"\\x00"', "U+0000"],
    ['"\\u0000"', "U+0000"],
    ['"\\ud800"', "U+D800"],
    ['"bell\\a"', "U+0007"],
    ['"\\N"', "U+0085"],
  ])("YAML name %s is a 422 at components[0].name, line 6", (value, code) => {
    const r = push(yaml(value));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(422);
    expect(r.issues).toEqual([expect.objectContaining({ path: "components[0].name", line: 6, message: expect.stringContaining(code) })]);
  });

  it.each([
    ['"a\\u0000b"', "U+0000"],
    ['"\\ud800"', "U+D800"],
    ['"\\udfff x"', "U+DFFF"],
  ])("JSON name %s is a 422 at components[0].name", (value, code) => {
    const body = `{"pinchpoint": 1, "source": "s", "components": [{"key": "a", "kind": "service", "name": ${value}}]}`;
    const r = push(body, "pinchpoint", "application/json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(422);
    expect(r.issues).toEqual([expect.objectContaining({ path: "components[0].name", line: 1, message: expect.stringContaining(code) })]);
  });

  it("a raw NUL is refused too (before parsing, located)", () => {
    const r = push(yaml("a\u0000b"));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.status).toBe(422);
    expect(r.issues[0]).toMatchObject({ line: 6, message: expect.stringContaining("U+0000") });
  });

  it("a member name with an escaped control character is named too", () => {
    const r = push(`pinchpoint: 1\nsource: s\ncomponents:\n  - key: a\n    kind: service\n    links: { "run\\u0000book": "https://x.example" }\n`);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.some((i) => i.message.startsWith("the name of this field"))).toBe(true);
  });

  it("a Compose file is held to the same rule", () => {
    const r = push('services:\n  web:\n    image: "x\\0y"\n', "compose");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues[0]).toMatchObject({ path: "services.web.image", line: 3, message: expect.stringContaining("U+0000") });
  });

  it("tabs, line breaks, accents and whole emoji stay allowed", () => {
    const r = push(yaml('"caf\\u00e9\\ttab 😀 \\ud83d\\ude00"'));
    expect(r.ok).toBe(true);
  });
});
