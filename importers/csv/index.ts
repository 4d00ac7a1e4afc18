// CSV edge list → normalised inventory, as spreadsheets export it. One dependency a row:
//   header       names case-insensitive, any order; `from` also as source|caller|consumer, `to` also as
//                target|callee|provider|dependency. Known extra columns: strength, kind, tier, team, via,
//                any_of. Other columns are ignored, named in one warning.
//   delimiter    sniffed from the header line among `,` `;` and tab; lines starting with `#` are comments
//   rows         a row with an empty `to` declares its `from` with no needs (so leaves can be listed);
//                kind, tier and team describe the `from` component (the first row that gives one wins);
//                strength hard|soft|startup, `required` = hard, `optional` = soft, empty = hard;
//                rows of one `from` with the same `any_of` label form one any-of group.
//   keys         trimmed and lower-cased, as component keys are; two spellings that meet are one warning
// Components = the distinct `from` keys (kind service unless a row says otherwise); `to` keys not in
// `from` stay needs and the data layer decides on placeholders. A repeated pair is a warning, merged
// with the stronger strength winning, as in format 1.
import { KindSchema, TeamSlugSchema, TierSchema } from "@/lib/inventory/schema";
import type { DeclaredKind, ImportResult, InventoryComponent, InventoryIssue, Need, Strength, Tier } from "@/lib/inventory/types";
import { KEY_PATTERN, strongerStrength } from "@/lib/inventory/types";
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import { checkOrigin } from "../shared/origin";
import { finishIssues } from "../shared/text";
import { type CsvField, parseCsvRecords, sniffDelimiter } from "./parse-csv";

const COLUMNS = ["from", "to", "strength", "kind", "tier", "team", "via", "any_of"] as const;
type Column = (typeof COLUMNS)[number];

const ALIASES: Record<string, Column> = {
  from: "from",
  source: "from",
  caller: "from",
  consumer: "from",
  to: "to",
  target: "to",
  callee: "to",
  provider: "to",
  dependency: "to",
  strength: "strength",
  kind: "kind",
  tier: "tier",
  team: "team",
  via: "via",
  any_of: "any_of",
  "any-of": "any_of",
  anyof: "any_of",
};

const STRENGTH_WORDS: Record<string, Strength> = { hard: "hard", soft: "soft", startup: "startup", required: "hard", optional: "soft" };

export interface CsvOptions {
  body: string | Uint8Array;
  source?: string;
  environment?: string;
}

interface Component {
  name: string;
  kind?: { value: DeclaredKind; line: number };
  tier?: { value: Tier; line: number };
  team?: { value: string; line: number };
  needs: Map<string, { strength: Strength; via: string | null; line: number }>;
  groups: Map<string, { members: string[]; strength: Strength; via: string | null; line: number; column: number }>;
}

export function parseCsv(opts: Omit<CsvOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const issues: InventoryIssue[] = [...origin.issues];
  const warnings: InventoryIssue[] = [];
  const fail = (): ImportResult => ({ ok: false, status: 422, issues: finishIssues(issues) });

  const delimiter = sniffDelimiter(opts.text);
  const parsed = parseCsvRecords(opts.text, { delimiter, comments: true });
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
  const ignored: string[] = [];
  header.forEach((f, idx) => {
    const written = f.value.trim();
    const name = ALIASES[written.toLowerCase()];
    const loc = { path: `header.${written.toLowerCase() || idx}`, line: f.line, column: f.column };
    if (name === undefined) ignored.push(written === "" ? `column ${idx + 1} (no name)` : JSON.stringify(written));
    else if (columns.has(name)) issues.push({ ...loc, message: `column ${name} appears twice in the header (as ${JSON.stringify(header[columns.get(name) ?? 0]?.value.trim())} and ${JSON.stringify(written)})` });
    else columns.set(name, idx);
  });
  const first = header[0] ?? { line: 1, column: 1 };
  const HEADER_HELP = "the first row must name the columns, e.g. from,to,strength (from also as source, caller or consumer; to also as target, callee, provider or dependency)";
  for (const required of ["from", "to"] as const) {
    if (!columns.has(required)) issues.push({ path: "header", line: first.line, column: first.column, message: `missing header column ${required}: ${HEADER_HELP}` });
  }
  if (issues.length > origin.issues.length) return fail();
  if (ignored.length > 0) {
    warnings.push({
      path: "header",
      line: first.line,
      column: first.column,
      message: `column${ignored.length === 1 ? "" : "s"} ${ignored.join(", ")} ${ignored.length === 1 ? "is" : "are"} not read and ${ignored.length === 1 ? "was" : "were"} ignored; the columns read are ${COLUMNS.join(", ")}`,
    });
  }

  const components = new Map<string, Component>();
  const spellings = new Map<string, { written: string; line: number }>();
  const merged = new Set<string>();
  const seenPair = new Map<string, number>();

  for (const row of rows) {
    const line = row[0]?.line ?? 0;
    const rowPath = `lines[${line}]`;
    if (row.length > header.length) {
      const extra = row[header.length];
      issues.push({ path: rowPath, line, column: extra?.column ?? 1, message: `${row.length} fields; the header has ${header.length}` });
      continue;
    }
    const cell = (col: Column): CsvField | undefined => {
      const idx = columns.get(col);
      return idx === undefined ? undefined : row[idx];
    };
    const text = (col: Column): string => cell(col)?.value.trim() ?? "";
    const where = (col: Column) => ({ path: `${rowPath}.${col}`, line: cell(col)?.line ?? line, column: cell(col)?.column ?? 1 });
    const key = (col: "from" | "to"): string | null => {
      const written = text(col);
      const k = written.toLowerCase();
      if (written === "") {
        if (col === "from") issues.push({ ...where(col), message: "empty from" });
        return null;
      }
      if (!KEY_PATTERN.test(k)) {
        issues.push({ ...where(col), message: `invalid key ${JSON.stringify(written)}: keys are 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit (upper case is lower-cased)` });
        return null;
      }
      const earlier = spellings.get(k);
      if (earlier === undefined) spellings.set(k, { written, line });
      else if (earlier.written !== written && !merged.has(`${k}\u0000${written}`)) {
        merged.add(`${k}\u0000${written}`);
        warnings.push({ ...where(col), message: `${JSON.stringify(written)} and ${JSON.stringify(earlier.written)} (line ${earlier.line}) are one key, ${JSON.stringify(k)}: keys are lower-case` });
      }
      return k;
    };
    const from = key("from");
    const to = text("to") === "" ? null : key("to");
    if (to === null && text("to") !== "") continue;

    let strength: Strength = "hard";
    const sw = text("strength").toLowerCase();
    if (sw !== "") {
      const s = STRENGTH_WORDS[sw];
      if (s === undefined) {
        issues.push({ ...where("strength"), message: `invalid strength ${JSON.stringify(text("strength"))}: expected hard, soft or startup (or required = hard, optional = soft; empty = hard)` });
        continue;
      }
      strength = s;
    }
    if (from === null) continue;
    const comp: Component = components.get(from) ?? { name: spellings.get(from)?.written ?? from, needs: new Map(), groups: new Map() };
    components.set(from, comp);

    // Attributes of the `from` component: the first row that gives one wins; a different later value is a warning.
    const attr = <T,>(col: "kind" | "tier" | "team", parse: (v: string) => { ok: true; value: T } | { ok: false; message: string }, slot: { value: T; line: number } | undefined, set: (v: { value: T; line: number }) => void) => {
      const v = text(col);
      if (v === "") return;
      const r = parse(v);
      if (!r.ok) {
        issues.push({ ...where(col), message: r.message });
        return;
      }
      if (slot === undefined) set({ value: r.value, line });
      else if (slot.value !== r.value) warnings.push({ ...where(col), message: `${col} ${JSON.stringify(v)} for ${from} differs from ${JSON.stringify(String(slot.value))} on line ${slot.line}; the first is kept` });
    };
    const zodParse = <T,>(schema: { safeParse: (v: unknown) => { success: true; data: T } | { success: false; error: { issues: { message: string }[] } } }, v: unknown) => {
      const r = schema.safeParse(v);
      return r.success ? { ok: true as const, value: r.data } : { ok: false as const, message: r.error.issues[0]?.message ?? "invalid value" };
    };
    attr("kind", (v) => zodParse(KindSchema, v.toLowerCase()), comp.kind, (s) => (comp.kind = s));
    attr("tier", (v) => zodParse(TierSchema, /^\d+$/.test(v) ? Number(v) : v), comp.tier, (s) => (comp.tier = s as { value: Tier; line: number }));
    attr("team", (v) => zodParse(TeamSlugSchema, v.toLowerCase()), comp.team, (s) => (comp.team = s));

    if (to === null) continue;
    if (from === to) {
      issues.push({ path: rowPath, line, column: cell("to")?.column ?? 1, message: `${JSON.stringify(from)} depends on itself (self-dependency)` });
      continue;
    }
    const via = text("via") === "" ? null : text("via");
    const group = text("any_of");
    if (group !== "") {
      const g = comp.groups.get(group) ?? { members: [], strength, via, line, column: cell("any_of")?.column ?? 1 };
      if (!g.members.includes(to)) g.members.push(to);
      g.strength = g.members.length === 1 ? strength : strongerStrength(g.strength, strength);
      g.via ??= via;
      comp.groups.set(group, g);
      continue;
    }
    const pair = `${from}\u0000${to}`;
    const prior = seenPair.get(pair);
    if (prior !== undefined) warnings.push({ path: rowPath, line, column: 1, message: `${from} → ${to} repeats line ${prior}; merged (the stronger strength wins)` });
    else seenPair.set(pair, line);
    const before = comp.needs.get(to);
    comp.needs.set(to, before ? { strength: strongerStrength(before.strength, strength), via: before.via ?? via, line: before.line } : { strength, via, line });
  }
  for (const [from, comp] of components) {
    for (const [label, g] of comp.groups) {
      if (g.members.length < 2) {
        issues.push({ path: `lines[${g.line}].any_of`, line: g.line, column: g.column, message: `any_of group ${JSON.stringify(label)} of ${from} has one member; a group needs at least two (leave any_of empty for a single need)` });
      }
    }
  }
  if (components.size > MAX_COMPONENTS) {
    return { ok: false, status: 413, issues: [{ path: "", message: `${components.size} components (distinct from keys); at most ${MAX_COMPONENTS} per file` }] };
  }
  if (issues.length > 0 || origin.source === null) return fail();

  const out = [...components].map(([key, c]): InventoryComponent => ({
    key,
    name: c.name,
    kind: c.kind?.value ?? "service",
    team: c.team?.value ?? null,
    tier: c.tier?.value ?? 3,
    replicas: 1,
    zones: [],
    tags: [],
    links: {},
    aliases: [],
    needs: [
      ...[...c.needs].map(([k, n]): Need => ({ type: "single", key: k, strength: n.strength, via: n.via })),
      ...[...c.groups.values()].map((g): Need => ({ type: "any_of", keys: g.members, strength: g.strength, via: g.via })),
    ],
  }));
  return { ok: true, inventory: { source: origin.source, environment: origin.environment, components: out, observedEdges: [], warnings } };
}
