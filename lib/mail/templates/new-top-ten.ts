// "These components entered the top ten by pinch score": to the owning team and to architects,
// after an analysis of a new snapshot finishes.
import { html } from "./html";
import { appLink, button, formatScore, htmlDocument, link, mono, note, paragraph, small, subjectLine, table, textDocument, type MailContext, type RenderedMail } from "./layout";

export interface TopTenEntry {
  key: string;
  name: string;
  /** 1…10, by pinch score in the new snapshot */
  position: number;
  pinchScore: number;
  blastDown: number;
  blastDegraded: number;
  /** effective owner team slug, null when unowned */
  team: string | null;
}

export interface NewTopTenData {
  environment: { slug: string; name: string };
  snapshotNumber: number;
  /** "team": the owners of the listed components; "architects": everyone reviewing risks */
  audience: { kind: "team"; teamName: string } | { kind: "architects" };
  entries: TopTenEntry[];
}

const CAUTION = "Rankings are only as good as the inventory they are computed from; a component may rank lower simply because its dependents are not declared yet.";

export function newTopTen(data: NewTopTenData, ctx: MailContext): RenderedMail {
  const { environment: env, entries } = data;
  const pinchPoints = appLink(ctx, ["environments", env.slug, "pinch-points"]);
  const first = entries[0];
  const subject =
    entries.length === 1 && first
      ? `[Pinchpoint] ${first.key} entered the top ten pinch points in ${env.slug}`
      : `[Pinchpoint] ${entries.length} components entered the top ten pinch points in ${env.slug}`;
  const heading = entries.length === 1 ? "A component entered the top ten pinch points" : `${entries.length} components entered the top ten pinch points`;
  const intro =
    data.audience.kind === "team"
      ? `Snapshot ${data.snapshotNumber} of ${env.name} (${env.slug}) puts ${entries.length === 1 ? "a component" : "components"} owned by ${data.audience.teamName} among the ten highest pinch scores.`
      : `Snapshot ${data.snapshotNumber} of ${env.name} (${env.slug}) has ${entries.length === 1 ? "a newcomer" : "newcomers"} among the ten highest pinch scores.`;
  const footer =
    data.audience.kind === "team"
      ? "You receive this because your team owns the components listed. Consider a risk review with your architects."
      : "You receive this because you are an architect in Pinchpoint. A risk review records whether the risk is accepted, being mitigated or resolved.";
  const lines = entries.map((e) => {
    const owner = e.team ? `team ${e.team}` : "unowned";
    return `#${e.position}  ${e.key}${e.name && e.name !== e.key ? ` (${e.name})` : ""}: pinch score ${formatScore(e.pinchScore)}, blast radius ${e.blastDown} down / ${e.blastDegraded} degraded, ${owner}\n    ${appLink(ctx, ["environments", env.slug, "components", e.key])}`;
  });
  const rows = entries.map((e) => [
    mono(`#${e.position}`),
    html`${link(appLink(ctx, ["environments", env.slug, "components", e.key]), mono(e.key))}${e.name && e.name !== e.key && html`<br>${small(e.name)}`}`,
    mono(formatScore(e.pinchScore)),
    html`${mono(e.blastDown)} down, ${mono(e.blastDegraded)} degraded`,
    e.team ?? html`<em>unowned</em>`,
  ]);
  return {
    subject: subjectLine(subject),
    text: textDocument({ heading, blocks: [intro, lines.join("\n"), `Pinch points: ${pinchPoints}`, CAUTION], footer }),
    html: htmlDocument({
      heading,
      body: [
        paragraph(intro),
        table(["Place", "Component", "Pinch score", "Blast radius", "Owner"], rows),
        button(pinchPoints, "Open the pinch points"),
        note(CAUTION),
      ],
      footer,
    }),
  };
}
