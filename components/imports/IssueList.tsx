"use client";

import { useState } from "react";
import type { InventoryIssue } from "@/lib/inventory/types";

const CONTEXT_LINES = 2;
/** Past this width a line is shown as a window around the column (minified JSON is one long line). */
const MAX_LINE_CHARS = 110;
const SHOWN_WITH_EXCERPT = 40;

function windowAround(line: string, column: number | undefined): { text: string; offset: number } {
  if (line.length <= MAX_LINE_CHARS) return { text: line, offset: 0 };
  const centre = Math.max(0, (column ?? 1) - 1);
  const start = Math.max(0, Math.min(centre - 40, line.length - MAX_LINE_CHARS));
  const text = (start > 0 ? "…" : "") + line.slice(start, start + MAX_LINE_CHARS) + (start + MAX_LINE_CHARS < line.length ? "…" : "");
  return { text, offset: start > 0 ? start - 1 : 0 };
}

/** The offending line with its neighbours and a caret under the column, like a compiler message. */
function Excerpt({ lines, line, column }: { lines: string[]; line: number; column?: number }) {
  const first = Math.max(1, line - CONTEXT_LINES);
  const last = Math.min(lines.length, line + CONTEXT_LINES);
  const width = String(last).length;
  const rows: { n: number; text: string; caretAt?: number }[] = [];
  for (let n = first; n <= last; n++) {
    const { text, offset } = windowAround(lines[n - 1] ?? "", n === line ? column : undefined);
    rows.push({ n, text, ...(n === line && column ? { caretAt: Math.max(0, column - 1 - offset) } : {}) });
  }
  return (
    <pre className="mt-2 overflow-x-auto rounded-md border border-line bg-canvas py-1.5 font-mono text-[13px] leading-5" aria-label={`File excerpt around line ${line}`}>
      {rows.map((r) => {
        const hit = r.n === line;
        return (
          <div key={r.n}>
            <div className={hit ? "bg-down/15" : undefined} data-line={r.n} data-hit={hit || undefined}>
              <span className={`inline-block select-none pl-2 pr-3 text-right ${hit ? "text-down" : "text-faint"}`} style={{ width: `${width + 3}ch` }}>
                {hit ? "▶" : " "}
                {String(r.n).padStart(width, " ")}
              </span>
              <span className={hit ? "text-ink" : "text-muted"}>{r.text || " "}</span>
            </div>
            {hit && r.caretAt !== undefined && (
              <div aria-hidden="true" className="text-down">
                <span className="inline-block" style={{ width: `${width + 3}ch` }} />
                {" ".repeat(r.caretAt)}^
              </div>
            )}
          </div>
        );
      })}
    </pre>
  );
}

const splitLines = (text: string): string[] => text.replace(/^\uFEFF/, "").split(/\r\n|\r|\n/);

/** `texts`: the files of a push that carried several, by name, for issues that name their file. */
export function IssueList({ issues, text, texts, tone = "error" }: { issues: InventoryIssue[]; text: string | null; texts?: Record<string, string>; tone?: "error" | "warning" }) {
  const [showAll, setShowAll] = useState(false);
  const lines = text === null ? [] : splitLines(text);
  const linesOf = (issue: InventoryIssue): string[] => (issue.file !== undefined ? (texts?.[issue.file] !== undefined ? splitLines(texts[issue.file] ?? "") : []) : lines);
  // Issues that name their files come ordered by file from the server; sorting by line alone would interleave the files.
  const sorted = issues.some((i) => i.file !== undefined) ? issues : [...issues].sort((a, b) => (a.line ?? Number.MAX_SAFE_INTEGER) - (b.line ?? Number.MAX_SAFE_INTEGER) || (a.column ?? 0) - (b.column ?? 0));
  const shown = showAll ? sorted : sorted.slice(0, SHOWN_WITH_EXCERPT);
  const accent = tone === "error" ? "border-down" : "border-degraded";
  return (
    <div>
      <ol className="space-y-3" aria-label={tone === "error" ? "Problems in the file" : "Warnings"}>
        {shown.map((issue, i) => (
          <li key={i} className={`border-l-2 ${accent} pl-3`} data-testid={tone === "error" ? "import-issue" : "import-warning"}>
            <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1 text-sm">
              {issue.line !== undefined && (
                <span className="font-mono font-semibold text-ink" data-testid="issue-location">
                  {issue.file !== undefined && `${issue.file} `}line {issue.line}
                  {issue.column !== undefined && `:${issue.column}`}
                </span>
              )}
              <span className="font-mono text-xs text-muted">{issue.path}</span>
            </div>
            <p className="mt-0.5 text-sm text-ink">{issue.message}</p>
            {issue.line !== undefined && linesOf(issue).length > 0 && issue.line <= linesOf(issue).length && <Excerpt lines={linesOf(issue)} line={issue.line} column={issue.column} />}
          </li>
        ))}
      </ol>
      {sorted.length > shown.length && (
        <button type="button" className="mt-3 text-sm text-brass underline underline-offset-4" onClick={() => setShowAll(true)}>
          Show all {sorted.length} ({sorted.length - shown.length} more)
        </button>
      )}
    </div>
  );
}
