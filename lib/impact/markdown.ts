// The impact as a short pull-request comment (CommonMark with GFM tables): a headline, the policy
// results with their located findings, a table of what moved, the other changes in a few lines,
// and a link back to the environment. Short on purpose: the JSON answer has everything.
import type { ImpactReport } from "./report";

/** Rows of the "what moved" table; the JSON answer lists up to LIST_LIMIT. */
const MOVED_ROWS = 15;
/** Findings listed under the policy table. */
const FINDING_LINES = 10;

/** A table cell: pipes and line breaks would break the row. */
const cell = (s: string): string => s.replace(/\\/g, "\\\\").replace(/\|/g, "\\|").replace(/\r?\n/g, " ");
const code = (s: string): string => `\`${s.replace(/`/g, "'")}\``;
const score = (x: number): string => x.toFixed(1);
const signed = (x: number, digits = 1): string => `${x > 0 ? "+" : x < 0 ? "−" : "±"}${Math.abs(x).toFixed(digits)}`;
const keys = (xs: readonly string[], total: number, max = 6): string => {
  const shown = xs.slice(0, max).map(code).join(", ");
  return total > max ? `${shown} and ${total - max} more` : shown;
};

export function impactMarkdown(report: ImpactReport, { file }: { file: string }): string {
  const lines: string[] = [];
  const verdict = !report.changed ? "no change" : report.blocked ? "**blocked**" : report.summary.policiesFailed ? "warnings" : "passes";
  lines.push(`### Pinchpoint: impact on ${code(report.environment)} — ${verdict}`, "", report.headline, "");

  lines.push("| Policy | Severity | Result |", "|---|---|---|");
  for (const p of report.policies) {
    const result = p.status === "off" ? "off" : p.status === "pass" ? "pass" : `**fails** (${p.findingsTotal} finding${p.findingsTotal === 1 ? "" : "s"})`;
    lines.push(`| ${cell(p.title)} | ${p.enabled ? p.severity : "—"} | ${result} |`);
  }
  const findings = report.policies.flatMap((p) => (p.status === "fail" ? p.findings.map((f) => ({ p, f })) : []));
  if (findings.length) {
    lines.push("");
    for (const { p, f } of findings.slice(0, FINDING_LINES)) {
      const at = f.at?.line ? `${code(`${f.at.file ?? file}:${f.at.line}${f.at.column ? `:${f.at.column}` : ""}`)} ` : "";
      lines.push(`- ${p.severity === "block" ? "**block**" : "warn"} ${at}${f.message}`);
    }
    if (findings.length > FINDING_LINES) lines.push(`- … and ${findings.length - FINDING_LINES} more in the SARIF file and the JSON answer`);
  }

  if (report.moved.length) {
    lines.push("", "#### What moved", "", "| Component | Tier | Pinch score | Rank |", "|---|---|---|---|");
    for (const m of report.moved.slice(0, MOVED_ROWS)) {
      const s =
        m.before && m.after
          ? `${score(m.before.pinchScore)} → ${score(m.after.pinchScore)} (${signed(m.after.pinchScore - m.before.pinchScore)})`
          : m.after
            ? `new: ${score(m.after.pinchScore)}`
            : `removed (was ${score(m.before!.pinchScore)})`;
      const r = m.before && m.after ? `${m.before.rank} → ${m.after.rank}` : m.after ? `new at ${m.after.rank}` : `was ${m.before!.rank}`;
      lines.push(`| ${code(m.key)} | ${m.tier ?? "—"} | ${s} | ${r} |`);
    }
    if (report.summary.moved > MOVED_ROWS) lines.push("", `… and ${report.summary.moved - MOVED_ROWS} more.`);
  }

  const other: string[] = [];
  const s = report.summary;
  if (s.articulationAdded || s.articulationRemoved) {
    other.push(
      `Articulation points: ${s.articulationAdded ? `new ${keys(report.articulation.added.map((a) => a.key), s.articulationAdded)}` : "none new"}` +
        (s.articulationRemoved ? `; no longer ${keys(report.articulation.removed.map((a) => a.key), s.articulationRemoved)}` : ""),
    );
  }
  if (s.bridgesAdded || s.bridgesRemoved) other.push(`Bridges: ${s.bridgesAdded} new, ${s.bridgesRemoved} gone.`);
  for (const c of report.hardCycles.added.slice(0, 3)) other.push(`New cycle of hard needs: ${keys(c.members, c.members.length, 8)}.`);
  if (s.hardCyclesRemoved) other.push(`Cycles of hard needs broken: ${s.hardCyclesRemoved}.`);
  for (const b of report.tier1Blast.slice(0, 5)) {
    const was = b.before ? b.before.down : "—";
    const now = b.after ? b.after.down : "—";
    const newly = b.newlyDownTotal ? `; newly down: ${keys(b.newlyDown ?? [], b.newlyDownTotal)}` : "";
    other.push(`Tier-1 ${code(b.key)} takes down ${was} → ${now}${newly}.`);
  }
  if (s.tier1BlastChanged > 5) other.push(`Blast radius changes for ${s.tier1BlastChanged - 5} more tier-1 components.`);
  for (const e of report.dominators.entries.slice(0, 3)) {
    const parts = [e.addedTotal ? `now cannot avoid ${keys(e.added.map((a) => a.key), e.addedTotal, 4)}` : "", e.removedTotal ? `no longer must pass ${keys(e.removed.map((a) => a.key), e.removedTotal, 4)}` : ""].filter(Boolean);
    if (parts.length) other.push(`Entry point ${code(e.entry)}${e.status === "new-entry" ? " (new)" : e.status === "no-longer-entry" ? " (no longer an entry)" : ""}: ${parts.join("; ")}.`);
  }
  if (s.dominatorEntriesChanged > 3) other.push(`Dominators change for ${s.dominatorEntriesChanged - 3} more entry points.`);
  if (other.length) lines.push("", "#### Other changes", "", ...other.map((o) => `- ${o}`));

  const basis =
    report.basis.snapshot === null
      ? "Compared with an empty environment."
      : `Compared with snapshot #${report.basis.snapshot} (${report.basis.analysis === "stored" ? "its stored analysis" : "analysed now"}).`;
  lines.push(
    "",
    `${basis} [Open ${report.environment} in Pinchpoint](${report.link}).`,
    "",
    "_Rankings are only as good as the inventory; this is a what-if on the declared graph, not a guarantee. Production changes follow your organisation's own processes._",
  );
  return `${lines.join("\n")}\n`;
}

