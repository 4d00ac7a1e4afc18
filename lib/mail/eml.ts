// A small reader for the .eml files the local sink keeps. `mailparser` is not installed (and
// would be the right choice for arbitrary mail); the sink only ever holds what our own nodemailer
// composes — MIME (RFC 2045/2046) with multipart/alternative text and HTML, quoted-printable or
// base64 bodies, and RFC 2047 encoded words in headers — and that much is read here.

export interface ParsedMail {
  headers: Map<string, string>;
  from: string;
  to: string;
  subject: string;
  date: Date | null;
  text: string | null;
  html: string | null;
}

interface Part {
  headers: Map<string, string>;
  /** body as a binary (latin1) string, one char per byte */
  body: string;
}

function splitHead(raw: string): Part {
  const match = /\r?\n\r?\n/.exec(raw);
  const head = match ? raw.slice(0, match.index) : raw;
  const body = match ? raw.slice(match.index + match[0].length) : "";
  const headers = new Map<string, string>();
  // Unfold (RFC 5322 §2.2.3): a line starting with white space continues the previous header.
  for (const line of head.split(/\r?\n(?![ \t])/)) {
    const colon = line.indexOf(":");
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).replace(/\r?\n[ \t]+/g, " ").trim());
  }
  return { headers, body };
}

function decodeBytes(binary: string, charset: string): string {
  const bytes = Uint8Array.from(binary, (c) => c.charCodeAt(0));
  try {
    return new TextDecoder(charset || "utf-8").decode(bytes);
  } catch {
    return new TextDecoder("utf-8").decode(bytes);
  }
}

const fromBase64 = (s: string) => Buffer.from(s.replace(/[^A-Za-z0-9+/=]/g, ""), "base64").toString("latin1");

/** Quoted-printable (RFC 2045 §6.7): `=XX` bytes and `=` soft line breaks. */
export function decodeQuotedPrintable(s: string): string {
  return s.replace(/[ \t]+(?=\r?\n)/g, "").replace(/=\r?\n/g, "").replace(/=([0-9A-Fa-f]{2})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16)));
}

/** Encoded words in headers (RFC 2047): =?charset?B|Q?text?=; white space between two of them is dropped. */
export function decodeWords(value: string): string {
  return value
    .replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?[^?]+\?[BbQq]\?[^?]*\?=)/g, "$1")
    .replace(/=\?([^?*]+)(?:\*[^?]*)?\?([BbQq])\?([^?]*)\?=/g, (_, charset: string, enc: string, text: string) => {
      const binary = enc.toUpperCase() === "B" ? fromBase64(text) : decodeQuotedPrintable(text.replace(/_/g, " "));
      return decodeBytes(binary, charset);
    });
}

/** `type/subtype; a=b; c="d"` → type and lower-cased parameter names. */
function contentType(value: string | undefined): { type: string; params: Map<string, string> } {
  const [type = "text/plain", ...rest] = (value ?? "text/plain").split(";");
  const params = new Map<string, string>();
  for (const p of rest) {
    const eq = p.indexOf("=");
    if (eq > 0) params.set(p.slice(0, eq).trim().toLowerCase(), p.slice(eq + 1).trim().replace(/^"(.*)"$/, "$1"));
  }
  return { type: type.trim().toLowerCase(), params };
}

function decodeBody(part: Part): string {
  const encoding = (part.headers.get("content-transfer-encoding") ?? "7bit").toLowerCase();
  const binary = encoding === "base64" ? fromBase64(part.body) : encoding === "quoted-printable" ? decodeQuotedPrintable(part.body) : part.body;
  return decodeBytes(binary, contentType(part.headers.get("content-type")).params.get("charset") ?? "utf-8");
}

function walk(part: Part, found: { text: string | null; html: string | null }, depth = 0): void {
  const { type, params } = contentType(part.headers.get("content-type"));
  if ((part.headers.get("content-disposition") ?? "").toLowerCase().startsWith("attachment")) return;
  const boundary = params.get("boundary");
  if (type.startsWith("multipart/") && boundary && depth < 5) {
    const delimiter = `--${boundary}`;
    const end = part.body.indexOf(`${delimiter}--`);
    const inner = end >= 0 ? part.body.slice(0, end) : part.body;
    // The text before the first delimiter is the preamble, which readers ignore (RFC 2046 §5.1.1).
    for (const chunk of inner.split(delimiter).slice(1)) walk(splitHead(chunk.replace(/^\r?\n/, "").replace(/\r?\n$/, "")), found, depth + 1);
    return;
  }
  if (type === "text/plain" && found.text === null) found.text = decodeBody(part);
  else if (type === "text/html" && found.html === null) found.html = decodeBody(part);
}

export function parseEml(raw: Buffer | string): ParsedMail {
  const top = splitHead(typeof raw === "string" ? Buffer.from(raw, "utf8").toString("latin1") : raw.toString("latin1"));
  // Headers may carry raw UTF-8 (RFC 6532); read them as UTF-8 before decoding encoded words.
  const headers = new Map([...top.headers].map(([k, v]) => [k, decodeWords(decodeBytes(v, "utf-8"))]));
  const found = { text: null as string | null, html: null as string | null };
  walk(top, found);
  const dateHeader = headers.get("date");
  const date = dateHeader ? new Date(dateHeader) : null;
  return {
    headers,
    from: headers.get("from") ?? "",
    to: headers.get("to") ?? "",
    subject: headers.get("subject") ?? "",
    date: date && !Number.isNaN(date.getTime()) ? date : null,
    text: found.text,
    html: found.html,
  };
}
