// Merging Compose files as the Compose Specification says ("Merge and override"; services.extends,
// "Merging service definitions"), on plain values that remember where each entry was written.
//
// Why our own code: no package in the npm registry implements these rules (`@balena/compose-parser`
// wraps the Go reference implementation but downloads its binary from outside the registry and
// needs Node 22; `resin-compose-parse` reads one file), and we need to keep, for every merged entry,
// the file and path it came from, so a need found after the merge still points at its line.
//
//   mapping   merged key by key, the later file's value winning for scalars
//   sequence  appended (later file's items after the earlier's)
//   command, entrypoint, healthcheck.test   replaced, not appended
//   ports, volumes, secrets, configs        appended, but an entry with the same unique key replaces
//   !reset    removes the value;  !override  replaces it whole, bypassing the rules above
// Forms that can be written short or long (environment and depends_on as lists, env_file as a
// string) are expanded before the merge, because "merges apply to the expanded form".
import type { PathSegment } from "../shared/text";

export interface Where {
  /** Index of the file in the push. */
  file: number;
  /** Path of the entry inside that file. */
  path: PathSegment[];
}

/** For every mapping or sequence of the merged project, where each of its entries was written. */
export class Origins {
  private readonly map = new WeakMap<object, Map<string | number, Where>>();

  set(container: object, key: string | number, where: Where): void {
    let m = this.map.get(container);
    if (!m) {
      m = new Map();
      this.map.set(container, m);
    }
    m.set(key, where);
  }

  get(container: object, key: string | number): Where | undefined {
    return this.map.get(container)?.get(key);
  }

  has(container: object, key: string | number): boolean {
    return this.map.get(container)?.has(key) ?? false;
  }
}

type Tagged = (where: Where) => "reset" | "override" | null;

export const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

/**
 * Expands short forms in place and records where every entry of the file was written. `base` is
 * the entry's path in its file; `file` the file's index in the push.
 */
export function registerFile(value: Record<string, unknown>, file: number, origins: Origins): void {
  const services = value.services;
  if (isPlainObject(services)) {
    for (const [name, svc] of Object.entries(services)) {
      if (isPlainObject(svc)) expandService(svc, file, ["services", name], origins);
    }
  }
  register(value, file, [], origins, 0);
}

function register(container: unknown, file: number, path: PathSegment[], origins: Origins, depth: number): void {
  if (depth > 70 || typeof container !== "object" || container === null) return;
  const entries: [string | number, unknown][] = Array.isArray(container) ? container.map((v, i) => [i, v]) : Object.entries(container);
  for (const [k, v] of entries) {
    let where = origins.get(container, k);
    if (!where) {
      where = { file, path: [...path, k] };
      origins.set(container, k, where);
    }
    if (typeof v === "object" && v !== null) register(v, file, where.path, origins, depth + 1);
  }
}

function expandService(svc: Record<string, unknown>, file: number, path: PathSegment[], origins: Origins): void {
  const env = svc.environment;
  if (Array.isArray(env)) {
    const map: Record<string, unknown> = {};
    env.forEach((item, i) => {
      if (typeof item !== "string") return;
      const eq = item.indexOf("=");
      const name = eq === -1 ? item : item.slice(0, eq);
      map[name] = eq === -1 ? null : item.slice(eq + 1);
      origins.set(map, name, { file, path: [...path, "environment", i] });
    });
    svc.environment = map;
  }
  const dependsOn = svc.depends_on;
  if (Array.isArray(dependsOn)) {
    const map: Record<string, unknown> = {};
    dependsOn.forEach((name, i) => {
      if (typeof name !== "string") return;
      const entry = { condition: "service_started", required: true };
      map[name] = entry;
      origins.set(map, name, { file, path: [...path, "depends_on", i] });
      origins.set(entry, "condition", { file, path: [...path, "depends_on", i] });
      origins.set(entry, "required", { file, path: [...path, "depends_on", i] });
    });
    svc.depends_on = map;
  } else if (isPlainObject(dependsOn)) {
    for (const [name, spec] of Object.entries(dependsOn)) {
      if (spec === null) dependsOn[name] = {};
    }
  }
  const envFile = svc.env_file;
  if (typeof envFile === "string") {
    const entry = { path: envFile, required: true };
    const list = [entry];
    origins.set(list, 0, { file, path: [...path, "env_file"] });
    origins.set(entry, "path", { file, path: [...path, "env_file"] });
    svc.env_file = list;
  } else if (Array.isArray(envFile)) {
    svc.env_file = envFile.map((e, i) => {
      if (typeof e !== "string") return e;
      const entry = { path: e, required: true };
      origins.set(entry, "path", { file, path: [...path, "env_file", i] });
      return entry;
    });
  }
  if (typeof svc.extends === "string") {
    const entry = { service: svc.extends };
    origins.set(entry, "service", { file, path: [...path, "extends"] });
    svc.extends = entry;
  }
}

const REPLACED = new Set(["command", "entrypoint"]);
const UNIQUE = new Set(["ports", "volumes", "secrets", "configs"]);

/** The unique key of an entry of ports, volumes, secrets or configs ("Unique resources"). */
function uniqueKey(field: string, item: unknown): string {
  if (field === "volumes") {
    if (typeof item === "string") {
      const parts = item.split(":");
      return parts.length >= 2 ? (parts[1] ?? item) : item;
    }
    return isPlainObject(item) ? String(item.target ?? "") : JSON.stringify(item);
  }
  if (field === "ports") {
    if (isPlainObject(item)) return JSON.stringify([item.host_ip ?? "", String(item.target ?? ""), String(item.published ?? ""), item.protocol ?? "tcp"]);
    return String(item);
  }
  // secrets and configs: the target, which the short form leaves at its default (the source name).
  if (isPlainObject(item)) return String(item.target ?? item.source ?? "");
  return String(item);
}

export interface MergeContext {
  origins: Origins;
  tagged: Tagged;
}

/**
 * `over` merged onto `base`, as a new value; neither input is changed. `field` is the name of the
 * attribute the values belong to (for the exceptions), `inService` whether that is a service's own
 * attribute.
 */
function mergeValues(base: unknown, over: unknown, ctx: MergeContext, field = "", inService = false): unknown {
  if (isPlainObject(base) && isPlainObject(over)) return mergeMaps(base, over, ctx, field);
  if (Array.isArray(base) && Array.isArray(over)) {
    if (inService && REPLACED.has(field)) return over;
    if (!inService && field === "test") return over;
    const out: unknown[] = [];
    const copy = (from: unknown[], i: number) => {
      const where = ctx.origins.get(from, i);
      if (where) ctx.origins.set(out, out.length, where);
      out.push(from[i]);
    };
    if (inService && UNIQUE.has(field)) {
      const overKeys = new Set(over.map((o) => uniqueKey(field, o)));
      base.forEach((b, i) => {
        if (!overKeys.has(uniqueKey(field, b))) copy(base, i);
      });
    } else {
      base.forEach((_, i) => copy(base, i));
    }
    over.forEach((_, i) => copy(over, i));
    return out;
  }
  return over;
}

function mergeMaps(base: Record<string, unknown>, over: Record<string, unknown>, ctx: MergeContext, field: string): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(base)) {
    out[k] = v;
    const where = ctx.origins.get(base, k);
    if (where) ctx.origins.set(out, k, where);
  }
  // Entries of a service's mapping are the service's attributes; deeper mappings are not.
  const childInService = field === "__service__";
  for (const [k, v] of Object.entries(over)) {
    const where = ctx.origins.get(over, k);
    const tag = where ? ctx.tagged(where) : null;
    if (tag === "reset") {
      delete out[k];
      continue;
    }
    out[k] = tag === "override" || !(k in base) ? v : mergeValues(base[k], v, ctx, k, childInService);
    if (where) ctx.origins.set(out, k, where);
  }
  return out;
}

/** Two service definitions merged as a layered file or `extends` would: `over` wins. */
export function mergeService(base: Record<string, unknown>, over: Record<string, unknown>, ctx: MergeContext): Record<string, unknown> {
  return mergeMaps(base, over, ctx, "__service__");
}

/** Whole files (or projects) merged in order: services service by service, other top-level entries generically. */
export function mergeProjects(base: Record<string, unknown>, over: Record<string, unknown>, ctx: MergeContext): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const keys = new Set([...Object.keys(base), ...Object.keys(over)]);
  for (const k of keys) {
    const whereOver = k in over ? ctx.origins.get(over, k) : undefined;
    const whereBase = k in base ? ctx.origins.get(base, k) : undefined;
    const tag = whereOver ? ctx.tagged(whereOver) : null;
    if (tag === "reset") continue;
    let v: unknown;
    if (!(k in over)) v = base[k];
    else if (!(k in base) || tag === "override") v = over[k];
    else if (k === "services" && isPlainObject(base[k]) && isPlainObject(over[k])) v = mergeServices(base[k], over[k], ctx);
    else v = mergeValues(base[k], over[k], ctx, k, false);
    out[k] = v;
    const where = whereOver ?? whereBase;
    if (where) ctx.origins.set(out, k, where);
  }
  return out;
}

function mergeServices(base: Record<string, unknown>, over: Record<string, unknown>, ctx: MergeContext): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [name, svc] of Object.entries(base)) {
    out[name] = svc;
    const where = ctx.origins.get(base, name);
    if (where) ctx.origins.set(out, name, where);
  }
  for (const [name, svc] of Object.entries(over)) {
    const where = ctx.origins.get(over, name);
    const tag = where ? ctx.tagged(where) : null;
    if (tag === "reset") {
      delete out[name];
      continue;
    }
    const prior = out[name];
    out[name] = tag !== "override" && isPlainObject(prior) && isPlainObject(svc) ? mergeService(prior, svc, ctx) : svc;
    // A service first declared in an earlier file keeps pointing there: that is where it is defined.
    if (!(name in base) && where) ctx.origins.set(out, name, where);
  }
  return out;
}
