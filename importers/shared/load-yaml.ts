// YAML: a fast js-yaml read for plain files, the located `yaml` parser for the rest and for errors,
// with alias expansion measured before anything is expanded.
import { type Document, isAlias, isMap, isPair, isSeq, LineCounter, type Node, parseDocument } from "yaml";
import { CORE_SCHEMA as FAST_YAML_SCHEMA, load as fastYamlLoad } from "js-yaml";
import { MAX_NESTING_DEPTH, MAX_YAML_ALIAS_COUNT, MAX_YAML_ALIAS_EXPANSION } from "@/lib/inventory/limits";
import { fastLocator } from "./fast-locate";
import { type CountLimit, isRecord, type Loaded, type Position, type StructuredSource, tooMany } from "./source";
import { formatPath, lineIndex, type PathSegment } from "./text";
import { keyName, lazyLocate, Locator } from "./yaml-locator";

/**
 * The `yaml` package keeps positions but takes seconds on a 20,000-component file; js-yaml
 * parses the same file in a few hundred milliseconds. A file without anchors, aliases, merge keys
 * or tags (where the two could disagree, and where our alias limits apply) is read with js-yaml
 * first, and positions are only worked out with `yaml` when an issue needs one. Anything js-yaml
 * refuses (a syntax error, a duplicate key) goes down the full, located path.
 */
function loadYamlFast(text: string, limit: CountLimit | undefined): Loaded | null {
  if (/[&*!]|<</.test(text)) return null;
  let value: unknown;
  try {
    value = fastYamlLoad(text, { schema: FAST_YAML_SCHEMA, json: false });
  } catch {
    return null;
  }
  if (limit !== undefined && isRecord(value)) {
    const coll = value[limit.key];
    const size = Array.isArray(coll) ? coll.length : isRecord(coll) ? Object.keys(coll).length : 0;
    // Refused here: handing an over-limit file on to the slow, located parser cost tens of seconds.
    if (size > limit.max) {
      const at = new RegExp(`^${limit.key}\\s*:`, "m").exec(text);
      return { ok: false, status: 413, issues: [tooMany(limit, size, at ? lineIndex(text)(at.index) : {})] };
    }
  }
  // Block-style positions from the indentation index; anything it cannot answer goes to the full parser.
  const fast = fastLocator(text);
  const full = lazyLocate(text);
  const locate: StructuredSource["locate"] = (path, o) => fast(path, o) ?? full(path, o);
  return { ok: true, source: { value, warnings: [], locate } };
}

export function loadYaml(text: string, limit: CountLimit | undefined, markTags: readonly string[]): Loaded {
  // loadYamlFast refuses any text with a `!`, so tagged files always take the full path below.
  const fast = loadYamlFast(text, limit);
  if (fast) return fast;
  const lineCounter = new LineCounter();
  // merge: `<<: *base` is common in hand-written YAML (Compose files especially).
  const doc = parseDocument(text, { lineCounter, uniqueKeys: true, merge: true, prettyErrors: false });
  const posOf = (offset: number): Position => {
    const p = lineCounter.linePos(offset);
    return { line: p.line, column: p.col };
  };
  if (doc.errors.length > 0) {
    return {
      ok: false,
      status: 422,
      issues: doc.errors.map((e) => ({
        path: formatPath(pathAtOffset(doc, e.pos[0])),
        ...posOf(e.pos[0]),
        message: yamlMessage(e.code, e.message),
      })),
    };
  }
  const tagged = markTags.length > 0 ? findTagged(doc.contents, markTags) : [];
  const warnings = doc.warnings
    .filter((w) => !(w.code === "TAG_RESOLVE_FAILED" && markTags.some((t) => w.message.includes(`tag: ${t} `) || w.message.endsWith(`tag: ${t}`))))
    .map((w) => ({
      path: formatPath(pathAtOffset(doc, w.pos[0])),
      ...posOf(w.pos[0]),
      message: w.message.split("\n")[0] ?? w.message,
    }));

  const anchors = new Map<Node, Node>();
  const locator = new Locator(doc, lineCounter, anchors);
  if (limit !== undefined && isMap(doc.contents)) {
    const coll = doc.contents.get(limit.key, true);
    const size = isSeq(coll) || isMap(coll) ? coll.items.length : 0;
    if (size > limit.max) return { ok: false, status: 413, issues: [tooMany(limit, size, locator.locate([limit.key]))] };
  }

  const expansion = measureAliases(doc, anchors);
  if (expansion !== null) {
    const at = expansion.node.range ? posOf(expansion.node.range[0]) : {};
    const path = formatPath(pathAtOffset(doc, expansion.node.range?.[0] ?? 0));
    return { ok: false, status: expansion.status, issues: [{ path, ...at, message: expansion.message }] };
  }

  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_YAML_ALIAS_COUNT });
  } catch (err) {
    // measureAliases should have caught alias trouble already; this is the package's own guard.
    const message = err instanceof Error ? err.message : String(err);
    return { ok: false, status: 413, issues: [{ path: "", line: 1, column: 1, message: `YAML could not be expanded: ${message}` }] };
  }
  return { ok: true, source: { value, warnings, tagged, locate: (p, o) => locator.locate(p, o) } };
}

function findTagged(root: unknown, tags: readonly string[]): { path: PathSegment[]; tag: string }[] {
  const out: { path: PathSegment[]; tag: string }[] = [];
  const walk = (node: unknown, path: PathSegment[], depth: number): void => {
    if (depth > MAX_NESTING_DEPTH + 2 || node === null || typeof node !== "object") return;
    const tag = (node as Node).tag;
    if (tag !== undefined && tags.includes(tag)) out.push({ path, tag });
    if (isMap(node)) {
      for (const pair of node.items) walk(pair.value, [...path, keyName(pair.key)], depth + 1);
    } else if (isSeq(node)) {
      node.items.forEach((item, i) => walk(item, [...path, i], depth + 1));
    }
  };
  walk(root, [], 0);
  return out;
}

function yamlMessage(code: string, message: string): string {
  const first = (message.split("\n")[0] ?? message).replace(/ at line \d+, column \d+:?$/, "");
  if (code === "DUPLICATE_KEY") return "duplicate mapping key: the same name appears twice in one mapping";
  if (/call stack/i.test(first)) return "the document is nested too deeply";
  return `invalid YAML: ${first}`;
}

interface AliasTrouble {
  node: Node;
  status: 413 | 422;
  message: string;
}

/**
 * Counts the nodes aliases would expand to, in document order (an alias refers to the last
 * anchor of its name before it), and records alias → anchored node for the locator.
 * Stops at the first alias that is unresolved, circular or pushes the total past the cap.
 */
function measureAliases(doc: Document, anchors: Map<Node, Node>): AliasTrouble | null {
  const byName = new Map<string, Node>();
  const sizes = new Map<Node, number>();
  const inProgress = new Set<Node>();
  let expanded = 0;
  let trouble: AliasTrouble | null = null;

  const size = (node: unknown): number => {
    if (trouble !== null || node === null || node === undefined) return 0;
    if (isAlias(node)) {
      const target = byName.get(node.source);
      if (target === undefined) {
        trouble = { node, status: 422, message: `alias *${node.source} has no anchor &${node.source} before it` };
        return 0;
      }
      anchors.set(node, target);
      if (inProgress.has(target)) {
        trouble = { node, status: 422, message: `alias *${node.source} refers to a node that contains it` };
        return 0;
      }
      const n = sizes.get(target) ?? 0;
      expanded += n;
      if (expanded > MAX_YAML_ALIAS_EXPANSION) {
        trouble = {
          node,
          status: 413,
          message: `YAML aliases expand to more than ${MAX_YAML_ALIAS_EXPANSION} nodes (an alias bomb?); write the values out or use defaults`,
        };
      }
      return n;
    }
    const n = node as Node;
    if (n.anchor) {
      byName.set(n.anchor, n);
      inProgress.add(n);
    }
    let total = 1;
    if (isMap(node)) {
      for (const pair of node.items) total += size(pair.key) + size(pair.value);
    } else if (isSeq(node)) {
      for (const item of node.items) total += isPair(item) ? size(item.key) + size(item.value) : size(item);
    }
    if (n.anchor) {
      inProgress.delete(n);
      sizes.set(n, total);
    }
    return total;
  };

  try {
    size(doc.contents);
  } catch (err) {
    if (err instanceof RangeError) {
      return { node: doc.contents as Node, status: 422, message: "the document is nested too deeply" };
    }
    throw err;
  }
  return trouble;
}

/** The path of the innermost node at `offset`, for parser errors. */
function pathAtOffset(doc: Document, offset: number): PathSegment[] {
  const path: PathSegment[] = [];
  let node: unknown = doc.contents;
  const within = (n: unknown): boolean => {
    const r = (n as Node | null)?.range;
    return r !== undefined && r !== null && r[0] <= offset && offset < Math.max(r[2], r[0] + 1);
  };
  for (let depth = 0; depth < 1_000; depth++) {
    if (isMap(node)) {
      const pair = node.items.find((p) => within(p.key) || within(p.value));
      if (!pair) break;
      path.push(keyName(pair.key));
      if (within(pair.key)) break;
      node = pair.value;
    } else if (isSeq(node)) {
      const index = node.items.findIndex((item) => within(item));
      if (index < 0) break;
      path.push(index);
      node = node.items[index];
    } else {
      break;
    }
  }
  return path;
}
