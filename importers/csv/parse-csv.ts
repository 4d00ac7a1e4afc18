// RFC 4180 records with the position of every field. No CSV package is in the dependency
// tree and the grammar is small; we also need each field's line and column for issues,
// which general-purpose parsers do not report per field. Accepts LF as well as CRLF, and the
// delimiters spreadsheets export with (`,`, `;` in locales whose decimal mark is a comma, tab).
// Lines starting with `#` are comments when asked for.

export interface CsvField {
  value: string;
  /** 1-based line and column where the field starts. */
  line: number;
  column: number;
  quoted: boolean;
}

type CsvRecord = CsvField[];

export type CsvParse = { ok: true; records: CsvRecord[] } | { ok: false; line: number; column: number; message: string };

export interface CsvParseOptions {
  delimiter?: "," | ";" | "\t";
  /** Skip lines whose first character is `#`. */
  comments?: boolean;
}

/** The delimiter of the first line that is not blank or a comment: whichever of `,` `;` tab occurs most outside quotes. */
export function sniffDelimiter(text: string): "," | ";" | "\t" {
  const line = text.split("\n").find((l) => l.trim() !== "" && !l.startsWith("#")) ?? "";
  const counts = { ",": 0, ";": 0, "\t": 0 };
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (!quoted && (c === "," || c === ";" || c === "\t")) counts[c] += 1;
  }
  const best = (Object.entries(counts) as ["," | ";" | "\t", number][]).sort((a, b) => b[1] - a[1])[0];
  return best && best[1] > 0 ? best[0] : ",";
}

export function parseCsvRecords(text: string, opts: CsvParseOptions = {}): CsvParse {
  const sep = opts.delimiter ?? ",";
  const records: CsvRecord[] = [];
  let record: CsvRecord = [];
  let i = 0;
  let line = 1;
  let lineStart = 0;
  const n = text.length;

  for (;;) {
    // A comment line: only at the start of a record, so a `#` inside a record is data.
    if (opts.comments && record.length === 0 && i === lineStart && text[i] === "#") {
      const nl = text.indexOf("\n", i);
      if (nl === -1) break;
      i = nl + 1;
      line += 1;
      lineStart = i;
      if (i >= n) break;
      continue;
    }
    const field: CsvField = { value: "", line, column: i - lineStart + 1, quoted: false };
    if (text[i] === '"') {
      field.quoted = true;
      let value = "";
      i += 1;
      for (;;) {
        if (i >= n) return { ok: false, line: field.line, column: field.column, message: "unterminated quoted field" };
        const q = text.indexOf('"', i);
        if (q === -1) return { ok: false, line: field.line, column: field.column, message: "unterminated quoted field" };
        const chunk = text.slice(i, q);
        // Quoted fields may span lines; keep line numbers right for what follows.
        for (let nl = chunk.indexOf("\n"); nl !== -1; nl = chunk.indexOf("\n", nl + 1)) {
          line += 1;
          lineStart = i + nl + 1;
        }
        value += chunk;
        if (text[q + 1] === '"') {
          value += '"';
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      field.value = value;
      const next = text[i];
      if (i < n && next !== sep && next !== "\n" && !(next === "\r" && text[i + 1] === "\n")) {
        return { ok: false, line, column: i - lineStart + 1, message: "unexpected text after a closing quote" };
      }
    } else {
      let j = i;
      while (j < n && text[j] !== sep && text[j] !== "\n") j += 1;
      let value = text.slice(i, j);
      if (value.endsWith("\r") && text[j] === "\n") value = value.slice(0, -1);
      const quote = value.indexOf('"');
      if (quote !== -1) {
        return { ok: false, line, column: i - lineStart + 1 + quote, message: 'a quote inside an unquoted field (quote the whole field and double the ")' };
      }
      field.value = value;
      i = j;
    }
    record.push(field);
    if (i >= n) {
      records.push(record);
      break;
    }
    if (text[i] === sep) {
      i += 1;
      continue;
    }
    // End of record: "\r\n" or "\n".
    if (text[i] === "\r") i += 1;
    i += 1;
    records.push(record);
    record = [];
    line += 1;
    lineStart = i;
    if (i >= n) break;
  }
  return { ok: true, records };
}
