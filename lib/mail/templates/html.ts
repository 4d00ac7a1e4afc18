// HTML that escapes by default. Every value put into html`…` is escaped unless it is itself the
// result of html`…` (or of a helper built on it), so a template cannot forget to escape data and no
// function takes "already escaped" strings.
//
// Our own few lines rather than a package: React escapes the same way, but react-dom/server is
// refused where notices are queued (route handlers run under the react-server condition), and the
// tagged-template packages either escape nested fragments twice or keep a raw-string escape hatch,
// which is what this replaces.

export class Html {
  readonly #markup: string;
  constructor(markup: string) {
    this.#markup = markup;
  }
  toString(): string {
    return this.#markup;
  }
}

export type HtmlValue = Html | string | number | boolean | null | undefined | readonly HtmlValue[];

// Five replacements cover HTML text and quoted attribute values (OWASP XSS prevention cheat sheet,
// rules 1 and 2).
const ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
const escapeText = (value: string): string => value.replace(/[&<>"']/g, (c) => ESCAPES[c] ?? c);

function render(value: HtmlValue): string {
  if (value instanceof Html) return value.toString();
  if (Array.isArray(value)) return value.map(render).join("");
  // null, undefined and false render nothing, so `cond && html\`…\`` works inside a template.
  if (value === null || value === undefined || value === false) return "";
  return escapeText(String(value));
}

export function html(strings: TemplateStringsArray, ...values: HtmlValue[]): Html {
  let out = strings[0] ?? "";
  values.forEach((value, i) => {
    out += render(value) + (strings[i + 1] ?? "");
  });
  return new Html(out);
}

/** Plain text as HTML text: escaped, line breaks kept as <br>. */
export function lines(text: string): Html {
  return html`${text.split(/\r?\n/).map((line, i) => (i ? [html`<br>`, line] : line))}`;
}
