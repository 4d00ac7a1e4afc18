// The format reference page, read from the JSON Schema of format 1 (inventoryJsonSchema): every
// object of the file becomes a section, every property a row with its type, whether it is required,
// what it means and its limits. Generated, so the page cannot drift from what the server accepts.

type Json = Record<string, unknown>;

interface FieldDoc {
  name: string;
  type: string;
  required: boolean;
  description: string | null;
  limits: string[];
}

export interface SectionDoc {
  /** where the object sits in a file, e.g. `components[]` or `components[].needs[] (any of)` */
  path: string;
  description: string | null;
  fields: FieldDoc[];
}

const isObj = (v: unknown): v is Json => typeof v === "object" && v !== null && !Array.isArray(v);

function typeOf(s: Json): string {
  if ("const" in s) return `exactly ${JSON.stringify(s.const)}`;
  if (Array.isArray(s.enum)) return `one of ${s.enum.map((e) => JSON.stringify(e)).join(", ")}`;
  if (Array.isArray(s.anyOf)) return s.anyOf.filter(isObj).map(typeOf).join(" or ");
  if (s.type === "array") return isObj(s.items) ? `list of ${typeOf(s.items)}` : "list";
  if (s.type === "object") return isObj(s.additionalProperties) ? `mapping of name to ${typeOf(s.additionalProperties)}` : "mapping";
  if (s.type === "string" && s.format === "uri") return "URL";
  if (typeof s.type === "string") return s.type === "integer" ? "whole number" : s.type;
  return "any";
}

function limitsOf(s: Json): string[] {
  const out: string[] = [];
  if (typeof s.pattern === "string") out.push(`matches ${s.pattern}`);
  if (typeof s.minimum === "number" && typeof s.maximum === "number") out.push(`${s.minimum}–${s.maximum}`);
  else if (typeof s.minimum === "number") out.push(`at least ${s.minimum}`);
  if (typeof s.minLength === "number" && s.minLength > 1) out.push(`at least ${s.minLength} characters`);
  if (typeof s.maxLength === "number") out.push(`at most ${s.maxLength} characters`);
  if (typeof s.minItems === "number") out.push(`at least ${s.minItems} entries`);
  if (typeof s.maxItems === "number") out.push(`at most ${s.maxItems.toLocaleString("en")} entries`);
  if (isObj(s.items)) out.push(...limitsOf(s.items).map((l) => `each ${l}`));
  if (Array.isArray(s.anyOf)) for (const b of s.anyOf.filter(isObj)) out.push(...limitsOf(b));
  if (isObj(s.propertyNames)) out.push(...limitsOf(s.propertyNames).map((l) => `names ${l}`));
  return [...new Set(out)];
}

/** Object schemas that sit under a property (directly, as list items, or as branches of a choice). */
function nested(s: Json): Array<{ suffix: string; schema: Json }> {
  const out: Array<{ suffix: string; schema: Json }> = [];
  if (s.type === "object" && isObj(s.properties)) out.push({ suffix: "", schema: s });
  if (s.type === "array" && isObj(s.items)) for (const n of nested(s.items)) out.push({ suffix: `[]${n.suffix}`, schema: n.schema });
  if (Array.isArray(s.anyOf)) {
    const objects = s.anyOf.filter((b): b is Json => isObj(b) && b.type === "object" && isObj(b.properties));
    for (const b of objects) {
      const first = Object.keys(b.properties as Json)[0] ?? "";
      out.push({ suffix: objects.length > 1 ? ` (with ${first})` : "", schema: b });
    }
  }
  return out;
}

export function schemaSections(schema: Json): SectionDoc[] {
  const sections: SectionDoc[] = [];
  const walk = (path: string, s: Json) => {
    const properties = isObj(s.properties) ? s.properties : {};
    const required = new Set(Array.isArray(s.required) ? s.required.map(String) : []);
    const fields: FieldDoc[] = [];
    const later: Array<[string, Json]> = [];
    for (const [name, raw] of Object.entries(properties)) {
      if (!isObj(raw)) continue;
      fields.push({ name, type: typeOf(raw), required: required.has(name), description: typeof raw.description === "string" ? raw.description : null, limits: limitsOf(raw) });
      for (const n of nested(raw)) later.push([`${path ? `${path}.` : ""}${name}${n.suffix}`, n.schema]);
    }
    sections.push({ path: path || "(the file)", description: typeof s.description === "string" ? s.description : null, fields });
    for (const [p, n] of later) walk(p, n);
  };
  walk("", schema);
  return sections;
}
