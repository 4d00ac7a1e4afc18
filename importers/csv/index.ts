// CSV edge list → normalised inventory. Header `from,to[,strength]` (names case-insensitive,
// any order); one dependency a row. Fields are trimmed. Keys are not lower-cased: a wrong
// key is reported, not silently changed. Components = the distinct `from` keys (kind service,
// defaults otherwise); `to` keys not in `from` stay needs and the data layer decides on
// placeholders. Blank rows are skipped. A repeated from,to pair is a warning, merged with
// hard winning, as in format 1.
import type { ImportResult, InventoryComponent, InventoryIssue, Strength } from "@/lib/inventory/types";
import { KEY_PATTERN } from "@/lib/inventory/types";
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import { checkedText } from "../shared/body";
import { checkOrigin } from "../shared/origin";
import { finishIssues } from "../shared/text";
import { type CsvField, parseCsvRecords } from "./parse-csv";

const COLUMNS = ["from", "to", "strength"] as const;
type Column = (typeof COLUMNS)[number];

export interface CsvOptions {
  body: string | Uint8Array;
  source?: string;
  environment?: string;
}

export function importCsv(opts: CsvOptions): ImportResult {
  const text = checkedText(opts.body);
  if (!text.ok) return text;
  return parseCsv({ ...opts, text: text.text });
}

export function parseCsv(opts: Omit<CsvOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const issues: InventoryIssue[] = [...origin.issues];
  const warnings: InventoryIssue[] = [];
  const fail = (): ImportResult => ({ ok: false, status: 422, issues: finishIssues(issues) });

  const parsed = parseCsvRecords(opts.text);
  if (!parsed.ok) {
    issues.push({ path: `lines[${parsed.line}]`, line: parsed.line, column: parsed.column, message: parsed.message });
    return fail();
  }
  const isBlank = (r: CsvField[]): boolean => r.every((f) => f.value.trim() === "" && !f.quoted);
  const rows = parsed.records.filter((r) => !isBlank(r));
  const header = rows.shift();
  if (header === undefined) {
    issues.push({ path: "", line: 1, column: 1, message: "the file is empty: expected a header from,to[,strength]" });
    return fail();
  }

  const columns = new Map<Column, number>();
  header.forEach((f, idx) => {
    const name = f.value.trim().toLowerCase();
    const loc = { path: `header.${name || idx}`, line: f.line, column: f.column };
    if (!(COLUMNS as readonly string[]).includes(name)) {
      issues.push({ ...loc, message: `unknown column ${JSON.stringify(f.value.trim())}: the header is from,to[,strength]` });
    } else if (columns.has(name as Column)) {
      issues.push({ ...loc, message: `column ${name} appears twice in the header` });
    } else {
      columns.set(name as Column, idx);
    }
  });
  const first = header[0] ?? { line: 1, column: 1 };
  for (const required of ["from", "to"] as const) {
    if (!columns.has(required)) {
      issues.push({ path: "header", line: first.line, column: first.column, message: `missing header column ${required}: the first row must be from,to[,strength]` });
    }
  }
  if (issues.length > origin.issues.length) return fail();

  const fromCol = columns.get("from") ?? 0;
  const toCol = columns.get("to") ?? 1;
  const strengthCol = columns.get("strength");
  const needs = new Map<string, Map<string, Strength>>();
  const seenPair = new Map<string, number>();

  for (const row of rows) {
    const line = row[0]?.line ?? 0;
    const rowPath = `lines[${line}]`;
    // A missing trailing strength is fine (empty = hard); missing from/to or extra fields are not.
    const needed = Math.max(fromCol, toCol) + 1;
    if (row.length > header.length || row.length < needed) {
      const extra = row[header.length];
      const last = row[row.length - 1];
      issues.push({
        path: rowPath,
        line,
        column: extra?.column ?? last?.column ?? 1,
        message: `${row.length} fields; the header has ${header.length}`,
      });
      continue;
    }
    const cell = (idx: number): CsvField | undefined => row[idx];
    const key = (f: CsvField | undefined, col: Column): string | null => {
      const v = f?.value.trim() ?? "";
      if (KEY_PATTERN.test(v)) return v;
      issues.push({
        path: `${rowPath}.${col}`,
        line: f?.line ?? line,
        column: f?.column ?? 1,
        message: v === "" ? `empty ${col}` : `invalid key ${JSON.stringify(v)}: keys are 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`,
      });
      return null;
    };
    const from = key(cell(fromCol), "from");
    const to = key(cell(toCol), "to");
    let strength: Strength = "hard";
    if (strengthCol !== undefined) {
      const f = cell(strengthCol);
      const v = f?.value.trim().toLowerCase() ?? "";
      if (v === "soft" || v === "hard") strength = v;
      else if (v !== "") {
        issues.push({ path: `${rowPath}.strength`, line: f?.line ?? line, column: f?.column ?? 1, message: `invalid strength ${JSON.stringify(f?.value.trim())}: expected hard or soft (empty = hard)` });
        continue;
      }
    }
    if (from === null || to === null) continue;
    if (from === to) {
      issues.push({ path: rowPath, line, column: cell(toCol)?.column ?? 1, message: `${JSON.stringify(from)} depends on itself (self-dependency)` });
      continue;
    }
    const pair = `${from}\u0000${to}`;
    const prior = seenPair.get(pair);
    if (prior !== undefined) warnings.push({ path: rowPath, line, column: 1, message: `${from} → ${to} repeats line ${prior}; merged (hard wins)` });
    else seenPair.set(pair, line);
    const mine = needs.get(from) ?? new Map<string, Strength>();
    mine.set(to, mine.get(to) === "hard" ? "hard" : strength);
    needs.set(from, mine);
  }
  if (needs.size > MAX_COMPONENTS) {
    return { ok: false, status: 413, issues: [{ path: "", message: `${needs.size} components (distinct from keys); at most ${MAX_COMPONENTS} per file` }] };
  }
  if (issues.length > 0 || origin.source === null) return fail();

  const components = [...needs].map(([key, targets]): InventoryComponent => ({
    key,
    name: key,
    kind: "service",
    team: null,
    tier: 3,
    replicas: 1,
    zones: [],
    tags: [],
    links: {},
    aliases: [],
    needs: [...targets].map(([k, strength]) => ({ type: "single", key: k, strength, via: null })),
  }));
  return { ok: true, inventory: { source: origin.source, environment: origin.environment, components, observedEdges: [], warnings } };
}
