// The ranking as RFC 4180 CSV. A dozen lines of quoting do not justify a CSV package.
import type { RankingItem } from "@/lib/data/analysis-results";

const RANKINGS_CSV_COLUMNS = [
  "rank",
  "key",
  "name",
  "kind",
  "team",
  "tier",
  "betweenness",
  "pagerank",
  "eigenvector",
  "clustering",
  "blast_down",
  "blast_degraded",
  "pinch_score",
  "articulation",
  "in_cycle",
  "single_point",
  "entries_dominated",
  "snapshot",
] as const;

/**
 * A cell a spreadsheet would evaluate as a formula: one starting with = + - @ (or their full-width
 * forms, which some spreadsheet locales also read as formulas), tab or carriage return — after any
 * leading white space, which spreadsheets skip too. Such a text cell gets a leading apostrophe, the
 * mitigation OWASP's "CSV Injection" page recommends (common practice, not a standard).
 */
const FORMULA_START = /^[\s\u00a0\u3000]*[=+\-@\uff1d\uff0b\uff0d\uff20]|^[\t\r]/;

export function csvField(value: string | number | boolean | null): string {
  if (value === null) return "";
  const text = String(value);
  const safe = typeof value === "string" && FORMULA_START.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) || safe !== text ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function rankingsCsv({ items, snapshot }: { items: RankingItem[]; snapshot: number }): string {
  const lines = [RANKINGS_CSV_COLUMNS.join(",")];
  for (const i of items) {
    lines.push(
      [i.rank, i.key, i.name, i.kind, i.team, i.tier, i.betweenness, i.pagerank, i.eigenvector, i.clustering, i.blastRadius.down, i.blastRadius.degraded, i.pinchScore, i.articulation, i.inCycle, i.singlePoint, i.entriesDominated, snapshot]
        .map(csvField)
        .join(","),
    );
  }
  return `${lines.join("\r\n")}\r\n`;
}
