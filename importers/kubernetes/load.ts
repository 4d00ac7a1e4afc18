// Kubernetes manifests → plain objects, each with a way back to its line and column.
//
// What a push may be: multi-document YAML (`---` between objects, as hand-written and
// chart-rendered manifests are), one JSON or YAML document, a `kind: List` / `*List` object whose
// `items` are the objects (what `kubectl get -o yaml|json` writes), or a JSON array of objects.
//
// Why js-yaml with its node listener and not the shared loader: a cluster dump is one document of
// megabytes, and the `yaml` package takes seconds to parse it with positions (3.2 s for 1.8 MB
// here), while inferred needs must always carry their position. js-yaml reads the same text in
// about 0.4 s, and its listener reports where every node opens, so each object gets its offset.
// Aliases: js-yaml hands an aliased node out by reference, so the listener sees it close again;
// each time, the nodes under it count towards MAX_YAML_ALIAS_EXPANSION (413 past it), the same
// guard as the shared loader's, so a billion-laughs file is refused while it is read.
//
// Secrets: only their keys are kept. `data` and `stringData` are replaced by the list of their
// keys the moment the text is parsed, and the `kubectl.kubernetes.io/last-applied-configuration`
// annotation (which repeats a whole applied object, a Secret's values included) is dropped from
// every object, before anything else looks at them.
import { CORE_SCHEMA, loadAll } from "js-yaml";
import { MAX_NESTING_DEPTH, MAX_YAML_ALIAS_EXPANSION } from "@/lib/inventory/limits";
import type { InventoryIssue } from "@/lib/inventory/types";
import { findExcessiveNesting } from "../shared/nesting";
import { isRecord, type Position, type StructuredSource } from "../shared/structured";
import { lineIndex, type PathSegment } from "../shared/text";

const LAST_APPLIED = "kubectl.kubernetes.io/last-applied-configuration";

/** One Kubernetes object of the push and the path that reaches it (`documents[2]`, `items[5]`). */
export interface ManifestObject {
  value: Record<string, unknown>;
  path: PathSegment[];
}

export interface LoadedManifests {
  objects: ManifestObject[];
  /** Documents that held nothing (a leading `---`, a comment-only part). */
  empty: number;
  source: StructuredSource;
  /** Where an object (mapping or sequence) of the parsed value starts. */
  positionOf(node: object): Position;
  /** Where `key` is written inside `node`, or where `node` starts when the key cannot be found. */
  keyPosition(node: object, key: string): Position;
  /** Keys of each Secret's `data` and `stringData`; the values were dropped while parsing. */
  secretKeys: WeakMap<object, string[]>;
}

export type LoadResult = { ok: true; manifests: LoadedManifests } | { ok: false; status: 413 | 422; issues: InventoryIssue[] };

class AliasBomb extends Error {
  constructor(readonly offset: number) {
    super("alias expansion");
  }
}

interface JsYamlState {
  position: number;
  result: unknown;
}

interface Frame {
  start: number;
  size: number;
}

export function loadManifests(text: string): LoadResult {
  if (text.trim() === "") return { ok: false, status: 422, issues: [{ path: "", line: 1, column: 1, message: "the file is empty" }] };
  const toPos = lineIndex(text);
  const deep = findExcessiveNesting(text);
  if (deep !== null) {
    return { ok: false, status: 422, issues: [{ path: "", ...toPos(deep), message: `nested more than ${MAX_NESTING_DEPTH} levels deep; a manifest needs far fewer` }] };
  }

  const offsets = new WeakMap<object, number>();
  const sizes = new WeakMap<object, number>();
  const frames: Frame[] = [];
  let expanded = 0;
  const listener = (event: "open" | "close", state: JsYamlState): void => {
    if (event === "open") {
      frames.push({ start: state.position, size: 1 });
      return;
    }
    const frame = frames.pop();
    if (!frame) return;
    let size = frame.size;
    const r = state.result;
    if (typeof r === "object" && r !== null) {
      const known = sizes.get(r);
      if (known !== undefined) {
        // Closed before: this node is an alias of it (or a merge key naming it).
        size = known;
        expanded += known;
        if (expanded > MAX_YAML_ALIAS_EXPANSION) throw new AliasBomb(frame.start);
      } else {
        sizes.set(r, size);
        offsets.set(r, frame.start);
      }
    }
    const parent = frames[frames.length - 1];
    if (parent) parent.size += size;
  };

  let documents: unknown[];
  try {
    documents = loadAll(text, undefined, { schema: CORE_SCHEMA, listener } as Parameters<typeof loadAll>[2]);
  } catch (err) {
    if (err instanceof AliasBomb) {
      return {
        ok: false,
        status: 413,
        issues: [{ path: "", ...toPos(skipBlank(text, err.offset)), message: `YAML aliases expand to more than ${MAX_YAML_ALIAS_EXPANSION} nodes (an alias bomb?); write the objects out` }],
      };
    }
    if (err instanceof RangeError) return { ok: false, status: 422, issues: [{ path: "", line: 1, column: 1, message: "the document is nested too deeply" }] };
    return { ok: false, status: 422, issues: [syntaxIssue(err)] };
  }

  const objects: ManifestObject[] = [];
  const secretKeys = new WeakMap<object, string[]>();
  let empty = 0;
  // One document is the root itself; several are `documents[i]`; a JSON array's members are `[i]`.
  const jsonArray = documents.length === 1 && Array.isArray(documents[0]);
  const roots: unknown[] = jsonArray ? (documents[0] as unknown[]) : documents;
  const prefix = (i: number): PathSegment[] => (jsonArray ? [i] : documents.length === 1 ? [] : ["documents", i]);
  const root: unknown = jsonArray ? documents[0] : documents.length === 1 ? documents[0] : { documents };

  const take = (value: unknown, path: PathSegment[], depth: number): void => {
    if (value === null || value === undefined) {
      empty++;
      return;
    }
    if (isRecord(value) && typeof value.kind === "string" && value.kind.endsWith("List") && Array.isArray(value.items) && depth < 2) {
      value.items.forEach((item, j) => take(item, [...path, "items", j], depth + 1));
      return;
    }
    if (isRecord(value)) scrub(value, secretKeys);
    objects.push({ value: isRecord(value) ? value : { __notAnObject: value }, path });
  };
  roots.forEach((doc, i) => take(doc, prefix(i), 0));

  const positionOf = (node: object): Position => {
    const at = offsets.get(node);
    return at === undefined ? {} : toPos(skipBlank(text, at));
  };
  const keyPosition = (node: object, key: string): Position => {
    const at = offsets.get(node);
    if (at === undefined) return {};
    const found = findKey(text, at, key);
    return toPos(found ?? skipBlank(text, at));
  };
  const locate: StructuredSource["locate"] = (path, o) => {
    let node: unknown = root;
    for (const [i, seg] of path.entries()) {
      if (typeof node !== "object" || node === null) break;
      const child = (node as Record<string | number, unknown>)[seg];
      // A missing member points at the mapping that lacks it.
      if (child === undefined) return positionOf(node);
      const scalar = typeof child !== "object" || child === null;
      if (typeof seg === "string" && isRecord(node) && (scalar || (o?.key && i === path.length - 1))) return keyPosition(node, seg);
      if (scalar) return positionOf(node);
      node = child;
    }
    return typeof node === "object" && node !== null ? positionOf(node) : {};
  };
  return { ok: true, manifests: { objects, empty, source: { value: root, warnings: [], locate }, positionOf, keyPosition, secretKeys } };
}

/** Keys only: a Secret's values never outlive the parse, and no object keeps its last-applied copy. */
function scrub(obj: Record<string, unknown>, secretKeys: WeakMap<object, string[]>): void {
  const meta = obj.metadata;
  if (isRecord(meta) && isRecord(meta.annotations)) delete meta.annotations[LAST_APPLIED];
  if (obj.kind !== "Secret") return;
  const keys: string[] = [];
  for (const field of ["data", "stringData"] as const) {
    const map = obj[field];
    if (isRecord(map)) for (const k of Object.keys(map)) if (!keys.includes(k)) keys.push(k);
    delete obj[field];
  }
  secretKeys.set(obj, keys);
}

/** The first character of the node: the listener reports where it opened, before its leading blanks and comments. */
function skipBlank(text: string, from: number): number {
  let i = from;
  while (i < text.length) {
    const ch = text[i];
    if (ch === " " || ch === "\t" || ch === "\n" || ch === "\r") i++;
    else if (ch === "#") while (i < text.length && text[i] !== "\n") i++;
    else break;
  }
  return i;
}

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** The member name `key` at or after `from`: bare, single- or double-quoted, followed by `:`. */
function findKey(text: string, from: number, key: string): number | null {
  const re = new RegExp(`(^|[\\s{,])(["']?)${escapeRe(key)}\\2\\s*:`, "gm");
  re.lastIndex = from;
  const m = re.exec(text);
  // A key far away is someone else's: give the node's own position instead.
  if (!m || m.index - from > 200_000) return null;
  return m.index + (m[1] ?? "").length;
}

interface JsYamlError {
  reason?: string;
  mark?: { line: number; column: number };
}

function syntaxIssue(err: unknown): InventoryIssue {
  const e = err as JsYamlError;
  const reason = e.reason ?? (err instanceof Error ? err.message : String(err));
  const message = /duplicated mapping key/.test(reason)
    ? "duplicate mapping key: the same name appears twice in one mapping"
    : `invalid YAML or JSON: ${reason}`;
  return { path: "", ...(e.mark ? { line: e.mark.line + 1, column: e.mark.column + 1 } : {}), message };
}
