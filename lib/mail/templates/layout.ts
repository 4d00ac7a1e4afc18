// The shared frame of every Pinchpoint e-mail: plain text and HTML, both built from the same data.
// HTML e-mail needs inline styles and tables (most mail clients drop <style> and flexbox), so
// this is deliberately old-fashioned markup in the product's light palette. Markup is built with
// html`…` (./html.ts): every value is escaped unless it is markup itself, so helpers take text or
// Html and never a string that claims to be escaped already.
import { html, type Html, type HtmlValue } from "./html";

export interface MailContext {
  /** Base URL of the app (NEXTAUTH_URL), without a trailing slash. */
  appUrl: string;
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

/** A subject is one header line: line breaks would let data start new headers. */
export function subjectLine(value: string): string {
  return value.replace(/[\r\n\t]+/g, " ").replace(/\s{2,}/g, " ").trim().slice(0, 250);
}

/** An absolute link into the app; every path segment from data is percent-encoded. */
export function appLink(ctx: MailContext, segments: string[], query?: Record<string, string>): string {
  const base = ctx.appUrl.replace(/\/+$/, "");
  const path = segments.map((s) => encodeURIComponent(s)).join("/");
  const qs = query ? `?${new URLSearchParams(query).toString()}` : "";
  return `${base}/${path}${qs}`;
}

const COLOURS = {
  canvas: "#f4f1ea",
  surface: "#fbfaf6",
  line: "#d9d3c5",
  ink: "#1a2128",
  muted: "#4f5d68",
  faint: "#7b8791",
  brass: "#d9a441",
  onBrass: "#1b1406",
  down: "#d55e00",
} as const;

const FONT = "-apple-system, 'Segoe UI', Inter, Helvetica, Arial, sans-serif";
const MONO = "'JetBrains Mono', ui-monospace, Menlo, Consolas, monospace";

export const mono = (value: string | number): Html => html`<span style="font-family:${MONO};">${value}</span>`;

export function link(href: string, label: HtmlValue): Html {
  return html`<a href="${href}" style="color:inherit;">${label}</a>`;
}

export function button(href: string, label: string): Html {
  return html`<table role="presentation" cellpadding="0" cellspacing="0" style="margin:20px 0 4px;"><tr><td style="background:${COLOURS.brass};border-radius:6px;">
<a href="${href}" style="display:inline-block;padding:10px 18px;font-family:${FONT};font-size:14px;font-weight:600;color:${COLOURS.onBrass};text-decoration:none;">${label}</a>
</td></tr></table>`;
}

export function paragraph(content: HtmlValue): Html {
  return html`<p style="margin:0 0 12px;font-family:${FONT};font-size:15px;line-height:1.5;color:${COLOURS.ink};">${content}</p>`;
}

export function heading2(content: HtmlValue): Html {
  return html`<h2 style="margin:20px 0 8px;font-family:${FONT};font-size:16px;line-height:1.3;color:${COLOURS.ink};">${content}</h2>`;
}

export function note(content: HtmlValue): Html {
  return html`<p style="margin:16px 0 0;font-family:${FONT};font-size:13px;line-height:1.5;color:${COLOURS.muted};">${content}</p>`;
}

/** Smaller, muted text inside a cell. */
export const small = (content: HtmlValue): Html => html`<span style="font-size:12px;color:${COLOURS.muted};">${content}</span>`;

/** A small table: header cells and rows of cells (text or markup). */
export function table(headers: string[], rows: HtmlValue[][]): Html {
  const th = headers.map(
    (h) => html`<th align="left" style="padding:6px 10px;border-bottom:1px solid ${COLOURS.line};font-family:${FONT};font-size:12px;font-weight:600;text-transform:uppercase;letter-spacing:0.04em;color:${COLOURS.faint};">${h}</th>`,
  );
  const tr = rows.map(
    (cells) => html`<tr>${cells.map((c) => html`<td style="padding:8px 10px;border-bottom:1px solid ${COLOURS.line};font-family:${FONT};font-size:14px;color:${COLOURS.ink};vertical-align:top;">${c}</td>`)}</tr>`,
  );
  return html`<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="border-collapse:collapse;margin:8px 0 4px;">${th.length ? html`<tr>${th}</tr>` : ""}${tr}</table>`;
}

/** The whole HTML document: a brass rule, the wordmark, a heading, the body, a footer line. */
export function htmlDocument({ heading, body, footer }: { heading: string; body: HtmlValue; footer: string }): string {
  return html`<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${heading}</title></head>
<body style="margin:0;padding:0;background:${COLOURS.canvas};">
<table role="presentation" cellpadding="0" cellspacing="0" width="100%" style="background:${COLOURS.canvas};"><tr><td align="center" style="padding:24px 12px;">
<table role="presentation" cellpadding="0" cellspacing="0" width="600" style="max-width:600px;width:100%;background:${COLOURS.surface};border:1px solid ${COLOURS.line};border-top:4px solid ${COLOURS.brass};border-radius:6px;">
<tr><td style="padding:18px 24px 0;font-family:${MONO};font-size:13px;font-weight:700;letter-spacing:0.08em;text-transform:uppercase;color:${COLOURS.muted};">Pinchpoint</td></tr>
<tr><td style="padding:8px 24px 4px;"><h1 style="margin:0 0 12px;font-family:${FONT};font-size:20px;line-height:1.3;color:${COLOURS.ink};">${heading}</h1></td></tr>
<tr><td style="padding:0 24px 20px;">${body}</td></tr>
<tr><td style="padding:12px 24px;border-top:1px solid ${COLOURS.line};font-family:${FONT};font-size:12px;line-height:1.5;color:${COLOURS.faint};">${footer}</td></tr>
</table></td></tr></table>
</body></html>`.toString();
}

/** Plain-text version: the same heading, paragraphs separated by blank lines, the footer after a rule. */
export function textDocument({ heading, blocks, footer }: { heading: string; blocks: string[]; footer: string }): string {
  return [heading, "=".repeat(Math.min(heading.length, 72)), "", ...blocks.flatMap((b) => [b, ""]), "--", footer, ""].join("\n");
}

export const formatScore = (score: number) => (Number.isFinite(score) ? score.toFixed(1) : "n/a");
