// Compose Specification → normalised inventory. Each `services.<name>` becomes a component of
// kind `service` whose key is the name lower-cased (Compose allows upper case, our keys do not).
//   depends_on (list form)            → hard need
//   depends_on (map form)             → hard need; `required: false` → soft need (Compose starts
//                                       without it, so the dependent is degraded, not down);
//                                       `condition` does not change the strength
//   links: ["db"] or ["db:alias"]      → hard need on db
// A need repeated through both depends_on and links is kept once (hard wins).
// deploy.replicas ≥ 1 sets replicas (0 means "scaled down", kept as the default 1); team null, tier 3.
// A need on a service not in the file is a warning: Compose itself would refuse it, but
// another source may declare that key, so it stays a need.
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import type { ImportResult, InventoryComponent, InventoryIssue, Need, Strength } from "@/lib/inventory/types";
import { KEY_PATTERN } from "@/lib/inventory/types";
import { checkedText } from "../shared/body";
import { checkOrigin } from "../shared/origin";
import { isRecord, loadStructured, looksLikeJson, type StructuredSource } from "../shared/structured";
import { finishIssues, formatPath, type PathSegment } from "../shared/text";
import { mapZodIssues } from "../shared/zod-issues";
import { ComposeFileSchema, dependsOnBranch } from "./schema";

export interface ComposeOptions {
  body: string | Uint8Array;
  /** Compose files name no source; the push names it. */
  source?: string;
  environment?: string;
  contentType?: string;
}

export function importCompose(opts: ComposeOptions): ImportResult {
  const text = checkedText(opts.body);
  if (!text.ok) return text;
  return parseCompose({ ...opts, text: text.text });
}

export function parseCompose(opts: Omit<ComposeOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const loaded = loadStructured(opts.text, {
    json: looksLikeJson(opts.text, opts.contentType),
    limit: { key: "services", max: MAX_COMPONENTS, noun: "services" },
  });
  if (!loaded.ok) return { ok: false, status: loaded.status, issues: finishIssues([...origin.issues, ...loaded.issues]) };
  const src = loaded.source;

  const parsed = ComposeFileSchema.safeParse(src.value);
  const issues: InventoryIssue[] = [...origin.issues];
  if (!parsed.success) {
    issues.push(
      ...mapZodIssues(parsed.error.issues, src, {
        unionBranch: dependsOnBranch,
        unionMessage: "depends_on must be a list of service names or a mapping of service name to { condition, required }",
      }),
    );
  }
  const services = isRecord(src.value) && isRecord(src.value.services) ? src.value.services : {};
  const warnings: InventoryIssue[] = [...src.warnings];
  const components = readServices(services, src, issues, warnings);
  if (!parsed.success || issues.length > 0 || origin.source === null) {
    return { ok: false, status: 422, issues: finishIssues(issues) };
  }
  return {
    ok: true,
    inventory: { source: origin.source, environment: origin.environment, components, observedEdges: [], warnings },
  };
}

const at = (src: StructuredSource, path: PathSegment[], message: string, key = false): InventoryIssue => ({
  path: formatPath(path),
  ...src.locate(path, { key }),
  message,
});

function toKey(
  name: string,
  path: PathSegment[],
  src: StructuredSource,
  issues: InventoryIssue[],
  isName: boolean,
): string | null {
  const key = name.toLowerCase();
  if (KEY_PATTERN.test(key)) return key;
  issues.push(
    at(
      src,
      path,
      `${JSON.stringify(name)} cannot be a component key: lower-cased it must be 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`,
      isName,
    ),
  );
  return null;
}

function readServices(
  services: Record<string, unknown>,
  src: StructuredSource,
  issues: InventoryIssue[],
  warnings: InventoryIssue[],
): InventoryComponent[] {
  const components: InventoryComponent[] = [];
  const firstName = new Map<string, string>();
  const declared = new Set(Object.keys(services).map((n) => n.toLowerCase()));

  for (const [name, raw] of Object.entries(services)) {
    const path: PathSegment[] = ["services", name];
    const key = toKey(name, path, src, issues, true);
    if (key === null) continue;
    const earlier = firstName.get(key);
    if (earlier !== undefined) {
      // Compose names are case-sensitive, our keys are not: `Web` and `web` would collide.
      issues.push(at(src, path, `services ${JSON.stringify(earlier)} and ${JSON.stringify(name)} both become key ${JSON.stringify(key)}`, true));
      issues.push(at(src, ["services", earlier], `services ${JSON.stringify(earlier)} and ${JSON.stringify(name)} both become key ${JSON.stringify(key)}`, true));
      continue;
    }
    firstName.set(key, name);

    const service = isRecord(raw) ? raw : {};
    const needs = new Map<string, Strength>();
    const addNeed = (target: string, strength: Strength, p: PathSegment[]): void => {
      const to = toKey(target, p, src, issues, false);
      if (to === null) return;
      if (to === key) {
        issues.push(at(src, p, `service ${JSON.stringify(name)} depends on itself`));
        return;
      }
      if (!declared.has(to)) warnings.push(at(src, p, `${JSON.stringify(target)} is not a service in this file; kept as a need`));
      needs.set(to, needs.get(to) === "hard" ? "hard" : strength);
    };

    const dependsOn = service.depends_on;
    if (Array.isArray(dependsOn)) {
      dependsOn.forEach((t, i) => {
        if (typeof t === "string") addNeed(t, "hard", [...path, "depends_on", i]);
      });
    } else if (isRecord(dependsOn)) {
      for (const [t, spec] of Object.entries(dependsOn)) {
        const soft = isRecord(spec) && spec.required === false;
        addNeed(t, soft ? "soft" : "hard", [...path, "depends_on", t]);
      }
    }
    if (Array.isArray(service.links)) {
      service.links.forEach((l, i) => {
        if (typeof l !== "string") return;
        const target = l.split(":")[0] ?? "";
        addNeed(target, "hard", [...path, "links", i]);
      });
    }

    const deploy = isRecord(service.deploy) ? service.deploy : {};
    const replicas = typeof deploy.replicas === "number" && Number.isInteger(deploy.replicas) && deploy.replicas >= 1 ? deploy.replicas : 1;
    components.push({
      key,
      name,
      kind: "service",
      team: null,
      tier: 3,
      replicas,
      zones: [],
      tags: [],
      links: {},
      aliases: [],
      needs: [...needs].map(([k, strength]): Need => ({ type: "single", key: k, strength, via: null })),
    });
  }
  return components;
}
