// "Your team now owns this component": to the team's address when an owner is assigned.
import { html } from "./html";
import { appLink, button, htmlDocument, mono, note, paragraph, subjectLine, textDocument, type MailContext, type RenderedMail } from "./layout";

export interface OwnerAssignedData {
  environment: { slug: string; name: string };
  component: { key: string; name: string };
  team: { slug: string; name: string };
  /** who made the change, as the audit log names them */
  actorLabel: string;
}

export function ownerAssigned(data: OwnerAssignedData, ctx: MailContext): RenderedMail {
  const { environment: env, component, team } = data;
  const link = appLink(ctx, ["environments", env.slug, "components", component.key]);
  const label = component.name && component.name !== component.key ? `${component.name} (${component.key})` : component.key;
  const heading = `${team.name} now owns ${component.name || component.key}`;
  const footer = `You receive this because it is the address of team ${team.slug} in Pinchpoint. Ownership is changed on the component page by a lead of the team, an architect or an admin.`;
  return {
    subject: subjectLine(`[Pinchpoint] ${team.name} now owns ${component.key} in ${env.slug}`),
    text: textDocument({
      heading,
      blocks: [
        `${data.actorLabel} assigned ${label} in environment ${env.name} (${env.slug}) to team ${team.name} (${team.slug}).`,
        "Pages about this component, its blast radius and its drills now name your team. Check that its runbook and on-call details are yours.",
        `Component page: ${link}`,
      ],
      footer,
    }),
    html: htmlDocument({
      heading,
      body: [
        paragraph(html`${data.actorLabel} assigned ${component.name || component.key} ${mono(component.key)} in environment <strong>${env.name}</strong> to team <strong>${team.name}</strong>.`),
        paragraph("Pages about this component, its blast radius and its drills now name your team. Check that its runbook and on-call details are yours."),
        button(link, "Open the component"),
        note(`Or paste this link: ${link}`),
      ],
      footer,
    }),
  };
}
