// The one way a located issue names where it is: `components[3].needs[1].key`, `body.scopes[0]`,
// `rules["odd key"].k`. Written by the importers and the API's error answers, read back by the
// screens to put a server's issue beside the field it is about. Pure.

export type PathSegment = string | number;

const IDENTIFIER = /^[A-Za-z_$][\w$-]*$/;

/** `["components", 3, "needs", 1, "key"]` → `components[3].needs[1].key`; `prefix` goes first (`body`, `query`). */
export function formatPath(path: readonly PropertyKey[], prefix = ""): string {
  let out = prefix;
  for (const seg of path) {
    if (typeof seg === "number") out += `[${seg}]`;
    else if (typeof seg === "string" && IDENTIFIER.test(seg)) out += out === "" ? seg : `.${seg}`;
    else out += `[${JSON.stringify(String(seg))}]`;
  }
  return out;
}

/** The inverse of formatPath: `body.scopes[0]` → `["body", "scopes", 0]`; null when the text is not a path. */
export function parsePath(text: string): PathSegment[] | null {
  const out: PathSegment[] = [];
  let i = 0;
  while (i < text.length) {
    if (text[i] === "[") {
      if (text[i + 1] === '"') {
        // A quoted key: find its closing quote, stepping over escapes (the key may hold "]").
        let j = i + 2;
        while (j < text.length && text[j] !== '"') j += text[j] === "\\" ? 2 : 1;
        if (text[j + 1] !== "]") return null;
        try {
          out.push(JSON.parse(text.slice(i + 1, j + 1)) as string);
        } catch {
          return null;
        }
        i = j + 2;
        continue;
      }
      const close = text.indexOf("]", i);
      const inside = close < 0 ? "" : text.slice(i + 1, close);
      if (!/^\d+$/.test(inside)) return null;
      out.push(Number(inside));
      i = close + 1;
      continue;
    }
    if (text[i] === ".") i++;
    const m = /^[A-Za-z_$][\w$-]*/.exec(text.slice(i));
    if (!m) return null;
    out.push(m[0]);
    i += m[0].length;
  }
  return out;
}
