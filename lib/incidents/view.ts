// What the incident screen and its copyable summary say, from the probable-origin result: who to
// page in order, and the plain-text summary a responder pastes into a channel. Pure: the data layer
// supplies owners and contacts.
import type { OriginResult } from "@/lib/analysis/origin";
import type { TeamContact } from "@/lib/api/schemas/analysis";

export type { TeamContact };

export const PAGE_REASONS = ["origin", "silent", "firing", "predicted"] as const;
type PageReason = (typeof PAGE_REASONS)[number];

export interface PageEntry {
  /** null: components nobody owns — nobody is paged for them unless a person acts. */
  team: string | null;
  contact: TeamContact | null;
  reasons: PageReason[];
  origin: string[];
  silent: string[];
  firing: string[];
  predicted: string[];
}

/**
 * Who to page, in order: the owners of the probable origins (in the cover's order), then of silent
 * suspects, then the teams whose components fire (most first), then those whose components will
 * likely fail next (most first). A team appears once, where it first comes, with every reason.
 */
export function pageOrder(result: Pick<OriginResult, "origins" | "silent" | "firing" | "predicted">, teamOf: (key: string) => string | null, contacts: ReadonlyMap<string, TeamContact>): PageEntry[] {
  const entries = new Map<string | null, PageEntry>();
  const add = (key: string, reason: PageReason) => {
    const team = teamOf(key);
    let e = entries.get(team);
    if (!e) {
      e = { team, contact: team ? (contacts.get(team) ?? null) : null, reasons: [], origin: [], silent: [], firing: [], predicted: [] };
      entries.set(team, e);
    }
    if (!e.reasons.includes(reason)) e.reasons.push(reason);
    e[reason].push(key);
  };
  // Groups keys by team and adds the biggest group first, so that "most affected first" holds.
  const addGrouped = (keys: readonly string[], reason: PageReason) => {
    const groups = new Map<string | null, string[]>();
    for (const k of keys) {
      const t = teamOf(k);
      groups.set(t, [...(groups.get(t) ?? []), k]);
    }
    const ordered = [...groups.entries()].sort((a, b) => b[1].length - a[1].length || (a[0] ?? "").localeCompare(b[0] ?? ""));
    for (const [, ks] of ordered) for (const k of ks) add(k, reason);
  };
  for (const o of result.origins) add(o.key, "origin");
  for (const s of result.silent) if (s.kind === "component") add(s.key, "silent");
  // An origin fires too; it is listed once, as the origin.
  const origins = new Set(result.origins.map((o) => o.key));
  addGrouped(result.firing.filter((k) => !origins.has(k)), "firing");
  addGrouped([...result.predicted.down, ...result.predicted.degraded], "predicted");
  return [...entries.values()];
}

const REASON_TEXT: Record<PageReason, (keys: string[]) => string> = {
  origin: (ks) => `owns the probable origin ${ks.join(", ")}`,
  silent: (ks) => `owns ${ks.join(", ")}, not alerting but a suspect`,
  firing: (ks) => `${ks.length} firing`,
  predicted: (ks) => `${ks.length} likely to fail next`,
};

function pageLine(e: PageEntry): string {
  const why = e.reasons.map((r) => REASON_TEXT[r](e[r])).join("; ");
  if (e.team === null) return `unowned, nobody is paged: ${why}`;
  const contact = e.contact ? [e.contact.oncall ? `on-call ${e.contact.oncall}` : "", e.contact.email ?? ""].filter(Boolean).join(", ") || "no contact on file" : "no contact on file";
  return `${e.contact?.name ?? e.team} (${e.team}): ${why} — ${contact}`;
}

/** "2026-12-03 09:14 UTC": absolute, so that a pasted summary still reads right an hour later. */
export const utc = (iso: string | Date): string => {
  const s = (iso instanceof Date ? iso : new Date(iso)).toISOString();
  return `${s.slice(0, 10)} ${s.slice(11, 16)} UTC`;
};

/** "×14": how many times its usual PageRank share this incident's walk gives a component. */
export const lift = (p: { score: number; usual: number }): string => {
  const x = p.score / p.usual;
  return `×${x >= 10 ? Math.round(x) : x.toFixed(1)}`;
};

const list = (keys: readonly string[], max = 12) => `${keys.slice(0, max).join(", ")}${keys.length > max ? `, … (${keys.length - max} more)` : ""}`;

export interface UnknownAlertGroup {
  /** What the alerts called the component (a label's value or a Pinchpoint component), or null when no label named one. */
  value: string | null;
  label: string | null;
  alerts: number;
}

export interface SummaryInput {
  env: string;
  incident: { number: number; openedAt: string } | null;
  alertCount: number;
  result: OriginResult;
  page: PageEntry[];
  unknownAlerts: UnknownAlertGroup[];
  snapshot: { number: number; createdAt: string } | null;
  now: Date;
  link: string;
}

export const INCIDENT_CAUTION =
  "The probable origin is a probability read from the declared dependency graph, not a diagnosis: confirm it with your own signals before acting, and act through your own incident process.";

export function incidentSummaryText(input: SummaryInput): string {
  const { result, env } = input;
  const lines: string[] = [];
  const firing = result.firing.length;
  const head = input.incident ? `Pinchpoint incident #${input.incident.number}, ${env}: open since ${utc(input.incident.openedAt)}` : `Pinchpoint, ${env}: no incident open`;
  lines.push(`${head}; ${input.alertCount} alert${input.alertCount === 1 ? "" : "s"} on ${firing} component${firing === 1 ? "" : "s"} firing at ${utc(input.now)}.`);
  if (result.origins.length === 0) lines.push(firing > 0 ? "Probable origin: none — no firing component's failure explains another's." : "Nothing fires.");
  for (const [i, o] of result.origins.entries()) {
    const deg = o.degraded.length ? ` (${o.degraded.length} only as degraded)` : "";
    lines.push(`${i === 0 ? "Probable origin" : "Also"}: ${o.key} — explains ${o.explains.length} of ${firing} firing${deg}.`);
  }
  if (result.origins.length > 1) lines.push(`Together the origins explain ${result.explainedCount} of ${firing} firing.`);
  if (result.jointly.length) lines.push(`Explained only together: ${result.jointly.map((j) => `${j.key} (by ${j.by.join(" + ")})`).join("; ")}.`);
  if (result.unexplained.length) lines.push(`Not explained by anything firing (a separate fault, or a need the inventory does not declare): ${list(result.unexplained)}.`);
  for (const s of result.silent.slice(0, 3)) lines.push(`Not alerting, yet its failure alone would explain ${s.explains.length} of ${firing}: ${s.kind === "zone" ? "zone " : ""}${s.key} — check it.`);
  const walk = result.pagerank.slice(0, 5).map((p) => `${p.key} ${p.score.toFixed(3)}${p.usual > 0 ? ` (${lift(p)} its usual share${p.firing ? "" : ", not alerting"})` : ""}`);
  if (walk.length) lines.push(`Where a walk along needs from the firing components settles (personalised PageRank): ${walk.join(", ")}.`);
  const { down, degraded } = result.predicted;
  if (down.length + degraded.length) lines.push(`Likely to fail next (not firing yet): ${down.length} down${down.length ? ` — ${list(down, 8)}` : ""}; ${degraded.length} degraded.`);
  const unknown = input.unknownAlerts.reduce((a, u) => a + u.alerts, 0) + result.unknown.length;
  if (unknown) {
    const names = [...input.unknownAlerts.map((u) => (u.value ? `${u.label ? `${u.label}=` : ""}${u.value}` : "no component label")), ...result.unknown.map((k) => `${k} (outside the analysed graph)`)];
    lines.push(`Alerts naming no known component: ${unknown} — ${list(names, 8)}.`);
  }
  lines.push("");
  lines.push("Page, in order:");
  input.page.forEach((e, i) => lines.push(`${i + 1}. ${pageLine(e)}`));
  lines.push("");
  lines.push(input.snapshot ? `Read against snapshot #${input.snapshot.number}, pushed ${utc(input.snapshot.createdAt)}.` : "No snapshot: nothing has been pushed to this environment.");
  lines.push(INCIDENT_CAUTION);
  if (input.link) lines.push(input.link);
  return lines.join("\n");
}
