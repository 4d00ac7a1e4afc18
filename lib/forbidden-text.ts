// Characters no text field of ours may hold, wherever it comes from (an inventory file, a JSON body,
// a query string): control characters other than tab, line feed and carriage return (C0, DEL and
// C1: the Unicode general category Cc), and lone surrogates. PostgreSQL refuses NUL in text and
// jsonb ("\u0000 cannot be converted to text"), which surfaced as a 500; a lone surrogate cannot be
// encoded as UTF-8 and was stored silently replaced by U+FFFD. Both are refused up front with the
// field's path, raw or escaped alike (`"a\0b"` in YAML, `"\u0000"` in JSON are the same string).

// eslint-disable-next-line no-control-regex -- matching control characters is the point here
const FORBIDDEN = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

const NAMES: Record<number, string> = { 0x00: "NUL", 0x07: "BEL", 0x08: "backspace", 0x0b: "vertical tab", 0x0c: "form feed", 0x1b: "escape", 0x7f: "DEL", 0x85: "next line" };

const hex = (code: number) => `U+${code.toString(16).toUpperCase().padStart(4, "0")}`;

/** What is wrong with this string, or null when nothing is. */
export function forbiddenCharacter(text: string): string | null {
  const found = FORBIDDEN.exec(text);
  if (!found) return null;
  const code = found[0].charCodeAt(0);
  const where = text.length > 1 ? ` at character ${found.index + 1}` : "";
  if (code >= 0xd800 && code <= 0xdfff) return `lone surrogate ${hex(code)}${where}: half of a UTF-16 pair is not a character; send the whole character or remove it`;
  const name = NAMES[code] ? ` (${NAMES[code]})` : "";
  return `control character ${hex(code)}${name}${where}: only tab, line feed and carriage return are allowed in text`;
}

export type TextPath = Array<string | number>;

/**
 * Every string in a parsed JSON or YAML value, member names included, checked; returns the first
 * `limit` problems with their paths (a member name's problem is reported at its own path).
 */
export function findForbiddenText(value: unknown, limit = 20): Array<{ path: TextPath; message: string }> {
  const out: Array<{ path: TextPath; message: string }> = [];
  const seen = new Set<object>();
  const walk = (v: unknown, path: TextPath): void => {
    if (out.length >= limit) return;
    if (typeof v === "string") {
      const problem = forbiddenCharacter(v);
      if (problem) out.push({ path, message: problem });
      return;
    }
    if (typeof v !== "object" || v === null || seen.has(v)) return;
    // YAML aliases hand out the same object more than once: one look is enough.
    seen.add(v);
    if (Array.isArray(v)) {
      v.forEach((item, i) => walk(item, [...path, i]));
      return;
    }
    for (const [k, item] of Object.entries(v)) {
      const problem = forbiddenCharacter(k);
      if (problem) out.push({ path: [...path, k], message: `the name of this field: ${problem}` });
      walk(item, [...path, k]);
    }
  };
  walk(value, []);
  return out;
}
