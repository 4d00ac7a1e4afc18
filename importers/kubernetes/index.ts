// Kubernetes manifests → normalised inventory. The rules, each with its test in
// tests/importers/kubernetes.test.ts and its reading in importers/README.md:
//   components  Deployments, StatefulSets, DaemonSets (kind `service`); CronJobs and Jobs (kind
//               `job`); ReplicaSets, Jobs and Pods only when no object owns them (a cluster dump
//               lists the ReplicaSets and Pods its Deployments made); Ingresses and Gateway API
//               Gateways (kind `gateway`); ExternalName and selector-less Services (kind `external`).
//   keys        keys.ts; the display name is `<namespace>/<name>`.
//   Services    link names to workloads: a need on a Service is a need on the workloads its
//               selector matches (any_of when several). A selector matching no workload leaves the
//               Service's key undeclared (a placeholder after the merge) with a warning.
//   needs       needs.ts (inferred, from configuration); Ingress rules and HTTPRoute/GRPCRoute
//               backends (declared: the entry needs the backends' workloads, hard); the
//               `pinchpoint/needs` annotation (declared).
//   jobs        a Job's or CronJob's own needs are what it calls while it runs, with the same
//               strengths as a service's, so a drill shows the batch run failing; what other
//               workloads need of a job (an init container waiting for a migration) is start-up only.
//   replicas    spec.replicas (default 1, the API's default; 0 is taken as 1, scaled down), or the
//               minReplicas of a HorizontalPodAutoscaler that targets the workload; DaemonSets
//               status.desiredNumberScheduled when a dump has it, else 1; Jobs spec.parallelism.
//   zones       node affinity / nodeSelector on topology.kubernetes.io/zone pins the zones
//               (one zone: tag `single-zone`); a zone topologySpreadConstraint or required
//               zone anti-affinity spreads the Pods over the zones of the push's Node objects
//               (tag `zone-spread`; no zones are named when the push has no Nodes).
//   PDBs        a PodDisruptionBudget selecting a workload's Pods tags it `pdb:<name>`.
//   owners      teams.ts; tier and kind from the `pinchpoint/tier` and `pinchpoint/kind` annotations.
//   aliases     the names of Services that select only this workload, and its Pods'
//               `app.kubernetes.io/name` / `app` label, when no other name of the push claims them.
//   NetworkPolicy  read and counted only: an egress rule allows a path, it never says one is needed.
import { MAX_COMPONENTS } from "@/lib/inventory/limits";
import type { DeclaredKind, ImportResult, InventoryComponent, InventoryIssue, KubernetesImportOptions, Need, Tier } from "@/lib/inventory/types";
import { COMPONENT_KINDS, KEY_PATTERN } from "@/lib/inventory/types";
import { checkOrigin } from "../shared/origin";
import { isRecord, type Position } from "../shared/structured";
import { finishIssues, formatPath, type PathSegment } from "../shared/text";
import { mapZodIssues } from "../shared/zod-issues";
import { resolveServiceHost, type ServiceRef } from "./dns";
import { allocateKeys, type KeyClaim } from "./keys";
import { loadManifests, type LoadedManifests, type ManifestObject } from "./load";
import { podNeeds, type ConfigMapEntry } from "./needs";
import {
  KINDS,
  WORKLOAD_KINDS,
  type ConfigMap,
  type CronJob,
  type DaemonSet,
  type Deployment,
  type Hpa,
  type Ingress,
  type Job,
  type ObjectMeta,
  type Pdb,
  type Pod,
  type PodSpec,
  type ReadKind,
  type Route,
  type Service,
  type WorkloadKind,
} from "./schema";
import { labelSelectorMatches, serviceSelects, type Labels } from "./selectors";
import { checkSettings, Owners, PINCHPOINT_ANNOTATION } from "./teams";

export interface KubernetesOptions {
  body: string | Uint8Array;
  /** Manifests name no source; the push names it. */
  source?: string;
  environment?: string;
  contentType?: string;
  positions?: boolean;
  settings?: KubernetesImportOptions;
}

const ZONE_KEYS = ["topology.kubernetes.io/zone", "failure-domain.beta.kubernetes.io/zone"];

interface Obj<T> {
  value: T;
  path: PathSegment[];
  namespace: string;
  name: string;
  kind: ReadKind;
}

interface Workload {
  obj: Obj<{ metadata: ObjectMeta }>;
  kind: WorkloadKind;
  podLabels: Labels;
  spec: PodSpec;
  replicas: number;
  tags: string[];
}

const RANK: Record<string, number> = { Deployment: 0, StatefulSet: 1, DaemonSet: 2, ReplicaSet: 3, CronJob: 4, Job: 5, Pod: 6, Service: 7, Ingress: 9, Gateway: 10, HTTPRoute: 11, GRPCRoute: 12 };

export function parseKubernetes(opts: Omit<KubernetesOptions, "body"> & { text: string }): ImportResult {
  const origin = checkOrigin(opts);
  const settings = checkSettings(opts.settings ?? {});
  const loaded = loadManifests(opts.text);
  if (!loaded.ok) return { ok: false, status: loaded.status, issues: finishIssues([...origin.issues, ...settings.issues, ...loaded.issues]) };
  const m = loaded.manifests;
  const issues: InventoryIssue[] = [...origin.issues, ...settings.issues];
  const warnings: InventoryIssue[] = [];
  const at = (path: PathSegment[], message: string): InventoryIssue => ({ path: formatPath(path), ...m.source.locate(path), message });

  const read = classify(m, issues);
  const workloadCount = read.workloads.length;
  if (workloadCount > MAX_COMPONENTS) {
    return { ok: false, status: 413, issues: [{ path: "", message: `${workloadCount} workloads in one push; at most ${MAX_COMPONENTS} are accepted (split the push by namespace)` }] };
  }
  if (read.unknown.size > 0) {
    const list = [...read.unknown].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1)).map(([k, n]) => `${k} ×${n}`);
    const total = [...read.unknown.values()].reduce((a, b) => a + b, 0);
    warnings.push({ path: "", message: `${total} object${total === 1 ? "" : "s"} of kinds this importer does not read ${total === 1 ? "was" : "were"} skipped: ${list.join(", ")}` });
  }
  if (read.owned.size > 0) {
    const list = [...read.owned].map(([k, n]) => `${k} ×${n}`);
    warnings.push({ path: "", message: `objects made by another object (ownerReferences) are read through their owner and were skipped: ${list.join(", ")}` });
  }

  const domain = settings.clusterDomain;
  const owners = new Owners(settings, read.namespaces, warnings);

  // HorizontalPodAutoscalers override replicas; PodDisruptionBudgets tag.
  const hpaMin = new Map<string, number>();
  for (const h of read.hpas) hpaMin.set(`${h.namespace}/${h.value.spec.scaleTargetRef.kind}/${h.value.spec.scaleTargetRef.name}`, h.value.spec.minReplicas ?? 1);
  const nodeZones = [...new Set(read.nodeZones)].sort();

  // Services: which workloads each selects (indexed by namespace and one label, as a dump has thousands).
  const byLabel = new Map<string, Workload[]>();
  for (const w of read.workloads) {
    for (const [k, v] of Object.entries(w.podLabels)) {
      const id = `${w.obj.namespace}\u0000${k}\u0000${v}`;
      const list = byLabel.get(id) ?? [];
      list.push(w);
      byLabel.set(id, list);
    }
  }
  const selected = new Map<string, Workload[]>();
  const serviceInfo = new Map<string, { headless: boolean; obj: Obj<Service>; role: "workloads" | "external" | "unmatched" }>();
  const claims: KeyClaim[] = [];
  const claim = (o: Obj<unknown>, kind: string) => claims.push({ id: `${kind}/${o.namespace}/${o.name}`, name: o.name, namespace: o.namespace, rank: RANK[kind] ?? 20, suffix: kind.toLowerCase() });
  for (const w of read.workloads) claim(w.obj, w.kind);
  for (const s of read.services) {
    const id = `${s.namespace}/${s.name}`;
    const spec = s.value.spec ?? {};
    const headless = spec.clusterIP === "None";
    const selector = spec.selector ?? {};
    if (spec.type === "ExternalName" || Object.keys(selector).length === 0) {
      serviceInfo.set(id, { headless, obj: s, role: "external" });
      claim(s, "Service");
      const why = spec.type === "ExternalName" ? `an ExternalName Service (it answers with ${spec.externalName ?? "another name"})` : "a Service without a selector (its endpoints are managed outside the cluster's controllers)";
      warnings.push(at(s.path, `${s.namespace}/${s.name} is ${why}: kept as an external component`));
      continue;
    }
    const [k, v] = Object.entries(selector)[0]!;
    const matched = (byLabel.get(`${s.namespace}\u0000${k}\u0000${v}`) ?? []).filter((w) => serviceSelects(selector, w.podLabels));
    if (matched.length === 0) {
      serviceInfo.set(id, { headless, obj: s, role: "unmatched" });
      claim(s, "Service");
      warnings.push(at(s.path, `Service ${s.namespace}/${s.name} selects no workload of this push: needs on it stay on an undeclared component until a source declares one`));
      continue;
    }
    serviceInfo.set(id, { headless, obj: s, role: "workloads" });
    selected.set(id, matched);
  }

  // Gateway API: routes attach to a Gateway of the push, or stand as their own entry.
  const gatewayIds = new Set(read.gateways.map((g) => `${g.namespace}/${g.name}`));
  const routeParents = new Map<Obj<Route>, string[]>();
  for (const r of read.routes) {
    const parents = (r.value.spec.parentRefs ?? [])
      .filter((p) => (p.group ?? "gateway.networking.k8s.io") === "gateway.networking.k8s.io" && (p.kind ?? "Gateway") === "Gateway")
      .map((p) => `${p.namespace ?? r.namespace}/${p.name}`);
    const inPush = parents.filter((p) => gatewayIds.has(p));
    routeParents.set(r, inPush);
    if (inPush.length === 0) {
      claim(r, r.kind);
      warnings.push(at(r.path, `${r.kind} ${r.namespace}/${r.name} attaches to no Gateway of this push${parents.length ? ` (${parents.join(", ")})` : ""}: the route itself is kept as the entry`));
    }
  }
  for (const i of read.ingresses) claim(i, "Ingress");
  for (const g of read.gateways) claim(g, "Gateway");

  const allocation = allocateKeys(claims);
  for (const p of allocation.problems) {
    const obj = read.byId.get(p.claim.id);
    issues.push(obj ? at(obj.path, p.message) : { path: "", message: p.message });
  }
  const keyOf = (kind: string, ns: string, name: string) => allocation.keys.get(`${kind}/${ns}/${name}`);
  const workloadKey = (w: Workload) => keyOf(w.kind, w.obj.namespace, w.obj.name);

  const targetOf = (ref: ServiceRef): string[] | null => {
    const id = `${ref.namespace}/${ref.name}`;
    const info = serviceInfo.get(id);
    if (!info) return null;
    if (info.role !== "workloads") {
      const k = keyOf("Service", ref.namespace, ref.name);
      return k === undefined ? null : [k];
    }
    return (selected.get(id) ?? []).map(workloadKey).filter((k): k is string => k !== undefined);
  };
  const services = { get: (ns: string, name: string) => serviceInfo.get(`${ns}/${name}`) };

  const components: InventoryComponent[] = [];
  const positionsWanted = opts.positions === true;
  const objAt = (o: Obj<unknown>): Position => m.positionOf(o.value as object);
  const componentAt = (o: Obj<unknown>) => (positionsWanted ? { at: objAt(o) } : {});

  // Declared needs written in the `pinchpoint/needs` annotation: Service names (any DNS form) or keys.
  const annotatedNeeds = (o: Obj<{ metadata: ObjectMeta }>, self: string): Need[] => {
    const raw = o.value.metadata.annotations?.[`${PINCHPOINT_ANNOTATION}needs`];
    if (raw === undefined) return [];
    const out: Need[] = [];
    for (const entry of raw.split(/[\s,]+/).filter(Boolean)) {
      const [name = "", strengthRaw = "hard"] = entry.split("=");
      const strength = strengthRaw === "soft" || strengthRaw === "startup" || strengthRaw === "hard" ? strengthRaw : null;
      const ref = resolveServiceHost(name, o.namespace, domain, services);
      const keys = ref ? (targetOf(ref) ?? []).filter((k) => k !== self) : KEY_PATTERN.test(name) && name !== self ? [name] : [];
      if (strength === null || keys.length === 0) {
        warnings.push(at([...o.path, "metadata", "annotations", `${PINCHPOINT_ANNOTATION}needs`], `${PINCHPOINT_ANNOTATION}needs entry ${JSON.stringify(entry)} is not a Service or component key with an optional =hard, =soft or =startup`));
        continue;
      }
      out.push({ ...(keys.length === 1 ? { type: "single" as const, key: keys[0]! } : { type: "any_of" as const, keys: keys.sort() }), strength, via: null, ...(positionsWanted ? { at: objAt(o) } : {}) });
    }
    return out;
  };

  const base = (o: Obj<{ metadata: ObjectMeta }>, key: string, kind: DeclaredKind, podLabels: Labels = {}) => {
    const meta = o.value.metadata;
    const annotations = meta.annotations ?? {};
    const tierRaw = annotations[`${PINCHPOINT_ANNOTATION}tier`];
    const kindRaw = annotations[`${PINCHPOINT_ANNOTATION}kind`];
    let tier: Tier = 3;
    if (tierRaw !== undefined) {
      if (/^[1-4]$/.test(tierRaw)) tier = Number(tierRaw) as Tier;
      else warnings.push(at([...o.path, "metadata", "annotations", `${PINCHPOINT_ANNOTATION}tier`], `${PINCHPOINT_ANNOTATION}tier must be 1, 2, 3 or 4; the default 3 was used`));
    }
    let declaredKind = kind;
    if (kindRaw !== undefined) {
      if ((COMPONENT_KINDS as readonly string[]).includes(kindRaw)) declaredKind = kindRaw as DeclaredKind;
      else warnings.push(at([...o.path, "metadata", "annotations", `${PINCHPOINT_ANNOTATION}kind`], `${PINCHPOINT_ANNOTATION}kind must be one of ${COMPONENT_KINDS.join(", ")}; ${kind} was used`));
    }
    return {
      key,
      name: `${o.namespace}/${o.name}`,
      kind: declaredKind,
      team: owners.teamOf(o.namespace, meta, podLabels, o.path),
      tier,
      links: {},
      aliases: [] as string[],
      ...componentAt(o),
    };
  };

  // Workloads.
  const aliasCandidates = new Map<string, string[]>();
  for (const w of read.workloads) {
    const key = workloadKey(w);
    if (key === undefined) continue;
    const o = w.obj;
    const replicas = hpaMin.get(`${o.namespace}/${w.kind}/${o.name}`) ?? w.replicas;
    const { zones, tags: zoneTags } = zonesOf(w.spec, replicas, nodeZones);
    const pdbs = read.pdbs.filter((p) => p.namespace === o.namespace && labelSelectorMatches(p.value.spec?.selector, w.podLabels)).map((p) => `pdb:${p.name}`.slice(0, 64));
    const needs = mergeNeeds([
      ...podNeeds(w.spec, {
        namespace: o.namespace,
        selfKey: key,
        domain,
        services,
        configMaps: read.configMaps,
        secretKeys: read.secretKeys,
        targetOf,
        positionOf: m.positionOf,
        keyPosition: m.keyPosition,
        warn: (message, position) => warnings.push({ path: formatPath(o.path), ...position, message: `${o.namespace}/${o.name}: ${message}` }),
      }),
      ...annotatedNeeds(o, key),
    ]);
    components.push({
      ...base(o, key, w.kind === "Job" || w.kind === "CronJob" ? "job" : "service", w.podLabels),
      replicas,
      zones,
      tags: [...new Set([w.kind.toLowerCase(), ...w.tags, ...zoneTags, ...pdbs])],
      needs,
    });
    const names: string[] = [];
    for (const [id, list] of selected) if (list.length === 1 && list[0] === w) names.push(id.split("/")[1]!);
    for (const label of ["app.kubernetes.io/name", "app"]) {
      const v = w.podLabels[label] ?? o.value.metadata.labels?.[label];
      if (v !== undefined) names.push(v.toLowerCase());
    }
    aliasCandidates.set(key, names);
  }

  // External and unmatched Services: the external ones are components; unmatched ones only have a key.
  for (const info of serviceInfo.values()) {
    if (info.role !== "external") continue;
    const s = info.obj;
    const key = keyOf("Service", s.namespace, s.name);
    if (key === undefined) continue;
    const spec = s.value.spec ?? {};
    components.push({ ...base(s, key, "external"), replicas: 1, zones: [], tags: [spec.type === "ExternalName" ? "externalname" : "selectorless-service"], needs: annotatedNeeds(s, key) });
    const names = [s.name];
    if (spec.externalName) names.push(spec.externalName.toLowerCase().replace(/\.$/, ""));
    aliasCandidates.set(key, names);
  }

  // Entries: Ingresses, Gateways and the routes that attach to no Gateway of the push.
  const backendNeed = (entry: Obj<unknown>, entryKey: string, ns: string, service: string, node: object, label: string): Need | null => {
    const keys = (targetOf({ namespace: ns, name: service }) ?? []).filter((k) => k !== entryKey);
    if (!serviceInfo.has(`${ns}/${service}`)) {
      warnings.push({ path: formatPath(entry.path), ...m.positionOf(node), message: `${entry.kind} ${entry.namespace}/${entry.name} ${label} Service ${ns}/${service}, which is not in this push: no need was recorded` });
      return null;
    }
    if (keys.length === 0) return null;
    return { ...(keys.length === 1 ? { type: "single" as const, key: keys[0]! } : { type: "any_of" as const, keys: keys.sort() }), strength: "hard", via: null, ...(positionsWanted ? { at: m.positionOf(node) } : {}) };
  };
  for (const i of read.ingresses) {
    const key = keyOf("Ingress", i.namespace, i.name);
    if (key === undefined) continue;
    const needs: Need[] = [];
    const spec = i.value.spec ?? {};
    for (const b of [spec.defaultBackend, spec.backend]) {
      const name = b?.service?.name ?? b?.serviceName;
      if (b && name) needs.push(...nonNull(backendNeed(i, key, i.namespace, name, b, "has its default backend on")));
    }
    for (const rule of spec.rules ?? []) {
      for (const p of rule.http?.paths ?? []) {
        const name = p.backend.service?.name ?? p.backend.serviceName;
        if (name) needs.push(...nonNull(backendNeed(i, key, i.namespace, name, p.backend, `routes ${rule.host ?? "*"}${p.path ?? ""} to`)));
      }
    }
    components.push({ ...base(i, key, "gateway"), replicas: 1, zones: [], tags: ["ingress"], needs: mergeNeeds([...needs, ...annotatedNeeds(i, key)]) });
  }
  const routeNeeds = (r: Obj<Route>, entryKey: string): Need[] => {
    const out: Need[] = [];
    for (const rule of r.value.spec.rules ?? []) {
      for (const b of rule.backendRefs ?? []) {
        if ((b.group ?? "") !== "" || (b.kind ?? "Service") !== "Service" || b.weight === 0) continue;
        out.push(...nonNull(backendNeed(r, entryKey, b.namespace ?? r.namespace, b.name, b, "sends traffic to")));
      }
    }
    return out;
  };
  for (const g of read.gateways) {
    const key = keyOf("Gateway", g.namespace, g.name);
    if (key === undefined) continue;
    const needs: Need[] = [];
    for (const [r, parents] of routeParents) if (parents.includes(`${g.namespace}/${g.name}`)) needs.push(...routeNeeds(r, key));
    components.push({ ...base(g, key, "gateway"), replicas: 1, zones: [], tags: ["gateway-api"], needs: mergeNeeds([...needs, ...annotatedNeeds(g, key)]) });
  }
  for (const [r, parents] of routeParents) {
    if (parents.length > 0) continue;
    const key = keyOf(r.kind, r.namespace, r.name);
    if (key === undefined) continue;
    components.push({ ...base(r, key, "gateway"), replicas: 1, zones: [], tags: [r.kind.toLowerCase()], needs: mergeNeeds([...routeNeeds(r, key), ...annotatedNeeds(r, key)]) });
  }

  if (settings.aliases) assignAliases(components, aliasCandidates);
  const needCount = components.reduce((n, c) => n + c.needs.length, 0);
  if (components.length > 1 && needCount === 0) {
    warnings.push({
      path: "",
      message: `no workload names another one's Service in its env, envFrom, command or args, and no Ingress or route sends traffic to one: the ${components.length} components have no needs. Names built into images cannot be seen; declare them with the ${PINCHPOINT_ANNOTATION}needs annotation`,
    });
  }
  if (issues.length > 0 || origin.source === null) return { ok: false, status: 422, issues: finishIssues(issues) };
  return { ok: true, inventory: { source: origin.source, environment: origin.environment, components, observedEdges: [], warnings: finishIssues(warnings) } };
}

const nonNull = <T,>(v: T | null): T[] => (v === null ? [] : [v]);

/** One need per target (single key or any_of set): the stronger claim wins and keeps its via and reason. */
function mergeNeeds(needs: Need[]): Need[] {
  const out = new Map<string, Need>();
  const rank = { hard: 2, soft: 1, startup: 0 } as const;
  for (const n of needs) {
    const id = n.type === "single" ? n.key : [...n.keys].sort().join(",");
    const prior = out.get(id);
    if (!prior) out.set(id, n);
    else if (rank[n.strength] > rank[prior.strength]) {
      // A declared need keeps its provenance alongside the inferred one it confirms.
      const provenance = [...new Set([...(prior.provenance ?? ["declared"]), ...(n.provenance ?? ["declared"])])].sort() as Need["provenance"];
      out.set(id, { ...n, provenance });
    } else if (JSON.stringify(prior.provenance ?? ["declared"]) !== JSON.stringify(n.provenance ?? ["declared"])) {
      out.set(id, { ...prior, provenance: [...new Set([...(prior.provenance ?? ["declared"]), ...(n.provenance ?? ["declared"])])].sort() as Need["provenance"] });
    }
  }
  return [...out.values()];
}

/** Zones a workload runs in and the tags that say how they were found (see the header). */
function zonesOf(spec: PodSpec, replicas: number, nodeZones: readonly string[]): { zones: string[]; tags: string[] } {
  let pinned: string[] | null = null;
  for (const k of ZONE_KEYS) {
    const v = spec.nodeSelector?.[k];
    if (v !== undefined) pinned = [v];
  }
  const terms = spec.affinity?.nodeAffinity?.requiredDuringSchedulingIgnoredDuringExecution?.nodeSelectorTerms ?? [];
  if (pinned === null && terms.length > 0) {
    // Terms are ORed: the Pods are pinned only when every term names its zones.
    const perTerm = terms.map((t) => (t.matchExpressions ?? []).filter((e) => ZONE_KEYS.includes(e.key) && e.operator === "In").flatMap((e) => e.values ?? []));
    if (perTerm.every((z) => z.length > 0)) pinned = [...new Set(perTerm.flat())];
  }
  const spread =
    (spec.topologySpreadConstraints ?? []).some((c) => ZONE_KEYS.includes(c.topologyKey)) ||
    (spec.affinity?.podAntiAffinity?.requiredDuringSchedulingIgnoredDuringExecution ?? []).some((t) => ZONE_KEYS.includes(t.topologyKey ?? ""));
  if (pinned !== null) return { zones: pinned.sort(), tags: [...(pinned.length === 1 ? ["single-zone"] : []), ...(spread ? ["zone-spread"] : [])] };
  if (spread) return { zones: replicas >= 2 ? [...nodeZones] : [], tags: ["zone-spread"] };
  return { zones: [], tags: [] };
}

/** Aliases no other name of the push claims: not a key, not offered by two components. */
function assignAliases(components: InventoryComponent[], candidates: ReadonlyMap<string, string[]>): void {
  const keys = new Set(components.map((c) => c.key));
  const claimedBy = new Map<string, Set<string>>();
  for (const [key, names] of candidates) {
    for (const n of names) {
      if (n === key || !KEY_PATTERN.test(n)) continue;
      const set = claimedBy.get(n) ?? new Set<string>();
      set.add(key);
      claimedBy.set(n, set);
    }
  }
  for (const c of components) {
    const mine = (candidates.get(c.key) ?? []).filter((n) => n !== c.key && !keys.has(n) && claimedBy.get(n)?.size === 1);
    c.aliases = [...new Set(mine)].sort();
  }
}

interface Classified {
  workloads: Workload[];
  services: Obj<Service>[];
  ingresses: Obj<Ingress>[];
  gateways: Obj<{ metadata: ObjectMeta }>[];
  routes: Obj<Route>[];
  hpas: Obj<Hpa>[];
  pdbs: Obj<Pdb>[];
  configMaps: Map<string, ConfigMapEntry>;
  secretKeys: Map<string, readonly string[]>;
  namespaces: Map<string, ObjectMeta>;
  nodeZones: string[];
  byId: Map<string, Obj<unknown>>;
  unknown: Map<string, number>;
  owned: Map<string, number>;
}

const HEAD = { apiVersion: "an apiVersion", kind: "a kind" } as const;

/** Sorts the objects by what they are, validating each against its schema (issues located). */
function classify(m: LoadedManifests, issues: InventoryIssue[]): Classified {
  const out: Classified = {
    workloads: [],
    services: [],
    ingresses: [],
    gateways: [],
    routes: [],
    hpas: [],
    pdbs: [],
    configMaps: new Map(),
    secretKeys: new Map(),
    namespaces: new Map(),
    nodeZones: [],
    byId: new Map(),
    unknown: new Map(),
    owned: new Map(),
  };
  const count = (map: Map<string, number>, k: string) => map.set(k, (map.get(k) ?? 0) + 1);
  for (const { value, path } of m.objects as ManifestObject[]) {
    if (Object.hasOwn(value, "__notAnObject")) {
      issues.push({ path: formatPath(path), ...m.source.locate(path), message: "each document must be a Kubernetes object (a mapping with apiVersion, kind and metadata)" });
      continue;
    }
    const missing = (["apiVersion", "kind"] as const).filter((f) => typeof value[f] !== "string");
    if (missing.length > 0) {
      for (const f of missing) issues.push({ path: formatPath([...path, f]), ...m.source.locate([...path, f]), message: `a Kubernetes object needs ${HEAD[f]} (a string)` });
      continue;
    }
    const apiVersion = value.apiVersion as string;
    const kind = value.kind as string;
    const group = apiVersion.includes("/") ? apiVersion.slice(0, apiVersion.indexOf("/")) : "";
    const spec = (KINDS as Record<string, { groups: readonly string[]; schema: (typeof KINDS)[ReadKind]["schema"] } | undefined>)[kind];
    if (!spec || !spec.groups.includes(group)) {
      count(out.unknown, group ? `${kind} (${group})` : kind);
      continue;
    }
    const parsed = spec.schema.safeParse(value);
    if (!parsed.success) {
      issues.push(...mapZodIssues(parsed.error.issues, m.source, {}, path));
      continue;
    }
    // zod returns copies; positions belong to the parsed originals, which the schema has just vouched for.
    const meta = value.metadata as ObjectMeta;
    const namespace = meta.namespace ?? "default";
    const o: Obj<never> = { value: value as never, path, namespace, name: meta.name, kind: kind as ReadKind };
    out.byId.set(`${kind}/${namespace}/${meta.name}`, o);
    if ((kind === "ReplicaSet" || kind === "Pod" || kind === "Job") && (meta.ownerReferences ?? []).length > 0) {
      count(out.owned, kind);
      continue;
    }
    if ((WORKLOAD_KINDS as readonly string[]).includes(kind)) {
      out.workloads.push(workloadOf(o, kind as WorkloadKind));
      continue;
    }
    switch (kind as ReadKind) {
      case "Service":
        out.services.push(o);
        break;
      case "Ingress":
        out.ingresses.push(o);
        break;
      case "Gateway":
        out.gateways.push(o);
        break;
      case "HTTPRoute":
      case "GRPCRoute":
        out.routes.push(o);
        break;
      case "HorizontalPodAutoscaler":
        out.hpas.push(o);
        break;
      case "PodDisruptionBudget":
        out.pdbs.push(o);
        break;
      case "ConfigMap": {
        const data = (value as ConfigMap).data ?? {};
        out.configMaps.set(`${namespace}/${meta.name}`, { data, node: isRecord((value as ConfigMap).data) ? (value as { data: object }).data : null });
        break;
      }
      case "Secret":
        out.secretKeys.set(`${namespace}/${meta.name}`, m.secretKeys.get(value) ?? []);
        break;
      case "Namespace":
        out.namespaces.set(meta.name, meta);
        break;
      case "Node":
        for (const k of ZONE_KEYS) {
          const zone = meta.labels?.[k];
          if (zone !== undefined) {
            out.nodeZones.push(zone);
            break;
          }
        }
        break;
      default:
        // NetworkPolicy: read, never a need (see the header).
        break;
    }
  }
  return out;
}

function workloadOf(o: Obj<never>, kind: WorkloadKind): Workload {
  const tags: string[] = [];
  const scaled = (n: number | null | undefined) => {
    if (n === 0) tags.push("scaled-to-zero");
    return n === null || n === undefined || n < 1 ? 1 : n;
  };
  switch (kind) {
    case "Deployment":
    case "StatefulSet":
    case "ReplicaSet": {
      const d = o.value as Deployment;
      return { obj: o, kind, podLabels: d.spec.template.metadata?.labels ?? {}, spec: d.spec.template.spec, replicas: scaled(d.spec.replicas), tags };
    }
    case "DaemonSet": {
      const d = o.value as DaemonSet;
      return { obj: o, kind, podLabels: d.spec.template.metadata?.labels ?? {}, spec: d.spec.template.spec, replicas: scaled(d.status?.desiredNumberScheduled), tags };
    }
    case "Job": {
      const j = o.value as Job;
      return { obj: o, kind, podLabels: j.spec.template.metadata?.labels ?? {}, spec: j.spec.template.spec, replicas: scaled(j.spec.parallelism), tags };
    }
    case "CronJob": {
      const c = o.value as CronJob;
      const t = c.spec.jobTemplate.spec;
      return { obj: o, kind, podLabels: t.template.metadata?.labels ?? {}, spec: t.template.spec, replicas: scaled(t.parallelism), tags };
    }
    case "Pod": {
      const p = o.value as Pod;
      return { obj: o, kind, podLabels: p.metadata.labels ?? {}, spec: p.spec, replicas: 1, tags };
    }
  }
}
