// Finds where JSON text first breaks the grammar. Node's JSON.parse stays the parser; this
// runs only after it fails, because its messages often give no position at all
// ("Unexpected token 'x', … is not valid JSON"), and no package in the tree locates JSON
// errors without also accepting JSON's relatives (json5 takes trailing commas and comments).
// Iterative, so deep nesting cannot overflow the stack.

export interface JsonSyntaxError {
  offset: number;
  message: string;
}

/** A member name repeated in one object: JSON.parse keeps the last silently; we refuse it. */
export interface JsonDuplicateKey {
  offset: number;
  path: (string | number)[];
  key: string;
}

export interface JsonScan {
  error: JsonSyntaxError | null;
  duplicates: JsonDuplicateKey[];
}

type Frame =
  | { type: "object"; keys: Set<string>; key: string }
  | { type: "array"; index: number };

const WS = /[ \t\n\r]*/y;
const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
const ESCAPE = /\\(?:["\\/bfnrt]|u[0-9a-fA-F]{4})/y;

export function scanJson(text: string): JsonScan {
  const duplicates: JsonDuplicateKey[] = [];
  const error = scan(text, duplicates);
  return { error, duplicates };
}

function scan(text: string, duplicates: JsonDuplicateKey[]): JsonSyntaxError | null {
  let i = 0;
  const stack: Frame[] = [];
  const skip = (): void => {
    WS.lastIndex = i;
    WS.exec(text);
    i = WS.lastIndex;
  };
  const describe = (at: number): string =>
    at >= text.length ? "end of input" : `${JSON.stringify(text[at])}`;

  // Scans a string starting at text[i] === '"'; returns an error or moves i past it.
  const scanString = (): JsonSyntaxError | null => {
    const start = i;
    i += 1;
    for (;;) {
      const ch = text.charCodeAt(i);
      if (i >= text.length) return { offset: start, message: "unterminated string" };
      if (ch === 0x22) {
        i += 1;
        return null;
      }
      if (ch < 0x20) return { offset: i, message: "control character inside a string" };
      if (ch === 0x5c) {
        ESCAPE.lastIndex = i;
        if (!ESCAPE.test(text)) return { offset: i, message: "invalid escape sequence" };
        i = ESCAPE.lastIndex;
      } else {
        i += 1;
      }
    }
  };

  let expectValue = true;
  for (;;) {
    skip();
    if (expectValue) {
      const ch = text[i];
      if (ch === "{" || ch === "[") {
        const closing = ch === "{" ? "}" : "]";
        stack.push(ch === "{" ? { type: "object", keys: new Set(), key: "" } : { type: "array", index: 0 });
        i += 1;
        skip();
        if (text[i] === closing) {
          stack.pop();
          i += 1;
          expectValue = false;
          continue;
        }
        if (ch === "{") {
          const keyError = scanKey();
          if (keyError) return keyError;
        }
        continue;
      }
      if (ch === '"') {
        const err = scanString();
        if (err) return err;
      } else if (ch === "t" || ch === "f" || ch === "n") {
        const word = ch === "t" ? "true" : ch === "f" ? "false" : "null";
        if (!text.startsWith(word, i)) return { offset: i, message: `unexpected ${describe(i)}` };
        i += word.length;
      } else {
        NUMBER.lastIndex = i;
        if (!NUMBER.test(text)) {
          return { offset: i, message: `expected a value, found ${describe(i)}` };
        }
        i = NUMBER.lastIndex;
      }
      expectValue = false;
      continue;
    }
    const top = stack[stack.length - 1];
    if (top === undefined) {
      return i < text.length ? { offset: i, message: `unexpected ${describe(i)} after the end of the JSON value` } : null;
    }
    const closing = top.type === "object" ? "}" : "]";
    if (text[i] === closing) {
      stack.pop();
      i += 1;
      continue;
    }
    if (text[i] !== ",") {
      return { offset: i, message: `expected "," or "${closing}", found ${describe(i)}` };
    }
    const comma = i;
    i += 1;
    skip();
    if (text[i] === closing) return { offset: comma, message: "trailing comma (not allowed in JSON)" };
    if (top.type === "object") {
      const keyError = scanKey();
      if (keyError) return keyError;
    } else {
      top.index += 1;
    }
    expectValue = true;
  }

  // An object member's name and colon; leaves i at the value.
  function scanKey(): JsonSyntaxError | null {
    skip();
    if (text[i] !== '"') return { offset: i, message: `expected a double-quoted property name, found ${describe(i)}` };
    const start = i;
    const err = scanString();
    if (err) return err;
    const raw = text.slice(start + 1, i - 1);
    const key = raw.includes("\\") ? (JSON.parse(text.slice(start, i)) as string) : raw;
    const frame = stack[stack.length - 1];
    if (frame?.type === "object") {
      if (frame.keys.has(key)) duplicates.push({ offset: start, path: [...pathOf(stack), key], key });
      frame.keys.add(key);
      frame.key = key;
    }
    skip();
    if (text[i] !== ":") return { offset: i, message: `expected ":" after the property name, found ${describe(i)}` };
    i += 1;
    return null;
  }
}

function pathOf(stack: Frame[]): (string | number)[] {
  // The innermost frame is the object whose member is being read: its own key is not yet part of the path.
  return stack.slice(0, -1).map((f) => (f.type === "object" ? f.key : f.index));
}
