// CSV export: RFC 4180 quoting (§2.5–2.7: fields with commas, quotes or line breaks are quoted, quotes
// doubled) and formula-injection guarding as OWASP's "CSV Injection" page recommends (common practice):
// a text cell a spreadsheet would evaluate gets a leading apostrophe, even behind white space, a
// leading line break, or in full-width form.
import { describe, expect, it } from "vitest";
import { csvField } from "@/lib/export/rankings-csv";

describe("csvField", () => {
  it.each([
    ["=HYPERLINK(\"http://x\")", "\"'=HYPERLINK(\"\"http://x\"\")\""],
    ["+1+1", "\"'+1+1\""],
    ["-2+3", "\"'-2+3\""],
    ["@SUM(A1)", "\"'@SUM(A1)\""],
    ["  =1+1", "\"'  =1+1\""],
    ["\n=1+1", "\"'\n=1+1\""],
    ["\t=1", "\"'\t=1\""],
    ["\u00a0=1", "\"'\u00a0=1\""],
    ["＝1+1", "\"'＝1+1\""],
    ["＋1", "\"'＋1\""],
    ["\r1", "\"'\r1\""],
  ])("guards %j", (input, expected) => {
    expect(csvField(input)).toBe(expected);
  });

  it("leaves plain text, numbers and booleans alone, quoting only what RFC 4180 needs", () => {
    expect(csvField("checkout-web")).toBe("checkout-web");
    expect(csvField("a, b")).toBe('"a, b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("line\nbreak")).toBe('"line\nbreak"');
    expect(csvField(-0.5)).toBe("-0.5");
    expect(csvField(true)).toBe("true");
    expect(csvField(null)).toBe("");
    expect(csvField("a=b")).toBe("a=b");
  });
});
