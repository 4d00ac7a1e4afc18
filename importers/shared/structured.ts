// Reads YAML or JSON into a plain value while keeping a way back from a value's path to its
// line and column, so every later issue (zod's or ours) can point into the file. The loaders live
// beside this file (load-json.ts, load-yaml.ts); this is the one entry point importers call.
import { MAX_NESTING_DEPTH } from "@/lib/inventory/limits";
import { findForbiddenText } from "@/lib/forbidden-text";
import { loadJson } from "./load-json";
import { loadYaml } from "./load-yaml";
import { findExcessiveNesting } from "./nesting";
import type { CountLimit, Loaded, StructuredSource } from "./source";
import { formatPath, lineIndex } from "./text";

export { isRecord, type Loaded, type Position, type StructuredSource } from "./source";

/** JSON when the first significant character opens an object or array; YAML otherwise. */
export function looksLikeJson(text: string, contentType?: string): boolean {
  if (contentType !== undefined && /\bjson\b/i.test(contentType)) return true;
  if (contentType !== undefined && /\byaml\b/i.test(contentType)) return false;
  return /^\s*[{[]/.test(text);
}

export interface LoadOptions {
  json: boolean;
  limit?: CountLimit;
  /** Local tags the caller gives a meaning to: reported in `tagged` instead of as unresolved-tag warnings. */
  markTags?: readonly string[];
}

export function loadStructured(text: string, opts: LoadOptions): Loaded {
  if (text.trim() === "") {
    return { ok: false, status: 422, issues: [{ path: "", line: 1, column: 1, message: "the file is empty" }] };
  }
  const deep = findExcessiveNesting(text);
  if (deep !== null) {
    const at = lineIndex(text)(deep);
    const message = `nested more than ${MAX_NESTING_DEPTH} levels deep; an inventory needs far fewer`;
    return { ok: false, status: 422, issues: [{ path: "", ...at, message }] };
  }
  const loaded = opts.json ? loadJson(text, opts.limit) : loadYaml(text, opts.limit, opts.markTags ?? []);
  return loaded.ok ? refuseForbiddenText(loaded.source) : loaded;
}

/**
 * Escapes (`"\0"`, `"\u0000"`, `"\ud800"`) can put into a value what decodeBody refuses raw;
 * the same rule applies to both, located at the value (lib/forbidden-text.ts).
 */
function refuseForbiddenText(source: StructuredSource): Loaded {
  const problems = findForbiddenText(source.value);
  if (problems.length === 0) return { ok: true, source };
  return { ok: false, status: 422, issues: problems.map((p) => ({ path: formatPath(p.path), ...source.locate(p.path), message: p.message })) };
}
