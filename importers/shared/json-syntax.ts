// Where JSON text breaks the grammar, and which member names repeat in one object. Node's
// JSON.parse stays the parser (fast on 20 MiB); this runs jsonc-parser (the maintained scanner
// behind VS Code's JSON support) in strict mode — no comments, no trailing commas, i.e. RFC 8259 —
// because JSON.parse's messages often give no position at all and it keeps the last of repeated
// member names silently. jsonc-parser reports error codes; the sentences are ours.
import { type JSONPath, visit } from "jsonc-parser";

// jsonc-parser's ParseErrorCode is a const enum, which isolated modules cannot read: its values, copied.
const ParseErrorCode = {
  InvalidSymbol: 1,
  InvalidNumberFormat: 2,
  PropertyNameExpected: 3,
  ValueExpected: 4,
  ColonExpected: 5,
  CommaExpected: 6,
  CloseBraceExpected: 7,
  CloseBracketExpected: 8,
  EndOfFileExpected: 9,
  InvalidCommentToken: 10,
  UnexpectedEndOfComment: 11,
  UnexpectedEndOfString: 12,
  UnexpectedEndOfNumber: 13,
  InvalidUnicode: 14,
  InvalidEscapeCharacter: 15,
  InvalidCharacter: 16,
} as const;
type ParseErrorCode = (typeof ParseErrorCode)[keyof typeof ParseErrorCode];

interface JsonSyntaxError {
  offset: number;
  message: string;
}

/** A member name repeated in one object: JSON.parse keeps the last silently; we refuse it. */
interface JsonDuplicateKey {
  offset: number;
  path: (string | number)[];
  key: string;
}

export interface JsonScan {
  error: JsonSyntaxError | null;
  duplicates: JsonDuplicateKey[];
}

function describe(text: string, offset: number): string {
  if (offset >= text.length) return "the end of the text";
  const ch = text[offset]!;
  if (/\s/.test(ch)) return "white space";
  const word = /^[A-Za-z_$][\w$]*/.exec(text.slice(offset, offset + 40))?.[0];
  return word ? JSON.stringify(word) : JSON.stringify(ch);
}

/** The comma before `offset` (white space between), if any: a closing bracket right after one is a trailing comma. */
function commaBefore(text: string, offset: number): number | null {
  let i = offset - 1;
  while (i >= 0 && /[ \t\n\r]/.test(text[i]!)) i--;
  return i >= 0 && text[i] === "," ? i : null;
}

function sentence(text: string, code: ParseErrorCode, offset: number): JsonSyntaxError {
  const at = (message: string) => ({ offset, message });
  switch (code) {
    case ParseErrorCode.InvalidSymbol:
    case ParseErrorCode.ValueExpected:
    case ParseErrorCode.PropertyNameExpected: {
      const comma = commaBefore(text, offset);
      if (comma !== null && (text[offset] === "]" || text[offset] === "}")) return { offset: comma, message: "trailing comma (not allowed in JSON)" };
      return at(code !== ParseErrorCode.PropertyNameExpected ? `expected a value, found ${describe(text, offset)}` : `expected a double-quoted property name, found ${describe(text, offset)}`);
    }
    case ParseErrorCode.ColonExpected:
      return at(`expected ":" after the property name, found ${describe(text, offset)}`);
    case ParseErrorCode.CommaExpected:
      return at(`expected "," between members or elements, found ${describe(text, offset)}`);
    case ParseErrorCode.CloseBraceExpected:
      return at(`expected "," or "}", found ${describe(text, offset)}`);
    case ParseErrorCode.CloseBracketExpected:
      return at(`expected "," or "]", found ${describe(text, offset)}`);
    case ParseErrorCode.EndOfFileExpected:
      return at(`unexpected ${describe(text, offset)} after the end of the JSON value`);
    case ParseErrorCode.UnexpectedEndOfString:
      return at("unterminated string");
    case ParseErrorCode.InvalidCharacter:
      return at("control character inside a string");
    case ParseErrorCode.InvalidEscapeCharacter:
    case ParseErrorCode.InvalidUnicode:
      return at("invalid escape sequence");
    case ParseErrorCode.InvalidNumberFormat:
    case ParseErrorCode.UnexpectedEndOfNumber:
      return at("invalid number");
    case ParseErrorCode.InvalidCommentToken:
    case ParseErrorCode.UnexpectedEndOfComment:
      return at("comments are not allowed in JSON");
    default:
      return at(`unexpected ${describe(text, offset)}`);
  }
}

export function scanJson(text: string): JsonScan {
  let error: JsonSyntaxError | null = null;
  const duplicates: JsonDuplicateKey[] = [];
  // Member names seen per open object, innermost last.
  const seen: Set<string>[] = [];
  visit(
    text,
    {
      onObjectBegin: () => {
        seen.push(new Set());
      },
      onObjectEnd: () => {
        seen.pop();
      },
      onObjectProperty: (key: string, offset: number, _length: number, _line: number, _col: number, pathSupplier: () => JSONPath) => {
        const names = seen[seen.length - 1];
        if (!names) return;
        if (names.has(key)) duplicates.push({ offset, path: [...pathSupplier(), key], key });
        else names.add(key);
      },
      onError: (code: number, offset: number) => {
        error ??= sentence(text, code as ParseErrorCode, offset);
      },
    },
    { disallowComments: true, allowTrailingComma: false, allowEmptyContent: false },
  );
  return { error, duplicates };
}
