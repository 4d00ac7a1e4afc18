// Positions in a `yaml` Document: from a value's path to where it (or its member name) starts.
import { type Document, isAlias, isMap, isScalar, isSeq, LineCounter, type Node, parseDocument, type YAMLMap } from "yaml";
import type { Position, StructuredSource } from "./source";
import type { PathSegment } from "./text";

export function keyName(key: unknown): string {
  return isScalar(key) ? String(key.value) : "?";
}

export class Locator {
  constructor(
    private readonly doc: Document,
    private readonly lineCounter: LineCounter,
    private readonly anchors: Map<Node, Node>,
  ) {}

  locate(path: readonly PathSegment[], opts?: { key?: boolean }): Position {
    let node: unknown = this.doc.contents;
    let keyNode: unknown;
    let best: unknown = node;
    for (const [i, seg] of path.entries()) {
      node = this.deref(node);
      keyNode = undefined;
      if (isMap(node)) {
        const pair = this.findPair(node, String(seg), 0);
        if (!pair) break;
        keyNode = pair.key;
        node = pair.value;
      } else if (isSeq(node) && typeof seg === "number") {
        node = node.items[seg];
        if (node === undefined) break;
      } else {
        break;
      }
      best = opts?.key && i === path.length - 1 && keyNode !== undefined ? keyNode : (node ?? keyNode);
    }
    const range = (best as Node | null | undefined)?.range;
    if (!range) return {};
    const p = this.lineCounter.linePos(range[0]);
    return { line: p.line, column: p.col };
  }

  private deref(node: unknown): unknown {
    if (!isAlias(node)) return node;
    return this.anchors.get(node) ?? node.resolve(this.doc);
  }

  // Looks in the mapping itself, then in mappings merged into it with `<<`.
  private findPair(map: YAMLMap, name: string, depth: number): { key: unknown; value: unknown } | undefined {
    const direct = map.items.find((p) => isScalar(p.key) && String(p.key.value) === name);
    if (direct || depth > 8) return direct;
    for (const p of map.items) {
      if (!isScalar(p.key) || p.key.value !== "<<") continue;
      const sources = isSeq(p.value) ? p.value.items : [p.value];
      for (const s of sources) {
        const target = this.deref(s);
        if (isMap(target)) {
          const found = this.findPair(target, name, depth + 1);
          if (found) return found;
        }
      }
    }
    return undefined;
  }
}

/** Positions worked out with the `yaml` parser only when an issue first asks for one. */
export function lazyLocate(text: string): StructuredSource["locate"] {
  let locator: Locator | undefined;
  return (path, o) => {
    if (!locator) {
      const lineCounter = new LineCounter();
      const doc = parseDocument(text, { lineCounter, uniqueKeys: false, prettyErrors: false });
      locator = new Locator(doc, lineCounter, new Map());
    }
    return locator.locate(path, o);
  };
}
