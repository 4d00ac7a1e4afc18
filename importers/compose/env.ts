// `.env` files and `${VAR}` interpolation, as the Compose Specification defines them
// (services.env_file "Env_file format"; "Interpolation"). Our own code: the rules are short, the
// npm packages for `.env` files follow other dialects (dotenv expands differently, knows no `${VAR-d}`),
// and we need the line of every variable so an inferred need can point at it.

export interface EnvEntry {
  name: string;
  /** null: the line was `VAR` alone, which leaves the variable unset. */
  value: string | null;
  line: number;
  column: number;
}

const NAME = /^[A-Za-z_][A-Za-z0-9_.-]*$/;

const ESCAPES: Record<string, string> = { n: "\n", r: "\r", t: "\t", "\\": "\\", '"': '"', "'": "'" };

/**
 * Parses `VAR[=[VAL]]` lines. Unquoted and double-quoted values are interpolated with `lookup`
 * (earlier lines of the same file come first); single-quoted values are literal.
 */
export function parseEnvFile(
  text: string,
  lookup: (name: string) => string | undefined,
  onUnresolved: (name: string, line: number, column: number) => void = () => {},
): { entries: EnvEntry[]; problems: { line: number; column: number; message: string }[] } {
  const entries: EnvEntry[] = [];
  const problems: { line: number; column: number; message: string }[] = [];
  const local = new Map<string, string>();
  const get = (n: string): string | undefined => (local.has(n) ? local.get(n) : lookup(n));
  const lines = text.split(/\r?\n/);
  lines.forEach((raw, i) => {
    const line = i + 1;
    const indent = raw.length - raw.trimStart().length;
    let rest = raw.trim();
    if (rest === "" || rest.startsWith("#")) return;
    if (rest.startsWith("export ")) rest = rest.slice(7).trimStart();
    const eq = rest.indexOf("=");
    const name = (eq === -1 ? rest : rest.slice(0, eq)).trim();
    if (!NAME.test(name)) {
      problems.push({ line, column: indent + 1, message: `${JSON.stringify(name)} is not a variable name: each line must be VAR=VALUE` });
      return;
    }
    if (eq === -1) {
      entries.push({ name, value: null, line, column: indent + 1 });
      return;
    }
    let v = rest.slice(eq + 1).trimStart();
    let value: string;
    const quote = v[0];
    if (quote === '"' || quote === "'") {
      let out = "";
      let j = 1;
      let closed = false;
      for (; j < v.length; j++) {
        const c = v[j] as string;
        if (c === "\\" && j + 1 < v.length) {
          const next = v[j + 1] as string;
          // Single-quoted values keep escape sequences literally, except an escaped quote.
          if (quote === "'" && next !== "'") out += c;
          else out += quote === '"' ? (ESCAPES[next] ?? `\\${next}`) : next;
          j++;
          continue;
        }
        if (c === quote) {
          closed = true;
          break;
        }
        out += c;
      }
      if (!closed) {
        problems.push({ line, column: indent + eq + 2, message: `the value of ${name} has no closing ${quote}` });
        return;
      }
      value = quote === "'" ? out : interpolate(out, get, (n) => onUnresolved(n, line, indent + 1)).value;
    } else {
      // An inline comment needs a space before the `#`.
      const hash = v.search(/\s#/);
      if (hash !== -1) v = v.slice(0, hash);
      value = interpolate(v.trimEnd(), get, (n) => onUnresolved(n, line, indent + 1)).value;
    }
    local.set(name, value);
    entries.push({ name, value, line, column: indent + 1 });
  });
  return { entries, problems };
}

export interface Interpolated {
  value: string;
  /** Variables that were unset with no default: replaced by "" (Compose Specification, Interpolation). */
  unresolved: string[];
  /** `${VAR:?message}` / `${VAR?message}` whose variable was missing. */
  required: { name: string; message: string }[];
}

/**
 * `$VAR`, `${VAR}`, `${VAR:-default}`, `${VAR-default}`, `${VAR:?err}`, `${VAR?err}`, `${VAR:+alt}`,
 * `${VAR+alt}`, nested defaults, and `$$` for a literal `$`.
 */
export function interpolate(text: string, lookup: (name: string) => string | undefined, onUnresolved?: (name: string) => void): Interpolated {
  const result: Interpolated = { value: "", unresolved: [], required: [] };
  if (!text.includes("$")) {
    result.value = text;
    return result;
  }
  result.value = expand(text, lookup, result, 0);
  if (onUnresolved) for (const n of result.unresolved) onUnresolved(n);
  return result;
}

function expand(text: string, lookup: (name: string) => string | undefined, acc: Interpolated, depth: number): string {
  let out = "";
  let i = 0;
  while (i < text.length) {
    const c = text[i];
    if (c !== "$") {
      out += c;
      i++;
      continue;
    }
    const next = text[i + 1];
    if (next === "$") {
      out += "$";
      i += 2;
      continue;
    }
    if (next === "{") {
      const close = matchingBrace(text, i + 1);
      if (close === -1 || depth > 8) {
        out += text.slice(i);
        break;
      }
      out += substitute(text.slice(i + 2, close), lookup, acc, depth);
      i = close + 1;
      continue;
    }
    const m = /^[A-Za-z_][A-Za-z0-9_]*/.exec(text.slice(i + 1));
    if (!m) {
      out += "$";
      i++;
      continue;
    }
    const v = lookup(m[0]);
    if (v === undefined) note(acc.unresolved, m[0]);
    out += v ?? "";
    i += 1 + m[0].length;
  }
  return out;
}

function matchingBrace(text: string, open: number): number {
  let depth = 0;
  for (let j = open; j < text.length; j++) {
    if (text[j] === "{") depth++;
    else if (text[j] === "}" && --depth === 0) return j;
  }
  return -1;
}

function substitute(inner: string, lookup: (name: string) => string | undefined, acc: Interpolated, depth: number): string {
  const m = /^([A-Za-z_][A-Za-z0-9_]*)(?:(:?[-?+])([\s\S]*))?$/.exec(inner);
  if (!m) {
    note(acc.unresolved, inner);
    return "";
  }
  const name = m[1] as string;
  const op = m[2];
  const arg = m[3] ?? "";
  const v = lookup(name);
  const unset = v === undefined;
  const empty = unset || v === "";
  switch (op) {
    case undefined:
      if (unset) note(acc.unresolved, name);
      return v ?? "";
    case ":-":
      return empty ? expand(arg, lookup, acc, depth + 1) : (v as string);
    case "-":
      return unset ? expand(arg, lookup, acc, depth + 1) : (v as string);
    case ":+":
      return empty ? "" : expand(arg, lookup, acc, depth + 1);
    case "+":
      return unset ? "" : expand(arg, lookup, acc, depth + 1);
    case ":?":
    case "?":
      if (op === ":?" ? empty : unset) {
        acc.required.push({ name, message: expand(arg, lookup, acc, depth + 1) });
        return "";
      }
      return v as string;
    default:
      return v ?? "";
  }
}

function note(list: string[], name: string): void {
  if (!list.includes(name)) list.push(name);
}
