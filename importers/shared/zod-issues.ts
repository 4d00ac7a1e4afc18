// zod issues → located inventory issues. zod gives a value path; the StructuredSource turns
// it into a line and column. Unknown fields point at the field's name, missing ones at the
// mapping that lacks them, and a failed union reports the branch the input was written for.
import type { z } from "zod";
import type { InventoryIssue } from "@/lib/inventory/types";
import type { StructuredSource } from "./structured";
import { formatPath, type PathSegment } from "./text";

type ZodIssue = z.core.$ZodIssue;

export interface MapOptions {
  /** Picks the union branch an input was meant for; null = none fits, use `unionMessage`. */
  unionBranch?: (input: unknown) => number | null;
  unionMessage?: string;
}

export function mapZodIssues(
  issues: readonly ZodIssue[],
  source: StructuredSource,
  opts: MapOptions = {},
  prefix: readonly PathSegment[] = [],
): InventoryIssue[] {
  const out: InventoryIssue[] = [];
  for (const issue of issues) {
    const path: PathSegment[] = [...prefix, ...issue.path.map((p) => (typeof p === "symbol" ? String(p) : p))];
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) {
        const at = [...path, key];
        out.push({ path: formatPath(at), ...source.locate(at, { key: true }), message: `unknown field ${JSON.stringify(key)}` });
      }
      continue;
    }
    const input = valueAt(source.value, path);
    if (issue.code === "invalid_union") {
      const branch = opts.unionBranch?.(input) ?? typeMatchedBranch(issue.errors);
      const chosen = branch === null ? undefined : issue.errors[branch];
      if (chosen !== undefined && chosen.length > 0) {
        out.push(...mapZodIssues(chosen, source, opts, path));
        continue;
      }
      out.push({ path: formatPath(path), ...source.locate(path), message: opts.unionMessage ?? issue.message });
      continue;
    }
    const last = path[path.length - 1];
    const parent = valueAt(source.value, path.slice(0, -1));
    const missing =
      typeof last === "string" && typeof parent === "object" && parent !== null && !Object.hasOwn(parent, last);
    out.push({
      path: formatPath(path),
      ...source.locate(path),
      message: missing ? `missing required field ${JSON.stringify(last)}` : issue.message,
    });
  }
  return out;
}

/** The one branch whose type fit the input (no type error at its root), when there is exactly one. */
function typeMatchedBranch(errors: readonly (readonly ZodIssue[])[]): number | null {
  const fitting = errors.flatMap((errs, i) => (errs.some((e) => e.code === "invalid_type" && e.path.length === 0) ? [] : [i]));
  return fitting.length === 1 ? (fitting[0] ?? null) : null;
}

function valueAt(value: unknown, path: readonly PathSegment[]): unknown {
  let v = value;
  for (const seg of path) {
    if (typeof v !== "object" || v === null || !Object.hasOwn(v, seg)) return undefined;
    v = (v as Record<string | number, unknown>)[seg];
  }
  return v;
}
