// Format 1 text → normalised inventory. One pass collects every problem: parser errors stop
// early (the tree is unreliable), otherwise zod's issues and the rules zod cannot express
// (self-dependency, duplicate keys, agreement with the push URL) are reported together.
import {
  type ComponentEntry,
  type InventoryFile,
  InventoryFileSchema,
  type NeedEntry,
  needBranch,
} from "@/lib/inventory/schema";
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import {
  strongerStrength,
  type ImportResult,
  type InventoryComponent,
  type InventoryIssue,
  type Need,
  type NormalisedInventory,
} from "@/lib/inventory/types";
import { isRecord, loadStructured, looksLikeJson, type StructuredSource } from "../shared/structured";
import { finishIssues, formatPath, type PathSegment } from "../shared/text";
import { mapZodIssues } from "../shared/zod-issues";

export interface ParsePinchpointOptions {
  text: string;
  contentType?: string;
  /** From the push URL; when the file names one too they must agree. */
  source?: string;
  environment?: string;
  /** Fill `at` on every component and need (see ImportRequest.positions). */
  positions?: boolean;
}

const DEFAULT_TIER = 3;
const DEFAULT_REPLICAS = 1;

export function parsePinchpoint(opts: ParsePinchpointOptions): ImportResult {
  const loaded = loadStructured(opts.text, {
    json: looksLikeJson(opts.text, opts.contentType),
    limit: { key: "components", max: MAX_COMPONENTS, noun: "components" },
  });
  if (!loaded.ok) return { ok: false, status: loaded.status, issues: finishIssues(loaded.issues) };
  const src = loaded.source;

  if (!isRecord(src.value)) {
    const message = "the file must be a mapping with pinchpoint, source and components";
    return { ok: false, status: 422, issues: [{ path: "", ...src.locate([]), message }] };
  }
  const parsed = InventoryFileSchema.safeParse(src.value);
  const issues: InventoryIssue[] = parsed.success
    ? []
    : mapZodIssues(parsed.error.issues, src, {
        unionBranch: needBranch,
        unionMessage: "a need is a component key, { key, strength?, via? } or { any_of: [keys], strength?, via? }",
      });
  issues.push(...checkRules(src, opts));
  if (!parsed.success || issues.length > 0) return { ok: false, status: 422, issues: finishIssues(issues) };

  return { ok: true, inventory: normalise(parsed.data, src, opts) };
}

const at = (src: StructuredSource, path: PathSegment[], message: string, key = false): InventoryIssue => ({
  path: formatPath(path),
  ...src.locate(path, { key }),
  message,
});

/**
 * Rules beyond the schema. They read the raw value defensively so they still run when zod
 * has found problems elsewhere in the same file.
 */
function checkRules(src: StructuredSource, opts: ParsePinchpointOptions): InventoryIssue[] {
  const out: InventoryIssue[] = [];
  const file = src.value;
  if (!isRecord(file)) return out;
  for (const field of ["source", "environment"] as const) {
    const fromUrl = opts[field];
    const inFile = file[field];
    if (fromUrl !== undefined && typeof inFile === "string" && inFile !== fromUrl) {
      out.push(at(src, [field], `the file says ${field} ${JSON.stringify(inFile)} but the push names ${JSON.stringify(fromUrl)}`));
    }
  }
  const components = Array.isArray(file.components) ? (file.components as unknown[]) : [];

  const firstByKey = new Map<string, number>();
  const dupes = new Map<string, number[]>();
  components.forEach((c, i) => {
    if (!isRecord(c) || typeof c.key !== "string") return;
    const first = firstByKey.get(c.key);
    if (first === undefined) firstByKey.set(c.key, i);
    else dupes.set(c.key, [...(dupes.get(c.key) ?? [first]), i]);
  });
  for (const [key, indexes] of dupes) {
    for (const i of indexes) {
      const others = indexes
        .filter((j) => j !== i)
        .map((j) => {
          const line = src.locate(["components", j, "key"]).line;
          return `components[${j}]${line === undefined ? "" : ` (line ${line})`}`;
        });
      out.push(at(src, ["components", i, "key"], `duplicate component key ${JSON.stringify(key)}: also declared at ${others.join(", ")}`));
    }
  }

  components.forEach((c, i) => {
    if (!isRecord(c) || typeof c.key !== "string" || !Array.isArray(c.needs)) return;
    const self = c.key;
    (c.needs as unknown[]).forEach((need, j) => {
      const base: PathSegment[] = ["components", i, "needs", j];
      if (need === self) out.push(at(src, base, `${JSON.stringify(self)} needs itself (self-dependency)`));
      if (!isRecord(need)) return;
      if (need.key === self) out.push(at(src, [...base, "key"], `${JSON.stringify(self)} needs itself (self-dependency)`));
      if (!Array.isArray(need.any_of)) return;
      const seen = new Set<unknown>();
      (need.any_of as unknown[]).forEach((member, m) => {
        const path = [...base, "any_of", m];
        if (member === self) out.push(at(src, path, `any_of of ${JSON.stringify(self)} contains ${JSON.stringify(self)} itself`));
        else if (seen.has(member)) out.push(at(src, path, `${JSON.stringify(member)} is listed twice in one any_of`));
        seen.add(member);
      });
    });
  });
  return out;
}

/** Applies defaults and merges repeated needs (see `normaliseNeeds`). */
function normalise(file: InventoryFile, src: StructuredSource, opts: ParsePinchpointOptions): NormalisedInventory {
  const d = file.defaults ?? {};
  const warnings: InventoryIssue[] = [...src.warnings];
  const components = file.components.map((c, i): InventoryComponent => {
    const team = c.team !== undefined ? c.team : (d.team ?? null);
    return {
      key: c.key,
      name: c.name ?? c.key,
      kind: c.kind,
      team,
      tier: (c.tier ?? d.tier ?? DEFAULT_TIER) as InventoryComponent["tier"],
      replicas: c.replicas ?? d.replicas ?? DEFAULT_REPLICAS,
      zones: unique(c.zones ?? d.zones ?? []),
      tags: unique(c.tags ?? d.tags ?? []),
      // Links merge name by name so a shared `repo` link in defaults survives a component's own `runbook`.
      links: { ...d.links, ...c.links },
      aliases: unique(c.aliases ?? []),
      needs: normaliseNeeds(c, i, src, warnings, opts.positions === true),
      ...(opts.positions ? { at: src.locate(["components", i]) } : {}),
    };
  });
  return {
    source: file.source,
    environment: file.environment ?? opts.environment ?? null,
    components,
    observedEdges: [],
    warnings,
  };
}

/**
 * Repeating a need in one component is allowed but pointless, so it is a warning, not an
 * error: the repeats are merged into the first, `hard` wins over `soft` (the stricter claim
 * is the safer one for blast radius) and the first `via` given is kept. The same holds for
 * two any_of groups with the same members.
 */
function normaliseNeeds(c: ComponentEntry, i: number, src: StructuredSource, warnings: InventoryIssue[], positions: boolean): Need[] {
  const out: Need[] = [];
  const index = new Map<string, { need: Need; j: number }>();
  (c.needs ?? []).forEach((entry: NeedEntry, j) => {
    const need = toNeed(entry);
    if (positions) need.at = src.locate(["components", i, "needs", j]);
    const id = need.type === "single" ? `1:${need.key}` : `n:${[...need.keys].sort().join(",")}`;
    const prior = index.get(id);
    if (!prior) {
      index.set(id, { need, j });
      out.push(need);
      return;
    }
    prior.need.strength = strongerStrength(prior.need.strength, need.strength);
    prior.need.via ??= need.via;
    const what = need.type === "single" ? `need on ${JSON.stringify(need.key)}` : "any_of group with these members";
    warnings.push(at(src, ["components", i, "needs", j], `${what} repeats needs[${prior.j}]; merged into it`));
  });
  return out;
}

function toNeed(entry: NeedEntry): Need {
  if (typeof entry === "string") return { type: "single", key: entry, strength: "hard", via: null };
  if ("any_of" in entry) return { type: "any_of", keys: [...entry.any_of], strength: entry.strength ?? "hard", via: entry.via ?? null };
  return { type: "single", key: entry.key, strength: entry.strength ?? "hard", via: entry.via ?? null };
}

function unique(values: readonly string[]): string[] {
  return [...new Set(values)];
}
