// Every e-mail Pinchpoint sends, by name. Templates are pure: data in, subject + text + HTML out.
import { invite } from "./invite";
import type { MailContext, RenderedMail } from "./layout";
import { newTopTen } from "./new-top-ten";
import { ownerAssigned } from "./owner-assigned";
import { reviewDue } from "./review-due";
import { riskDigest } from "./risk-digest";

const TEMPLATES = { ownerAssigned, newTopTen, reviewDue, invite, riskDigest } as const;

export type TemplateName = keyof typeof TEMPLATES;
export type TemplateData<T extends TemplateName> = Parameters<(typeof TEMPLATES)[T]>[0];

export function renderMail<T extends TemplateName>(template: T, data: TemplateData<T>, ctx: MailContext): RenderedMail {
  // TypeScript cannot narrow a generic index into a union of functions; the map above fixes the pairing.
  const render = TEMPLATES[template] as (d: TemplateData<T>, c: MailContext) => RenderedMail;
  return render(data, ctx);
}

export type { MailContext, RenderedMail } from "./layout";
export type { TopTenEntry } from "./new-top-ten";
