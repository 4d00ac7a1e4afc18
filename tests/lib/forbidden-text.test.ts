// The characters no text field may hold. Sources: The Unicode Standard, General Category Cc
// (U+0000–U+001F and U+007F–U+009F are the control characters); §3.8 Surrogates (U+D800–U+DBFF high,
// U+DC00–U+DFFF low, meaningful only as a high-low pair); PostgreSQL manual, §8.14 JSON Types
// ("\u0000 is disallowed" in jsonb) and §23.3 (NUL cannot be stored in text).
import { describe, expect, it } from "vitest";
import { findForbiddenText, forbiddenCharacter } from "@/lib/forbidden-text";

describe("forbiddenCharacter", () => {
  it.each([
    ["a\u0000b", /U\+0000 \(NUL\) at character 2/],
    ["\u0000", /U\+0000 \(NUL\)/],
    ["\u001b[31mred", /U\+001B \(escape\)/],
    ["\u007f", /U\+007F \(DEL\)/],
    ["next\u0085line", /U\+0085/],
    ["\ud800", /lone surrogate U\+D800/],
    ["x\udc00", /lone surrogate U\+DC00 at character 2/],
    ["\udc00\ud800", /lone surrogate U\+DC00/],
  ])("refuses %j", (text, message) => {
    expect(forbiddenCharacter(text)).toMatch(message);
  });

  it.each(["plain", "tab\there", "two\nlines\r\n", "Zürich café", "emoji 😀 (a surrogate pair)", "\ud83d\ude00", ""])("allows %j", (text) => {
    expect(forbiddenCharacter(text)).toBeNull();
  });
});

describe("findForbiddenText", () => {
  it("names the path of every bad value and member name, once per shared object", () => {
    const shared = { note: "x\u0000" };
    expect(findForbiddenText({ components: [{ key: "a", name: "b\ud800" }, shared, shared], ["bad\u0001key"]: 1 })).toEqual([
      { path: ["components", 0, "name"], message: expect.stringContaining("U+D800") },
      { path: ["components", 1, "note"], message: expect.stringContaining("U+0000") },
      { path: ["bad\u0001key"], message: expect.stringMatching(/^the name of this field: control character U\+0001/) },
    ]);
  });
});
