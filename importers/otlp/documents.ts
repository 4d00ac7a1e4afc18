// The OTLP/JSON documents of a trace file: one ExportTraceServiceRequest, or JSON Lines with one
// request a line (what the OpenTelemetry Collector's file exporter writes). Lines are parsed as they
// arrive from the stream, so a file of any size is read in the memory of its longest line. A first
// line that is not JSON on its own but opens an object starts one (pretty-printed) document, read whole.
import { MAX_BODY_BYTES, MAX_TRACE_FILE_BYTES } from "@/lib/inventory/limits";
import type { InventoryIssue } from "@/lib/inventory/types";
import { loadStructured } from "../shared/structured";

export class TraceFileError extends Error {
  constructor(
    readonly status: 413 | 422,
    readonly issues: InventoryIssue[],
  ) {
    super(issues[0]?.message ?? "invalid trace file");
  }
}

export interface TraceDocument {
  value: unknown;
  /** 1-based line the document starts on */
  line: number;
  /** its text, to locate issues in it */
  text: string;
}

const tooLarge = (message: string) => new TraceFileError(413, [{ path: "", message }]);

/** Turns lines into documents; shared by the streaming reader and the in-memory one. */
class DocumentReader {
  private lineNo = 0;
  private contentLines = 0;
  private whole: string[] | null = null;
  private wholeStart = 1;
  private wholeLength = 0;

  get line(): number {
    return this.lineNo;
  }

  take(raw: string): TraceDocument | null {
    this.lineNo += 1;
    const text = raw.endsWith("\r") ? raw.slice(0, -1) : raw;
    if (this.whole) {
      this.whole.push(text);
      this.wholeLength += text.length + 1;
      if (this.wholeLength > MAX_BODY_BYTES) {
        throw tooLarge(`a single-document trace file is held whole and may be at most ${MAX_BODY_BYTES} bytes (20 MiB); write JSON Lines (one request a line) for larger files`);
      }
      return null;
    }
    if (text.trim() === "") return null;
    this.contentLines += 1;
    try {
      return { value: JSON.parse(text), line: this.lineNo, text };
    } catch {
      if (this.contentLines === 1 && /^\s*[{[]/.test(text)) {
        this.whole = [text];
        this.wholeStart = this.lineNo;
        this.wholeLength = text.length;
        return null;
      }
      // Where JSON.parse failed, found by the inventory's JSON loader, moved to this line.
      const loaded = loadStructured(text, { json: true });
      const issues = loaded.ok ? [{ path: "", message: "invalid JSON" }] : loaded.issues;
      throw new TraceFileError(422, issues.map((i) => ({ ...i, path: `lines[${this.lineNo}]`, line: this.lineNo })));
    }
  }

  finish(): TraceDocument | null {
    if (this.whole) {
      const text = this.whole.join("\n");
      const loaded = loadStructured(text, { json: true });
      if (!loaded.ok) throw new TraceFileError(422, loaded.issues.map((i) => (i.line !== undefined ? { ...i, line: i.line + this.wholeStart - 1 } : i)));
      return { value: loaded.source.value, line: this.wholeStart, text };
    }
    if (this.contentLines === 0) throw new TraceFileError(422, [{ path: "", line: 1, column: 1, message: "the file is empty" }]);
    return null;
  }
}

const notUtf8 = (line: number) => new TraceFileError(422, [{ path: "", line, message: "the file is not UTF-8 text" }]);

/**
 * The documents of a file given as a stream of byte chunks (a request body). Lines are cut on the
 * bytes (a newline byte never occurs inside a UTF-8 sequence) and each line is decoded once: joining
 * decoded chunks into a growing string would copy a long line once per chunk.
 */
export async function* traceDocuments(chunks: AsyncIterable<Uint8Array>, { maxBytes = MAX_TRACE_FILE_BYTES }: { maxBytes?: number } = {}): AsyncGenerator<TraceDocument> {
  const decoder = new TextDecoder("utf-8", { fatal: true });
  const reader = new DocumentReader();
  let total = 0;
  let parts: Buffer[] = [];
  let partsLength = 0;
  const decodeLine = (bytes: Buffer): string => {
    try {
      return decoder.decode(bytes);
    } catch {
      throw notUtf8(reader.line + 1);
    }
  };
  for await (const raw of chunks) {
    const chunk = Buffer.isBuffer(raw) ? raw : Buffer.from(raw.buffer, raw.byteOffset, raw.byteLength);
    total += chunk.byteLength;
    if (total > maxBytes) throw tooLarge(`the trace file is over ${maxBytes} bytes`);
    let start = 0;
    let nl = chunk.indexOf(10);
    while (nl >= 0) {
      const piece = chunk.subarray(start, nl);
      const line = parts.length === 0 ? piece : Buffer.concat([...parts, piece], partsLength + piece.length);
      parts = [];
      partsLength = 0;
      const doc = reader.take(decodeLine(line));
      if (doc) yield doc;
      start = nl + 1;
      nl = chunk.indexOf(10, start);
    }
    if (start < chunk.length) {
      parts.push(chunk.subarray(start));
      partsLength += chunk.length - start;
      if (partsLength > MAX_BODY_BYTES) throw tooLarge(`line ${reader.line + 1} is over ${MAX_BODY_BYTES} bytes (20 MiB); one line holds one OTLP request`);
    }
  }
  if (partsLength > 0) {
    const doc = reader.take(decodeLine(Buffer.concat(parts, partsLength)));
    if (doc) yield doc;
  }
  const last = reader.finish();
  if (last) yield last;
}

/** The same over a text already in memory (the importer API). */
export function traceDocumentsOfText(text: string): TraceDocument[] {
  const reader = new DocumentReader();
  const out: TraceDocument[] = [];
  for (const line of text.split("\n")) {
    const doc = reader.take(line);
    if (doc) out.push(doc);
  }
  const last = reader.finish();
  if (last) out.push(last);
  return out;
}
