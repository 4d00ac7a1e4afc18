// Before/after of an audit event as rows a person can read. Audit payloads are small JSON
// objects a few levels deep, so flattening to dotted paths beats pulling in a diff library.

export interface DiffRow {
  path: string;
  before: string | undefined;
  after: string | undefined;
  changed: boolean;
}

function flatten(value: unknown, prefix: string, out: Map<string, string>): void {
  if (value !== null && typeof value === "object" && !Array.isArray(value)) {
    const entries = Object.entries(value as Record<string, unknown>);
    if (!entries.length && prefix) out.set(prefix, "{}");
    for (const [k, v] of entries) flatten(v, prefix ? `${prefix}.${k}` : k, out);
    return;
  }
  out.set(prefix || "(value)", value === undefined ? "—" : typeof value === "string" ? value : JSON.stringify(value));
}

export function diffRows(before: unknown, after: unknown): DiffRow[] {
  const a = new Map<string, string>();
  const b = new Map<string, string>();
  if (before !== null && before !== undefined) flatten(before, "", a);
  if (after !== null && after !== undefined) flatten(after, "", b);
  const paths = [...new Set([...a.keys(), ...b.keys()])];
  return paths.map((path) => {
    const x = a.get(path);
    const y = b.get(path);
    return { path, before: x, after: y, changed: x !== y };
  });
}
