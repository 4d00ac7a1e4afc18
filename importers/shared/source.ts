// The shapes every loader returns: a plain value plus a way back from a path to its line and column.
import type { InventoryIssue } from "@/lib/inventory/types";
import type { PathSegment } from "./text";

export interface Position {
  line?: number;
  column?: number;
}

export interface StructuredSource {
  value: unknown;
  warnings: InventoryIssue[];
  /** Nodes carrying one of the tags asked for with `markTags` (e.g. Compose's `!reset`), by path. */
  tagged?: { path: PathSegment[]; tag: string }[];
  /** Where the value at `path` starts; with `key`, where its member name starts. */
  locate(path: readonly PathSegment[], opts?: { key?: boolean }): Position;
}

export type Loaded =
  | { ok: true; source: StructuredSource }
  | { ok: false; status: 413 | 422; issues: InventoryIssue[] };

/** A collection whose size is checked before the document is expanded and validated. */
export interface CountLimit {
  key: string;
  max: number;
  /** e.g. "components" */
  noun: string;
}

export function tooMany(limit: CountLimit, size: number, at: Position): InventoryIssue {
  return {
    path: limit.key,
    ...at,
    message: `${size} ${limit.noun} in one file; at most ${limit.max} are accepted (split the file by source)`,
  };
}

export function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}
