// Reading the sink's folder for the admin mail page: newest first, one message in full. Messages
// are parsed with mailparser (MIME, transfer encodings, RFC 2047 words, charsets).
import "server-only";
import { readdir, readFile, stat } from "node:fs/promises";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";

/** What the mail page and the tests read of a kept message. */
interface ParsedMail {
  /** header names lower-cased, values as text */
  headers: Map<string, string>;
  from: string;
  to: string;
  subject: string;
  date: Date | null;
  text: string | null;
  html: string | null;
}

const addresses = (value: AddressObject | AddressObject[] | undefined): string =>
  (Array.isArray(value) ? value : value ? [value] : []).flatMap((a) => a.value.map((v) => (v.name ? `${v.name} <${v.address ?? ""}>` : (v.address ?? "")))).join(", ");

/** Parse one stored message (.eml). */
export async function parseMessage(raw: Buffer | string): Promise<ParsedMail> {
  const mail = await simpleParser(raw, { skipImageLinks: true, skipTextToHtml: true, skipTextLinks: true });
  const headers = new Map<string, string>();
  for (const line of mail.headerLines) headers.set(line.key, line.line.slice(line.line.indexOf(":") + 1).trim());
  return {
    headers,
    from: addresses(mail.from),
    to: addresses(mail.to),
    subject: mail.subject ?? "",
    date: mail.date && !Number.isNaN(mail.date.getTime()) ? mail.date : null,
    text: mail.text ?? null,
    html: mail.html === false ? null : (mail.html ?? null),
  };
}

export interface SinkMessageSummary {
  id: string;
  from: string;
  to: string;
  subject: string;
  date: Date | null;
  bytes: number;
}

export interface SinkMessage extends SinkMessageSummary {
  text: string | null;
  html: string | null;
}

// Ids come from the URL: only plain file names of the sink's own shape, never a path.
const ID = /^[A-Za-z0-9_-]{1,120}$/;
export const isSinkMessageId = (id: string) => ID.test(id);

async function load(dir: string, id: string): Promise<{ parsed: ParsedMail; bytes: number } | null> {
  if (!isSinkMessageId(id)) return null;
  const file = path.join(dir, `${id}.eml`);
  try {
    const [raw, info] = await Promise.all([readFile(file), stat(file)]);
    return { parsed: await parseMessage(raw), bytes: info.size };
  } catch {
    return null;
  }
}

const summary = (id: string, parsed: ParsedMail, bytes: number): SinkMessageSummary => ({ id, from: parsed.from, to: parsed.to, subject: parsed.subject, date: parsed.date, bytes });

/** The newest `limit` messages (file names start with the arrival time, so name order is time order). */
export async function listSinkMessages({ dir, limit = 100 }: { dir: string; limit?: number }): Promise<{ items: SinkMessageSummary[]; total: number }> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".eml") && isSinkMessageId(n.slice(0, -4)));
  } catch {
    return { items: [], total: 0 };
  }
  names.sort().reverse();
  const items: SinkMessageSummary[] = [];
  for (const name of names.slice(0, limit)) {
    const id = name.slice(0, -4);
    const loaded = await load(dir, id);
    if (loaded) items.push(summary(id, loaded.parsed, loaded.bytes));
  }
  return { items, total: names.length };
}

export async function readSinkMessage({ dir, id }: { dir: string; id: string }): Promise<SinkMessage | null> {
  const loaded = await load(dir, id);
  return loaded ? { ...summary(id, loaded.parsed, loaded.bytes), text: loaded.parsed.text, html: loaded.parsed.html } : null;
}
