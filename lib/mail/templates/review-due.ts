// "Your risk review has come up": to the reviewer when a review-by date is reached or passed.
import { html, lines } from "./html";
import { appLink, button, htmlDocument, mono, note, paragraph, subjectLine, textDocument, type MailContext, type RenderedMail } from "./layout";

export interface ReviewDueData {
  environment: { slug: string; name: string };
  component: { key: string; name: string };
  status: string;
  /** calendar date, YYYY-MM-DD */
  reviewBy: string;
  /** true when the date is before today, false when it is today */
  overdue: boolean;
  rationale: string | null;
}

export function reviewDue(data: ReviewDueData, ctx: MailContext): RenderedMail {
  const { environment: env, component } = data;
  const link = appLink(ctx, ["environments", env.slug, "components", component.key]);
  const when = data.overdue ? `was due on ${data.reviewBy}` : `is due today, ${data.reviewBy}`;
  const heading = `Risk review of ${component.key} ${data.overdue ? "is overdue" : "is due"}`;
  const footer = "You receive this because you are the reviewer named on this risk review. You are told once per review-by date; set a new date when you have looked again.";
  const rationale = data.rationale?.trim() ? data.rationale.trim() : null;
  return {
    subject: subjectLine(`[Pinchpoint] Risk review of ${component.key} in ${env.slug} ${data.overdue ? `overdue since ${data.reviewBy}` : `due ${data.reviewBy}`}`),
    text: textDocument({
      heading,
      blocks: [
        `The risk review of ${component.name && component.name !== component.key ? `${component.name} (${component.key})` : component.key} in ${env.name} (${env.slug}) ${when}.`,
        `Current decision: ${data.status}.`,
        ...(rationale ? [`Rationale on record:\n${rationale}`] : []),
        "Look at the component's current rank and blast radius, then confirm or change the decision and set the next review date.",
        `Component page: ${link}`,
      ],
      footer,
    }),
    html: htmlDocument({
      heading,
      body: [
        paragraph(html`The risk review of ${component.name || component.key} ${mono(component.key)} in <strong>${env.name}</strong> ${when}.`),
        paragraph(html`Current decision: <strong>${data.status}</strong>.`),
        rationale && paragraph(html`Rationale on record:<br>${lines(rationale)}`),
        paragraph("Look at the component's current rank and blast radius, then confirm or change the decision and set the next review date."),
        button(link, "Open the review"),
        note(`Or paste this link: ${link}`),
      ],
      footer,
    }),
  };
}
