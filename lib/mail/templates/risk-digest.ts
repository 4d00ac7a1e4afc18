// The weekly risk digest, to every architect: per environment, the components whose pinch score
// moved the most over the week, risk reviews past their review-by date, and components that became
// single points of failure (one replica or fewer than two zones, with something that goes down with
// them). Sent by the scheduler (lib/jobs/schedules.ts).
import { html } from "./html";
import { appLink, button, formatScore, heading2, htmlDocument, link, mono, note, paragraph, small, subjectLine, table, textDocument, type MailContext, type RenderedMail } from "./layout";

interface DigestMover {
  key: string;
  name: string;
  before: number;
  after: number;
  /** competition rank by pinch score (1 = highest); null when not ranked */
  rankBefore: number | null;
  rankAfter: number | null;
}

interface DigestOverdueReview {
  key: string;
  name: string;
  status: string;
  /** YYYY-MM-DD */
  reviewBy: string;
  reviewer: string | null;
}

interface DigestSinglePoint {
  key: string;
  name: string;
  blastDown: number;
  team: string | null;
}

interface DigestEnvironment {
  environment: { slug: string; name: string };
  snapshotNumber: number;
  /** the analysed snapshot compared with (the newest one at least a week old, else the oldest in the week); null for the first */
  baselineNumber: number | null;
  movers: DigestMover[];
  overdueReviews: DigestOverdueReview[];
  newSinglePoints: DigestSinglePoint[];
}

export interface RiskDigestData {
  /** ISO week, e.g. 2030-W23 */
  week: string;
  environments: DigestEnvironment[];
}

const CAUTION =
  "Rankings are only as good as the inventory they are computed from: a score moves when the estate changes and when its description does. A single point here is the analysis' rule (one replica or fewer than two zones), not a verified fact.";

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
const signed = (d: number) => `${d >= 0 ? "+" : "−"}${Math.abs(d).toFixed(1)}`;
const rankText = (r: number | null) => (r === null ? "–" : `#${r}`);
const label = (key: string, name: string) => (name && name !== key ? `${key} (${name})` : key);

export function riskDigest(data: RiskDigestData, ctx: MailContext): RenderedMail {
  const totals = data.environments.reduce(
    (t, e) => ({ movers: t.movers + e.movers.length, overdue: t.overdue + e.overdueReviews.length, single: t.single + e.newSinglePoints.length }),
    { movers: 0, overdue: 0, single: 0 },
  );
  const summary = `${plural(totals.movers, "mover", "movers")}, ${plural(totals.overdue, "overdue review", "overdue reviews")}, ${plural(totals.single, "new single point of failure", "new single points of failure")}`;
  const heading = `Risk digest for ${data.week}`;
  const footer = "You receive this every week because you are an architect in Pinchpoint. Reviews are updated on each component's page.";

  const textSections = data.environments.map((e) => {
    const env = e.environment;
    const compared = e.baselineNumber === null ? `snapshot ${e.snapshotNumber} (no earlier analysis to compare with)` : `snapshot ${e.snapshotNumber} against snapshot ${e.baselineNumber}`;
    const parts = [`${env.name} (${env.slug}): ${compared}`];
    if (e.movers.length) {
      parts.push(
        ["Top movers in pinch score:", ...e.movers.map((m) => `  ${label(m.key, m.name)}: ${formatScore(m.before)} → ${formatScore(m.after)} (${signed(m.after - m.before)}), rank ${rankText(m.rankBefore)} → ${rankText(m.rankAfter)}`)].join("\n"),
      );
    }
    if (e.overdueReviews.length) {
      parts.push(["Overdue risk reviews:", ...e.overdueReviews.map((r) => `  ${label(r.key, r.name)}: ${r.status}, review by ${r.reviewBy}${r.reviewer ? `, reviewer ${r.reviewer}` : ", no reviewer"}`)].join("\n"));
    }
    if (e.newSinglePoints.length) {
      parts.push(["New single points of failure:", ...e.newSinglePoints.map((s) => `  ${label(s.key, s.name)}: takes ${s.blastDown} down, ${s.team ? `team ${s.team}` : "unowned"}`)].join("\n"));
    }
    parts.push(`Pinch points: ${appLink(ctx, ["environments", env.slug, "pinch-points"])}`);
    return parts.join("\n\n");
  });

  const componentLink = (slug: string, key: string) => link(appLink(ctx, ["environments", slug, "components", key]), mono(key));
  const htmlSections = data.environments.map((e) => {
    const env = e.environment;
    return [
      heading2(html`${env.name} ${small(env.slug)}`),
      paragraph(
        e.baselineNumber === null
          ? html`Snapshot ${mono(e.snapshotNumber)}; no earlier analysis to compare with.`
          : html`Snapshot ${mono(e.snapshotNumber)} against snapshot ${mono(e.baselineNumber)}.`,
      ),
      e.movers.length > 0 &&
        table(
          ["Top mover", "Pinch score", "Rank"],
          e.movers.map((m) => [
            html`${componentLink(env.slug, m.key)}${m.name !== m.key && html`<br>${small(m.name)}`}`,
            html`${mono(formatScore(m.before))} → ${mono(formatScore(m.after))} ${small(signed(m.after - m.before))}`,
            html`${rankText(m.rankBefore)} → ${rankText(m.rankAfter)}`,
          ]),
        ),
      e.overdueReviews.length > 0 &&
        table(
          ["Overdue review", "Decision", "Review by", "Reviewer"],
          e.overdueReviews.map((r) => [componentLink(env.slug, r.key), r.status, mono(r.reviewBy), r.reviewer ?? html`<em>none</em>`]),
        ),
      e.newSinglePoints.length > 0 &&
        table(
          ["New single point", "Takes down", "Owner"],
          e.newSinglePoints.map((s) => [componentLink(env.slug, s.key), mono(s.blastDown), s.team ?? html`<em>unowned</em>`]),
        ),
      button(appLink(ctx, ["environments", env.slug, "pinch-points"]), `Open the pinch points of ${env.slug}`),
    ];
  });

  return {
    subject: subjectLine(`[Pinchpoint] Weekly risk digest, ${data.week}: ${summary}`),
    text: textDocument({ heading, blocks: [`This week: ${summary}.`, ...textSections, CAUTION], footer }),
    html: htmlDocument({ heading, body: [paragraph(`This week: ${summary}.`), htmlSections, note(CAUTION)], footer }),
  };
}
