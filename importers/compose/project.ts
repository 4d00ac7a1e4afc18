// The files of one Compose push → one merged Compose model, the way Compose itself builds it:
// each file interpolated with the pushed `.env` (Compose Specification, "Interpolation": "applied
// before a merge on a per-file basis"), the files merged in order ("Merge and override"), then
// `include` ("Include": evaluated after the files are merged, resources copied, a name clash is a
// warning and is not merged), then `extends` (services.extends). Everything keeps its origin so
// later findings point at a file, line and column.
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import type { FilePosition, InventoryIssue } from "@/lib/inventory/types";
import { isRecord, loadStructured, looksLikeJson, type StructuredSource } from "../shared/structured";
import { decodeBody, formatPath, type PathSegment } from "../shared/text";
import { mapZodIssues } from "../shared/zod-issues";
import { interpolate, parseEnvFile, type EnvEntry } from "./env";
import { isPlainObject, mergeProjects, mergeService, Origins, registerFile, type MergeContext, type Where } from "./merge";
import { ComposeFileSchema } from "./schema";

export interface PushedFile {
  name: string;
  text: string;
}

interface YamlFile {
  index: number;
  /** The name the push gave it; null for a single-document body. */
  name: string | null;
  src: StructuredSource;
  /** Lines before this document in its body (multi-document YAML bodies). */
  lineOffset: number;
  value: Record<string, unknown>;
  tags: Map<string, "reset" | "override">;
}

export interface Project {
  model: Record<string, unknown>;
  files: YamlFile[];
  envFiles: Map<string, { name: string; text: string }>;
  vars: Map<string, string>;
  origins: Origins;
  issues: InventoryIssue[];
  warnings: InventoryIssue[];
  /** Where a value of the merged model was written, as a file position. */
  /** Where a value of the merged model was written; with `key`, where its name was. */
  position(where: Where | undefined, opts?: { key?: boolean }): FilePosition | undefined;
  findFile(name: string): YamlFile | undefined;
  findEnvFile(name: string): { name: string; text: string } | undefined;
  /** Reads a pushed env file, interpolated with the project's variables (cached). */
  readEnvFile(name: string): { entries: EnvEntry[] } | undefined;
}

export type ProjectResult = { ok: true; project: Project } | { ok: false; status: 413 | 422; issues: InventoryIssue[] };

const ENV_NAME = /(^|\/)(\.env(\..*)?|[^/]*\.env)$/;

/** `./a/../b.yaml` → `b.yaml`: enough to match the names a push gives with the paths files write. */
function normaliseName(name: string): string {
  const out: string[] = [];
  for (const part of name.replace(/\\/g, "/").split("/")) {
    if (part === "" || part === ".") continue;
    if (part === "..") {
      if (out.length > 0 && out[out.length - 1] !== "..") out.pop();
      else out.push("..");
    } else out.push(part);
  }
  return out.join("/");
}

function lookupByName<T>(items: T[], nameOf: (t: T) => string | null, wanted: string): T | undefined {
  const n = normaliseName(wanted);
  const exact = items.find((t) => {
    const name = nameOf(t);
    return name !== null && normaliseName(name) === n;
  });
  if (exact) return exact;
  // The push may carry files by their base names only (curl -F file=@dir/x.yaml sends "x.yaml").
  const base = n.split("/").pop() ?? n;
  const same = items.filter((t) => {
    const name = nameOf(t);
    return name !== null && (normaliseName(name).split("/").pop() ?? "") === base;
  });
  return same.length === 1 ? same[0] : undefined;
}

/** Splits a multi-document YAML body at its `---` lines, keeping each document's first line. */
function splitDocuments(text: string): { text: string; lineOffset: number }[] {
  const lines = text.split("\n");
  const docs: { text: string; lineOffset: number }[] = [];
  let start = 0;
  for (let i = 0; i <= lines.length; i++) {
    if (i === lines.length || /^---[ \t]*(#.*)?\r?$/.test(lines[i] ?? "")) {
      const chunk = lines.slice(start, i).join("\n");
      docs.push({ text: chunk, lineOffset: start });
      start = i + 1;
    }
  }
  return docs.filter((d, i) => i === 0 || d.text.trim() !== "");
}

const commentOnly = (text: string): boolean => text.split("\n").every((l) => l.trim() === "" || l.trim().startsWith("#"));

export function loadProject(opts: { text: string; files?: PushedFile[]; contentType?: string; profiles?: string[] }): ProjectResult {
  const issues: InventoryIssue[] = [];
  const warnings: InventoryIssue[] = [];
  const envFiles = new Map<string, { name: string; text: string }>();
  const yamlInputs: { name: string | null; text: string; lineOffset: number; json: boolean }[] = [];

  if (opts.files && opts.files.length > 0) {
    for (const f of opts.files) {
      if (ENV_NAME.test(normaliseName(f.name))) envFiles.set(normaliseName(f.name), { name: f.name, text: f.text });
      else yamlInputs.push({ name: f.name, text: f.text, lineOffset: 0, json: looksLikeJson(f.text) });
    }
  } else if (looksLikeJson(opts.text, opts.contentType)) {
    yamlInputs.push({ name: null, text: opts.text, lineOffset: 0, json: true });
  } else {
    const docs = splitDocuments(opts.text);
    docs.forEach((d, i) => yamlInputs.push({ name: docs.length > 1 ? `document ${i + 1}` : null, text: d.text, lineOffset: d.lineOffset, json: false }));
  }
  const named = yamlInputs.length > 1 || envFiles.size > 0;

  // The project's variables: the pushed `.env` (Compose reads `.env` beside the first file).
  const vars = new Map<string, string>();
  const dotEnv = [...envFiles.values()].find((f) => (normaliseName(f.name).split("/").pop() ?? "") === ".env");
  if (dotEnv) {
    const parsed = parseEnvFile(dotEnv.text, (n) => vars.get(n));
    for (const p of parsed.problems) warnings.push({ path: "", file: dotEnv.name, line: p.line, column: p.column, message: `${p.message}; the line was skipped` });
    for (const e of parsed.entries) if (e.value !== null) vars.set(e.name, e.value);
  }

  const origins = new Origins();
  const files: YamlFile[] = [];
  const unresolved = new Set<string>();
  let services = 0;
  let tooLarge = false;
  yamlInputs.forEach((input, index) => {
    const fileName = named ? (input.name ?? undefined) : undefined;
    const shift = (i: InventoryIssue): InventoryIssue => ({
      ...i,
      ...(fileName !== undefined ? { file: fileName } : {}),
      ...(i.line !== undefined ? { line: i.line + input.lineOffset } : {}),
    });
    if (input.text.trim() === "" || commentOnly(input.text)) {
      files.push({ index, name: input.name, src: emptySource(), lineOffset: input.lineOffset, value: {}, tags: new Map() });
      return;
    }
    const loaded = loadStructured(input.text, {
      json: input.json,
      limit: { key: "services", max: MAX_COMPONENTS, noun: "services" },
      markTags: ["!reset", "!override"],
    });
    if (!loaded.ok) {
      if (loaded.status === 413) tooLarge = true;
      issues.push(...loaded.issues.map(shift));
      return;
    }
    const src = loaded.source;
    warnings.push(...src.warnings.map(shift));
    if (!isRecord(src.value) && src.value !== null && src.value !== undefined) {
      issues.push(shift({ path: "", line: 1, column: 1, message: "a Compose file is a mapping with a services: section" }));
      return;
    }
    if (src.value === null || src.value === undefined) {
      files.push({ index, name: input.name, src, lineOffset: input.lineOffset, value: {}, tags: new Map() });
      return;
    }
    const value = src.value as Record<string, unknown>;
    // Interpolation first, file by file, values only (not keys).
    interpolateValues(value, [], (path, text) => {
      const r = interpolate(text, (n) => vars.get(n));
      for (const name of r.unresolved) {
        if (unresolved.has(name)) continue;
        unresolved.add(name);
        warnings.push(
          shift({
            path: formatPath(path),
            ...src.locate(path),
            message: `variable ${name} is not set in the pushed .env and has no default: read as an empty string`,
          }),
        );
      }
      for (const req of r.required) {
        warnings.push(shift({ path: formatPath(path), ...src.locate(path), message: `variable ${req.name} is required${req.message ? ` (${req.message})` : ""} but not set in the pushed .env: read as an empty string` }));
      }
      return r.value;
    });
    const parsed = ComposeFileSchema.safeParse(src.value);
    // Shape errors do not stop the reading: the rules below (self-needs, key clashes) report theirs too.
    if (!parsed.success) issues.push(...mapZodIssues(parsed.error.issues, src).map(shift));
    if (isRecord(value.services)) services += Object.keys(value.services).length;
    const tags = new Map<string, "reset" | "override">();
    for (const t of src.tagged ?? []) tags.set(JSON.stringify(t.path), t.tag === "!reset" ? "reset" : "override");
    registerFile(value, index, origins);
    files.push({ index, name: input.name, src, lineOffset: input.lineOffset, value, tags });
  });
  if (services > MAX_COMPONENTS) {
    issues.push({ path: "services", message: `${services} services in one push; at most ${MAX_COMPONENTS} are accepted (split the project by source)` });
    return { ok: false, status: 413, issues };
  }
  if (issues.length > 0 && files.length < yamlInputs.length) return { ok: false, status: tooLarge ? 413 : 422, issues };

  const ctx: MergeContext = {
    origins,
    tagged: (w) => files[w.file]?.tags.get(JSON.stringify(w.path)) ?? null,
  };
  const position = (where: Where | undefined, o?: { key?: boolean }): FilePosition | undefined => {
    if (!where) return undefined;
    const f = files[where.file];
    if (!f) return undefined;
    const p = f.src.locate(where.path, o);
    return {
      ...(named && f.name !== null ? { file: f.name } : {}),
      ...(p.line !== undefined ? { line: p.line + f.lineOffset, column: p.column } : {}),
    };
  };
  const at = (where: Where | undefined, message: string, path: PathSegment[], key = false): InventoryIssue => {
    const pos = where ? position(where, { key }) : undefined;
    return { path: formatPath(path), ...(pos ?? {}), message };
  };
  const findFile = (name: string): YamlFile | undefined => lookupByName(files, (f) => f.name, name);
  const findEnvFile = (name: string) => lookupByName([...envFiles.values()], (f) => f.name, name);
  const envCache = new Map<string, { entries: EnvEntry[] }>();
  const readEnvFile = (name: string): { entries: EnvEntry[] } | undefined => {
    const f = findEnvFile(name);
    if (!f) return undefined;
    const cached = envCache.get(f.name);
    if (cached) return cached;
    const parsed = parseEnvFile(f.text, (n) => vars.get(n));
    for (const p of parsed.problems) warnings.push({ path: "", file: f.name, line: p.line, column: p.column, message: `${p.message}; the line was skipped` });
    const r = { entries: parsed.entries };
    envCache.set(f.name, r);
    return r;
  };

  // Files another file includes or extends from are not layers of the project themselves.
  const referenced = new Set<number>();
  for (const f of files) {
    for (const ref of includePaths(f.value).flatMap((r) => r.paths)) {
      const target = findFile(ref);
      if (target && target !== f) referenced.add(target.index);
    }
    for (const svc of Object.values(isPlainObject(f.value.services) ? f.value.services : {})) {
      const ext = isPlainObject(svc) && isPlainObject(svc.extends) ? svc.extends : null;
      if (ext && typeof ext.file === "string") {
        const target = findFile(ext.file);
        if (target && target !== f) referenced.add(target.index);
      }
    }
  }
  const layers = files.filter((f) => !referenced.has(f.index));
  let model: Record<string, unknown> = {};
  for (const f of layers) model = Object.keys(model).length === 0 ? f.value : mergeProjects(model, f.value, ctx);

  // include: copied after the merge, recursively; a clash keeps the including project's service.
  const included = new Set<number>();
  const applyIncludes = (target: Record<string, unknown>, depth: number): Record<string, unknown> => {
    let out = target;
    for (const ref of includePaths(target)) {
      const parts: YamlFile[] = [];
      for (const p of ref.paths) {
        const f = findFile(p);
        if (!f) {
          warnings.push(at(origins.get(ref.container, ref.key), `included file ${JSON.stringify(p)} is not in this push: its services were not read (push it in the same request)`, ["include", ref.key]));
          continue;
        }
        if (included.has(f.index) || depth > 8) continue;
        included.add(f.index);
        parts.push(f);
      }
      if (parts.length === 0) continue;
      let sub: Record<string, unknown> = parts[0]?.value ?? {};
      for (const p of parts.slice(1)) sub = mergeProjects(sub, p.value, ctx);
      sub = applyIncludes(sub, depth + 1);
      sub = { ...sub, services: resolveExtends(sub, parts[0] as YamlFile) };
      const subServices = isPlainObject(sub.services) ? sub.services : {};
      const mine = isPlainObject(out.services) ? { ...out.services } : {};
      const mineOrigins = isPlainObject(out.services) ? out.services : null;
      for (const name of Object.keys(mine)) {
        const w = mineOrigins ? origins.get(mineOrigins, name) : undefined;
        if (w) origins.set(mine, name, w);
      }
      for (const [name, svc] of Object.entries(subServices)) {
        const w = origins.get(subServices, name);
        if (name in mine) {
          warnings.push(at(w, `service ${JSON.stringify(name)} of included file ${JSON.stringify(parts[0]?.name ?? "")} is also declared by the including project; the including project's is kept (Compose does not merge them)`, ["services", name], true));
          continue;
        }
        mine[name] = svc;
        if (w) origins.set(mine, name, w);
      }
      out = { ...out, services: mine };
      const servicesWhere = origins.get(target, "services");
      if (servicesWhere) origins.set(out, "services", servicesWhere);
    }
    return out;
  };

  // extends: a service's base merged under it, recursively; the base from the same model or another pushed file.
  const resolveExtends = (proj: Record<string, unknown>, home: YamlFile | null): Record<string, unknown> => {
    const svcs = isPlainObject(proj.services) ? proj.services : {};
    const done = new Map<string, Record<string, unknown>>();
    const resolveIn = (pool: Record<string, unknown>, name: string, stack: string[], poolFile: YamlFile | null, poolDone: Map<string, Record<string, unknown>>): Record<string, unknown> | null => {
      const cachedResult = poolDone.get(name);
      if (cachedResult) return cachedResult;
      const svc = pool[name];
      if (!isPlainObject(svc)) return null;
      const ext = isPlainObject(svc.extends) ? svc.extends : null;
      if (!ext || typeof ext.service !== "string") {
        poolDone.set(name, svc);
        return svc;
      }
      const extWhere = origins.get(svc, "extends");
      const path = ["services", name, "extends"];
      if (stack.includes(`${poolFile?.index ?? "main"}:${ext.service}`)) {
        issues.push(at(extWhere, `extends of ${JSON.stringify(name)} goes round in a circle (${[...stack.map((s) => s.slice(s.indexOf(":") + 1)), name, ext.service].join(" → ")})`, path));
        return null;
      }
      let base: Record<string, unknown> | null = null;
      if (typeof ext.file === "string") {
        const f = findFile(ext.file);
        if (!f) {
          warnings.push(at(extWhere, `extends file ${JSON.stringify(ext.file)} is not in this push: ${JSON.stringify(name)} was read without its base service`, path));
        } else {
          const pool2 = isPlainObject(f.value.services) ? f.value.services : {};
          if (!(ext.service in pool2)) {
            issues.push(at(extWhere, `extends names service ${JSON.stringify(ext.service)}, which ${JSON.stringify(f.name ?? ext.file)} does not define`, path));
          } else {
            base = resolveIn(pool2, ext.service, [...stack, `${poolFile?.index ?? "main"}:${name}`], f, new Map());
          }
        }
      } else if (!(ext.service in pool)) {
        issues.push(at(extWhere, `extends names service ${JSON.stringify(ext.service)}, which is not defined in the same file`, path));
      } else {
        base = resolveIn(pool, ext.service, [...stack, `${poolFile?.index ?? "main"}:${name}`], poolFile, poolDone);
      }
      const own: Record<string, unknown> = {};
      for (const [k, v] of Object.entries(svc)) {
        if (k === "extends") continue;
        own[k] = v;
        const w = origins.get(svc, k);
        if (w) origins.set(own, k, w);
      }
      const merged = base ? mergeService(withoutExtends(base, origins), own, { origins, tagged: ctx.tagged }) : own;
      poolDone.set(name, merged);
      return merged;
    };
    const out: Record<string, unknown> = {};
    for (const name of Object.keys(svcs)) {
      const r = resolveIn(svcs, name, [], home, done);
      out[name] = r ?? svcs[name];
      const w = origins.get(svcs, name);
      if (w) origins.set(out, name, w);
    }
    return out;
  };

  model = applyIncludes(model, 0);
  const servicesWhere = origins.get(model, "services");
  if (isPlainObject(model.services)) {
    model = { ...model, services: resolveExtends(model, layers[0] ?? null) };
    if (servicesWhere) origins.set(model, "services", servicesWhere);
  }

  return {
    ok: true,
    project: { model, files, envFiles, vars, origins, issues, warnings, position, findFile, findEnvFile, readEnvFile },
  };
}

function withoutExtends(svc: Record<string, unknown>, origins: Origins): Record<string, unknown> {
  if (!("extends" in svc)) return svc;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(svc)) {
    if (k === "extends") continue;
    out[k] = v;
    const w = origins.get(svc, k);
    if (w) origins.set(out, k, w);
  }
  return out;
}

function includePaths(value: Record<string, unknown>): { paths: string[]; container: object; key: number }[] {
  const inc = value.include;
  if (!Array.isArray(inc)) return [];
  const out: { paths: string[]; container: object; key: number }[] = [];
  inc.forEach((entry, i) => {
    if (typeof entry === "string") out.push({ paths: [entry], container: inc, key: i });
    else if (isPlainObject(entry)) {
      const p = entry.path;
      const paths = typeof p === "string" ? [p] : Array.isArray(p) ? p.filter((x): x is string => typeof x === "string") : [];
      out.push({ paths, container: inc, key: i });
    }
  });
  return out;
}

function interpolateValues(container: Record<string, unknown> | unknown[], path: PathSegment[], fn: (path: PathSegment[], text: string) => string): void {
  const entries: [string | number, unknown][] = Array.isArray(container) ? container.map((v, i) => [i, v]) : Object.entries(container);
  for (const [k, v] of entries) {
    if (typeof v === "string") {
      if (v.includes("$")) {
        const next = fn([...path, k], v);
        if (Array.isArray(container)) container[k as number] = next;
        else container[k as string] = next;
      }
    } else if (typeof v === "object" && v !== null && path.length < 70) {
      interpolateValues(v as Record<string, unknown>, [...path, k], fn);
    }
  }
}

function emptySource(): StructuredSource {
  return { value: null, warnings: [], locate: () => ({}) };
}

/** A pushed file's bytes as text, with the same UTF-8 and binary checks as a single body. */
export function decodeFile(name: string, body: string | Uint8Array): { ok: true; file: PushedFile } | { ok: false; issues: InventoryIssue[] } {
  const d = decodeBody(body);
  if (!d.ok) return { ok: false, issues: d.issues.map((i) => ({ ...i, file: name })) };
  return { ok: true, file: { name, text: d.text } };
}
