// "Set a password to join": to someone an admin invited, with a one-time link.
import { button, htmlDocument, note, paragraph, subjectLine, textDocument, type MailContext, type RenderedMail } from "./layout";

export interface InviteData {
  /** absolute http(s) URL of the one-time link (see lib/mail/notices.ts, which resolves relative links) */
  link: string;
  invitedBy?: string | null;
  expiresAt?: Date | null;
}

export function invite(data: InviteData, _ctx: MailContext): RenderedMail {
  if (!/^https?:\/\//i.test(data.link)) throw new Error("invite link must be an absolute http(s) URL");
  const by = data.invitedBy ? `${data.invitedBy} invited you` : "You have been invited";
  const expiry = data.expiresAt ? `The link works once and expires on ${data.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC.` : "The link works once.";
  const heading = "You are invited to Pinchpoint";
  const footer = "If you did not expect this invitation, ignore this message: nothing happens until the link is used.";
  const intro = `${by} to Pinchpoint, where your organisation keeps its service-dependency map and the ranked list of its single points of failure.`;
  return {
    subject: subjectLine("[Pinchpoint] You are invited: set your password"),
    text: textDocument({ heading, blocks: [intro, `Set your password here:\n${data.link}`, expiry], footer }),
    html: htmlDocument({
      heading,
      body: [paragraph(intro), button(data.link, "Set your password"), note(`${expiry} Or paste this link: ${data.link}`)],
      footer,
    }),
  };
}
