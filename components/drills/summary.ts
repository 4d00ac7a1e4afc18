// The incident summary a responder pastes into a channel: plain text, no markup, most urgent first.
import { dateTime, percent } from "@/components/ui/format";
import type { DrillResponse } from "@/lib/api/schemas/analysis";

type TeamEntry = DrillResponse["teams"][number];

/**
 * Who to page, in order: the team owning what failed first (they fix it), then the other teams by how
 * much of theirs is down, then degraded; what nobody owns comes last, since nobody can be paged for it.
 */
export function drillPageOrder(result: Pick<DrillResponse, "teams" | "failed">): TeamEntry[] {
  const failed = new Set(result.failed.components);
  const owners = (t: TeamEntry) => t.team !== null && t.down.some((k) => failed.has(k));
  return [...result.teams].sort(
    (a, b) =>
      Number(owners(b)) - Number(owners(a)) ||
      Number(a.team === null) - Number(b.team === null) ||
      b.down.length - a.down.length ||
      b.degraded.length - a.degraded.length ||
      (a.team ?? "").localeCompare(b.team ?? ""),
  );
}

/** The failed components and zones in words: "component payment-db and zone harbor-east". */
export function failedWords(failed: DrillResponse["failed"]): string {
  return [failed.components.length ? `component${failed.components.length > 1 ? "s" : ""} ${failed.components.join(", ")}` : "", failed.zones.length ? `zone${failed.zones.length > 1 ? "s" : ""} ${failed.zones.join(", ")}` : ""].filter(Boolean).join(" and ");
}

export function incidentSummary({
  env,
  result,
  link,
  undeclared,
  tierOf = () => undefined,
  outage = false,
  now = new Date(),
}: {
  env: string;
  result: DrillResponse;
  link: string;
  undeclared: ReadonlySet<string>;
  /** the tier of a component, when the graph is at hand */
  tierOf?: (key: string) => number | undefined;
  /** opened as "this is down" rather than rehearsed */
  outage?: boolean;
  now?: Date;
}): string {
  const lines: string[] = [];
  const { failed } = result;
  const what = failedWords(failed);
  const one = failed.components.length + failed.zones.length === 1;
  // Absolute UTC times: a pasted summary is read later, when "5 min ago" would be wrong.
  lines.push(outage ? `Pinchpoint outage view, ${env}, ${dateTime(now)}: ${what} ${one ? "is" : "are"} down` : `Pinchpoint drill, ${env}: if ${what} fail${one ? "s" : ""}`);
  const tiers = (["1", "2", "3", "4"] as const).map((t) => `tier ${t}: ${result.byTier[t]}`).join(", ");
  lines.push(`Down (incl. what failed): ${result.down.length} (${tiers}). Degraded: ${result.degraded.length}.`);
  const tier1 = result.down.filter((k) => tierOf(k) === 1 && !failed.components.includes(k));
  if (tier1.length) lines.push(`Tier 1 down with it: ${tier1.slice(0, 20).join(", ")}${tier1.length > 20 ? `, and ${tier1.length - 20} more` : ""}`);
  const placeholders = result.down.filter((k) => undeclared.has(k));
  if (placeholders.length) lines.push(`Includes ${placeholders.length} undeclared (needed by something, declared by no source): ${placeholders.join(", ")}`);
  lines.push("");
  lines.push("Teams to page, owners of what failed first, then most affected:");
  for (const t of drillPageOrder(result)) {
    const counts = `${t.down.length} down, ${t.degraded.length} degraded`;
    if (!t.team) {
      lines.push(`- unowned, nobody is paged: ${counts} — ${[...t.down, ...t.degraded].slice(0, 10).join(", ")}${t.down.length + t.degraded.length > 10 ? ", …" : ""}`);
      continue;
    }
    const contact = t.contact ? [t.contact.oncall ? `on-call ${t.contact.oncall}` : "", t.contact.email ?? ""].filter(Boolean).join(", ") : "no contact on file";
    lines.push(`- ${t.contact?.name ?? t.team} (${t.team}): ${counts}; ${contact}`);
  }
  lines.push("");
  const { snapshot } = result;
  lines.push(`From snapshot #${snapshot.number}, pushed ${dateTime(snapshot.createdAt)}; ${percent(snapshot.undeclaredShare)} of its ${snapshot.components} components are undeclared.`);
  lines.push(
    outage
      ? "This follows the declared dependencies only; what is really down may differ. Act through your own incident process."
      : "A drill follows the declared dependencies only; it is not a guarantee of what an outage does. Act through your own incident process.",
  );
  lines.push(link);
  return lines.join("\n");
}
