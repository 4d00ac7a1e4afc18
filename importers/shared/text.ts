// Text handling shared by every importer: decoding the body, offsets → line/column, path
// strings, and the final ordering and capping of issues.
import { MAX_ISSUES } from "@/lib/inventory/limits";
import type { InventoryIssue } from "@/lib/inventory/types";

export { formatPath, type PathSegment } from "@/lib/issue-path";

export type Decoded = { ok: true; text: string } | { ok: false; issues: InventoryIssue[] };

const BOM = "\uFEFF";

/**
 * Bytes → text. Refuses invalid UTF-8 and control characters (the usual sign of a binary file)
 * with a located issue, and drops a leading byte-order mark so line 1 columns stay as written.
 */
export function decodeBody(body: string | Uint8Array): Decoded {
  let text: string;
  if (typeof body === "string") {
    text = body;
  } else {
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(body);
    } catch {
      // TextDecoder does not say where it failed; the lenient decode marks the first bad byte.
      const lenient = new TextDecoder("utf-8").decode(body);
      const at = lenient.indexOf("\uFFFD");
      const pos = lineIndex(lenient)(Math.max(0, at));
      return {
        ok: false,
        issues: [{ path: "", ...pos, message: "the body is not UTF-8 text (is it a binary file?)" }],
      };
    }
  }
  if (text.startsWith(BOM)) text = text.slice(1);
  // Tab, LF and CR are the only C0 controls a text inventory has reason to contain.
  // eslint-disable-next-line no-control-regex -- matching control characters is the point here
  const control = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/.exec(text);
  if (control) {
    const code = control[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, "0");
    return {
      ok: false,
      issues: [
        {
          path: "",
          ...lineIndex(text)(control.index),
          message: `control character U+${code} found: the body looks like binary data, not text`,
        },
      ],
    };
  }
  return { ok: true, text };
}

/** Returns a function from a UTF-16 offset to a 1-based line and column. */
export function lineIndex(text: string): (offset: number) => { line: number; column: number } {
  const starts = [0];
  for (let i = text.indexOf("\n"); i !== -1; i = text.indexOf("\n", i + 1)) starts.push(i + 1);
  return (offset) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if ((starts[mid] ?? 0) <= offset) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo + 1, column: offset - (starts[lo] ?? 0) + 1 };
  };
}

/** Orders issues by position (unlocated last, stable) and keeps at most MAX_ISSUES. */
export function finishIssues(issues: InventoryIssue[]): InventoryIssue[] {
  const sorted = issues
    .map((issue, i) => ({ issue, i }))
    .sort(
      (a, b) =>
        (a.issue.line ?? Infinity) - (b.issue.line ?? Infinity) ||
        (a.issue.column ?? Infinity) - (b.issue.column ?? Infinity) ||
        a.i - b.i,
    )
    .map(({ issue }) => issue);
  if (sorted.length <= MAX_ISSUES) return sorted;
  const kept = sorted.slice(0, MAX_ISSUES);
  kept.push({ path: "", message: `${sorted.length - MAX_ISSUES} more issues not shown` });
  return kept;
}

export function byteLength(body: string | Uint8Array): number {
  return typeof body === "string" ? Buffer.byteLength(body, "utf8") : body.byteLength;
}
