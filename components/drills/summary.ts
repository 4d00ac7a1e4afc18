// The incident summary a responder pastes into a channel: plain text, no markup, most urgent first.
import { dateTime, percent } from "@/components/ui/format";
import type { DrillResponse } from "@/lib/api/schemas/analysis";


export function incidentSummary({ env, result, link, undeclared }: { env: string; result: DrillResponse; link: string; undeclared: ReadonlySet<string> }): string {
  const lines: string[] = [];
  const { failed } = result;
  const what = [failed.components.length ? `component${failed.components.length > 1 ? "s" : ""} ${failed.components.join(", ")}` : "", failed.zones.length ? `zone${failed.zones.length > 1 ? "s" : ""} ${failed.zones.join(", ")}` : ""].filter(Boolean).join(" and ");
  lines.push(`Pinchpoint drill, ${env}: if ${what} fail${failed.components.length + failed.zones.length === 1 ? "s" : ""}`);
  const tiers = (["1", "2", "3", "4"] as const).map((t) => `tier ${t}: ${result.byTier[t]}`).join(", ");
  lines.push(`Down (incl. what failed): ${result.down.length} (${tiers}). Degraded: ${result.degraded.length}.`);
  const placeholders = result.down.filter((k) => undeclared.has(k));
  if (placeholders.length) lines.push(`Includes ${placeholders.length} undeclared (needed by something, declared by no source): ${placeholders.join(", ")}`);
  lines.push("");
  lines.push("Teams to page, unowned first, then most affected:");
  for (const t of result.teams) {
    const counts = `${t.down.length} down, ${t.degraded.length} degraded`;
    if (!t.team) {
      lines.push(`- unowned, nobody is paged: ${counts} — ${[...t.down, ...t.degraded].slice(0, 10).join(", ")}${t.down.length + t.degraded.length > 10 ? ", …" : ""}`);
      continue;
    }
    const contact = t.contact ? [t.contact.oncall ? `on-call ${t.contact.oncall}` : "", t.contact.email ?? ""].filter(Boolean).join(", ") : "no contact on file";
    lines.push(`- ${t.contact?.name ?? t.team} (${t.team}): ${counts}; ${contact}`);
  }
  lines.push("");
  // Absolute UTC time: a pasted summary is read later, when "5 min ago" would be wrong.
  const { snapshot } = result;
  lines.push(`From snapshot #${snapshot.number}, pushed ${dateTime(snapshot.createdAt)}; ${percent(snapshot.undeclaredShare)} of its ${snapshot.components} components are undeclared.`);
  lines.push("A drill follows the declared dependencies only; it is not a guarantee of what an outage does. Act through your own incident process.");
  lines.push(link);
  return lines.join("\n");
}
