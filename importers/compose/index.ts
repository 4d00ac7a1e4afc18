// Compose Specification → normalised inventory. One push may carry a whole project: several
// files in order (a multipart body, or a multi-document YAML body), `.env` files among them.
// `project.ts` builds the merged Compose model the way Compose would, `graph.ts` reads the
// components and needs out of it; see both for the rules and importers/README.md for the list.
import { SOURCE_PATTERN, type ImportFile, type ImportResult, type InventoryIssue } from "@/lib/inventory/types";
import { checkOrigin } from "../shared/origin";
import { finishIssues } from "../shared/text";
import { buildGraph } from "./graph";
import { decodeFile, loadProject, type PushedFile } from "./project";

export interface ComposeOptions {
  body: string | Uint8Array;
  /** Compose files name no source unless `x-pinchpoint.source` does; the push names it. */
  source?: string;
  environment?: string;
  contentType?: string;
  positions?: boolean;
  files?: ImportFile[];
  profiles?: string[];
}

export function parseCompose(opts: Omit<ComposeOptions, "body"> & { text: string }): ImportResult {
  let files: PushedFile[] | undefined;
  if (opts.files && opts.files.length > 0) {
    files = [];
    const bad: InventoryIssue[] = [];
    for (const f of opts.files) {
      const d = decodeFile(f.name, f.body);
      if (d.ok) files.push(d.file);
      else bad.push(...d.issues);
    }
    if (bad.length > 0) return { ok: false, status: 422, issues: finishIssues(bad) };
  }
  const loaded = loadProject({ text: opts.text, files, contentType: opts.contentType, profiles: opts.profiles });
  if (!loaded.ok) return { ok: false, status: loaded.status, issues: finishIssues(loaded.issues) };
  const project = loaded.project;
  const graph = buildGraph(project, { profiles: opts.profiles ?? [], positions: opts.positions === true });

  // The push names the source; the file may too (x-pinchpoint.source), and then they must agree.
  const fileSource = graph.projectExtension?.source;
  const origin = checkOrigin({ source: opts.source || fileSource, environment: opts.environment });
  const issues: InventoryIssue[] = [...origin.issues, ...project.issues, ...graph.issues];
  if (fileSource && opts.source && fileSource !== opts.source && SOURCE_PATTERN.test(fileSource)) {
    issues.push({ path: "x-pinchpoint.source", message: `the file says source ${JSON.stringify(fileSource)} but the push says ?source=${opts.source}` });
  }
  const firstFile = project.files[0];
  if (project.model.services === undefined || project.model.services === null) {
    issues.push({ path: "services", ...(firstFile?.name && project.files.length > 1 ? { file: firstFile.name } : {}), line: 1 + (firstFile?.lineOffset ?? 0), column: 1, message: "the file holds no services" });
  }
  if (issues.length > 0 || origin.source === null) return { ok: false, status: 422, issues: finishIssues(issues) };

  const warnings = [...project.warnings, ...graph.warnings];
  if (graph.needCount === 0 && graph.components.length > 1) {
    warnings.push({
      path: "services",
      message:
        "the project yields no dependencies: no service has depends_on, links, network_mode: service:…, volumes_from, or another service's host name in its environment, env_file, command or entrypoint. " +
        "If the services do call each other, say so under each service with x-pinchpoint: { needs: { <service>: hard } }",
    });
  }
  return {
    ok: true,
    inventory: {
      source: origin.source,
      environment: origin.environment,
      components: graph.components,
      observedEdges: [],
      warnings: inFileOrder(onceEach(warnings), project.files.map((f) => f.name)),
      notes: graph.notes,
    },
  };
}

/** By file (in push order), then line and column; unlocated ones last, in the order found. */
function inFileOrder(warnings: InventoryIssue[], files: (string | null)[]): InventoryIssue[] {
  const fileRank = (w: InventoryIssue): number => {
    if (w.file === undefined) return -1;
    const i = files.indexOf(w.file);
    return i === -1 ? files.length : i;
  };
  return warnings
    .map((w, i) => ({ w, i }))
    .sort((a, b) => {
      const la = a.w.line === undefined ? 1 : 0;
      const lb = b.w.line === undefined ? 1 : 0;
      return la - lb || fileRank(a.w) - fileRank(b.w) || (a.w.line ?? 0) - (b.w.line ?? 0) || (a.w.column ?? 0) - (b.w.column ?? 0) || a.i - b.i;
    })
    .map(({ w }) => w);
}

/** Each warning once, whatever path led to it twice. */
function onceEach(warnings: InventoryIssue[]): InventoryIssue[] {
  const seen = new Set<string>();
  return warnings.filter((w) => {
    const id = JSON.stringify([w.file, w.line, w.column, w.message]);
    if (seen.has(id)) return false;
    seen.add(id);
    return true;
  });
}
