// A pre-parse guard against pathological nesting. Not a parser: it skips quoted strings and
// comments closely enough that a real inventory never trips it, and a nesting attack
// (millions of "[" in a few MB) is refused in one linear pass instead of a parse that takes
// seconds and ends in a stack overflow.
import { MAX_NESTING_DEPTH } from "@/lib/inventory/limits";

/** Offset of the first opener beyond `max` levels, or null. */
export function findExcessiveNesting(text: string, max: number = MAX_NESTING_DEPTH): number | null {
  let depth = 0;
  let atLineStart = true;
  let dashes = 0;
  const n = text.length;
  for (let i = 0; i < n; i++) {
    const ch = text[i];
    if (ch === "\n") {
      atLineStart = true;
      dashes = 0;
      continue;
    }
    if (atLineStart) {
      if (ch === " " || ch === "\t") continue;
      // Compact block sequences nest one level per "- " on a line.
      if (ch === "-" && (text[i + 1] === " " || text[i + 1] === "\t")) {
        dashes += 1;
        if (dashes > max) return i;
        i += 1;
        continue;
      }
      atLineStart = false;
    }
    const prev = i === 0 ? "\n" : text[i - 1];
    const tokenStart = prev === " " || prev === "\t" || prev === "\n" || prev === "[" || prev === "{" || prev === "," || prev === ":";
    if (ch === "[" || ch === "{") {
      depth += 1;
      if (depth > max) return i;
    } else if (ch === "]" || ch === "}") {
      depth = Math.max(0, depth - 1);
    } else if (ch === '"' && tokenStart) {
      // Double-quoted (YAML or JSON): skip to the closing quote, honouring backslash escapes.
      let j = i + 1;
      while (j < n && text[j] !== '"') j += text[j] === "\\" ? 2 : 1;
      i = j;
    } else if (ch === "'" && tokenStart) {
      // Single-quoted YAML scalar: '' is an escaped quote.
      let j = i + 1;
      while (j < n && !(text[j] === "'" && text[j + 1] !== "'")) j += text[j] === "'" ? 2 : 1;
      i = j;
    } else if (ch === "#" && tokenStart) {
      const nl = text.indexOf("\n", i);
      i = nl === -1 ? n : nl - 1;
    }
  }
  return null;
}
