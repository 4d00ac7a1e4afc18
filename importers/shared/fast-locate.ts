// Positions in block-style YAML found from indentation alone, for the files js-yaml reads on the
// fast path (no anchors, aliases, tags or merge keys; see structured.ts). The `yaml` package gives
// every position but takes most of a second on a 3,000-service Compose file, and an importer that
// infers needs asks for thousands of positions on every push. This index answers the common shapes
// (block mappings, block sequences, scalars on the key's line) and says "don't know" (null) for
// anything else — flow collections, complex keys, a key with no value — so the caller falls back to
// the full parser. tests/importers/fast-locate.test.ts checks it against the full parser on every
// path of every YAML fixture and example.
import type { Position } from "./structured";
import type { PathSegment } from "./text";

interface Line {
  /** Column (0-based) where the line's content starts. */
  indent: number;
  /** A `- ` sequence item starts here: the column of the dash. */
  dash: number | null;
  /** A mapping key on this line (after the dash, if any). */
  key: string | null;
  keyCol: number;
  /** Where the value starts on the same line; null when the value is on the following lines. */
  valCol: number | null;
  /** Column where the item's content starts (after `- `), when the line is an item. */
  itemCol: number | null;
}

const KEY = /^(?:"([^"\\]*)"|'([^']*)'|([^\s#'"{[\]},&*!|>%@`?-][^:#]*?|-[^\s:#][^:#]*?))[ \t]*:(?:[ \t]+|$)/;

function scan(text: string): (Line | null)[] {
  return text.split("\n").map((raw) => {
    const lineText = raw.endsWith("\r") ? raw.slice(0, -1) : raw;
    let i = 0;
    while (lineText[i] === " ") i++;
    const rest = lineText.slice(i);
    if (rest === "" || rest.startsWith("#")) return null;
    if (i === 0 && (rest.startsWith("---") || rest.startsWith("...") || rest.startsWith("%"))) return null;
    const line: Line = { indent: i, dash: null, key: null, keyCol: i, valCol: null, itemCol: null };
    let col = i;
    let content = rest;
    if (content === "-" || content.startsWith("- ")) {
      line.dash = col;
      let j = 1;
      while (content[j] === " ") j++;
      if (j >= content.length || content[j] === "#") return line;
      col += j;
      content = content.slice(j);
      line.itemCol = col;
      if (content.startsWith("- ")) return { ...line, key: "\u0000nested-seq" };
    }
    const m = KEY.exec(content);
    if (m) {
      line.key = m[1] ?? m[2] ?? (m[3] ?? "").trimEnd();
      line.keyCol = col;
      const after = col + m[0].length;
      const value = lineText.slice(after);
      line.valCol = value === "" || value.startsWith("#") ? null : after;
    }
    return line;
  });
}

/** Each mapping's keys and each sequence's items, found once per container (a push asks thousands of times). */
interface Cache {
  keys: Map<number, Map<string, number> | null>;
  items: Map<number, number[]>;
  /** Where the entry or item starting on a line ends. */
  ends: Map<number, number>;
}

export function fastLocator(text: string): (path: readonly PathSegment[], opts?: { key?: boolean }) => Position | null {
  let lines: (Line | null)[] | undefined;
  const cache: Cache = { keys: new Map(), items: new Map(), ends: new Map() };
  return (path, opts) => {
    lines ??= scan(text);
    return locate(lines, path, opts?.key === true, cache);
  };
}

const pos = (line: number, col: number): Position => ({ line: line + 1, column: col + 1 });

function locate(lines: (Line | null)[], path: readonly PathSegment[], wantKey: boolean, cache: Cache): Position | null {
  let lo = 0;
  let hi = lines.length;
  // When descending into a sequence item whose first line also holds a key (`- name: x`), that
  // line's key belongs to the item's mapping.
  let itemLine: number | null = null;
  let result: Position | null = null;
  for (let s = 0; s < path.length; s++) {
    const seg = path[s];
    const last = s === path.length - 1;
    const first = firstStructural(lines, lo, hi);
    if (first === -1) return null;
    const head = lines[first] as Line;
    if (typeof seg === "number") {
      if (head.dash === null || first === itemLine) return null;
      const d = head.dash;
      let items = cache.items.get(first);
      if (!items) {
        items = [];
        for (let i = first; i < hi; i++) {
          const l = lines[i];
          if (!l || l.indent > d) continue;
          if (l.indent < d || l.dash !== d) break;
          items.push(i);
        }
        cache.items.set(first, items);
      }
      const at = items[seg] ?? -1;
      if (at === -1) return null;
      const l = lines[at] as Line;
      let end = cache.ends.get(at);
      if (end === undefined) {
        end = at + 1;
        while (end < hi && !(lines[end] && (lines[end] as Line).indent <= d)) end++;
        cache.ends.set(at, end);
      }
      if (l.itemCol !== null) {
        if (l.key === "\u0000nested-seq") return null;
        result = pos(at, l.itemCol);
        // A scalar or flow value after the dash: nothing to descend into.
        if (l.key === null && !last) return null;
        lo = at;
        hi = end;
        itemLine = at;
      } else {
        const next = firstStructural(lines, at + 1, end);
        if (next === -1) return null;
        const nl = lines[next] as Line;
        result = pos(next, nl.dash ?? nl.keyCol);
        lo = at + 1;
        hi = end;
        itemLine = null;
      }
      continue;
    }
    // A mapping: its keys sit at the first line's key column.
    if (head.key === null || (head.dash !== null && first !== itemLine)) return null;
    const childCol = head.keyCol;
    let keys = cache.keys.get(first);
    if (keys === undefined) {
      keys = new Map<string, number>();
      for (let i: number = first; i < hi; i++) {
        const l = lines[i];
        if (!l) continue;
        const col = i === itemLine ? l.keyCol : l.indent;
        if (col < childCol) break;
        if (col > childCol) continue;
        // A sequence written at its key's own column (`key:\n- a`) belongs to that key.
        if (l.dash !== null && i !== itemLine) continue;
        if (l.key === null) {
          keys = null;
          break;
        }
        if (!keys.has(l.key)) keys.set(l.key, i);
      }
      cache.keys.set(first, keys);
    }
    if (keys === null) return null;
    const at = keys.get(String(seg)) ?? -1;
    if (at === -1) return null;
    const l = lines[at] as Line;
    // An item's first line is both the item and its first key: keep their ends apart.
    const endKey = at === itemLine ? -1 - at : at;
    let end = cache.ends.get(endKey);
    if (end === undefined) {
      end = at + 1;
      for (; end < hi; end++) {
        const e = lines[end];
        if (e && (e.indent < childCol || (e.indent === childCol && e.dash === null))) break;
      }
      cache.ends.set(endKey, end);
    }
    if (wantKey && last) return pos(at, l.keyCol);
    if (l.valCol !== null) {
      if (!last) return null;
      result = pos(at, l.valCol);
      continue;
    }
    const next = firstStructural(lines, at + 1, end);
    if (next === -1) return null;
    const nl = lines[next] as Line;
    result = pos(next, nl.dash ?? nl.keyCol);
    lo = at + 1;
    hi = end;
    itemLine = null;
  }
  return result;
}

function firstStructural(lines: (Line | null)[], lo: number, hi: number): number {
  for (let i = lo; i < hi; i++) if (lines[i]) return i;
  return -1;
}
