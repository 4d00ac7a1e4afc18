// The merged Compose model → components and needs. What each construct means (Compose
// Specification, services.*):
//   depends_on                                  hard need: the dependent is created after it and
//                                               expects it to be there ("service_started", "service_healthy")
//   depends_on … service_completed_successfully start-up only: it must finish before the dependent
//                                               starts, and a running dependent does not miss it
//   depends_on … required: false                soft: Compose only warns when it is missing
//   links, network_mode: service:x, volumes_from: [x]   hard: the dependent calls it by name, or
//                                               shares its network namespace or its volumes
//   a host name of another service in environment, env_file content, command or entrypoint
//                                               inferred need (hard; soft on telemetry), `via` the
//                                               variable, `at` where the value is written
// Needs on a telemetry component are soft unless `x-pinchpoint.needs` says otherwise: losing a
// collector degrades observability, not the service. A service other services wait to complete is a
// job. Services only in inactive profiles are left out (services.profiles; "Profiles").
import type { Tier, FilePosition, ImportNote, InventoryComponent, InventoryIssue, Need, Provenance, Strength } from "@/lib/inventory/types";
import { KEY_PATTERN, strongerStrength } from "@/lib/inventory/types";
import { hostCandidates } from "../shared/hosts";
import { formatPath, type PathSegment } from "../shared/text";
import { kindFromImage } from "./kinds";
import { isPlainObject, type Where } from "./merge";
import type { Project } from "./project";
import type { ProjectExtension, ServiceExtension } from "./schema";

export interface GraphResult {
  components: InventoryComponent[];
  issues: InventoryIssue[];
  warnings: InventoryIssue[];
  notes: ImportNote[];
  /** Needs declared or inferred before profiles and overrides; 0 means the files say nothing about dependencies. */
  needCount: number;
  projectExtension: ProjectExtension | null;
}

interface Draft {
  strength: Strength;
  provenance: Set<Provenance>;
  via: string | null;
  at?: FilePosition;
  /** Set by x-pinchpoint.needs: wins over every default. */
  fixed: boolean;
  /** Why it was inferred (the variable or field and the name it holds), for the dry-run preview. */
  reason?: string;
}

const keyOf = (name: string): string => name.toLowerCase();

export function buildGraph(project: Project, opts: { profiles: string[]; positions: boolean }): GraphResult {
  const { model, origins } = project;
  const issues: InventoryIssue[] = [];
  const warnings: InventoryIssue[] = [];
  const notes: ImportNote[] = [];
  const services = isPlainObject(model.services) ? model.services : {};
  const where = (container: object, key: string | number): Where | undefined => origins.get(container, key);
  const pos = (w: Where | undefined) => project.position(w);
  const located = (w: Where | undefined, path: PathSegment[], message: string, key = false): InventoryIssue => ({
    path: formatPath(path),
    ...(project.position(w, { key }) ?? {}),
    message,
  });
  const projectExt = (isPlainObject(model["x-pinchpoint"]) ? model["x-pinchpoint"] : null) as ProjectExtension | null;

  // Profiles: `?profiles=` and COMPOSE_PROFILES from the pushed .env are the active ones.
  const active = new Set(opts.profiles);
  for (const p of (project.vars.get("COMPOSE_PROFILES") ?? "").split(",")) if (p.trim() !== "") active.add(p.trim());
  const leftOut = new Map<string, string[]>();
  for (const [name, svc] of Object.entries(services)) {
    const profiles = isPlainObject(svc) && Array.isArray(svc.profiles) ? svc.profiles.filter((p): p is string => typeof p === "string") : [];
    if (profiles.length > 0 && !profiles.some((p) => active.has(p))) leftOut.set(name, profiles);
  }

  // Keys, clashes after lower-casing, and every name a service answers to on the network.
  const keys = new Map<string, string>();
  const firstName = new Map<string, string>();
  const hostNames = new Map<string, string>();
  for (const [name] of Object.entries(services)) {
    const w = where(services, name);
    const key = keyOf(name);
    if (!KEY_PATTERN.test(key)) {
      issues.push(located(w, ["services", name], `${JSON.stringify(name)} cannot be a component key: lower-cased it must be 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`, true));
      continue;
    }
    const earlier = firstName.get(key);
    if (earlier !== undefined) {
      const message = `services ${JSON.stringify(earlier)} and ${JSON.stringify(name)} both become key ${JSON.stringify(key)}`;
      issues.push(located(w, ["services", name], message, true));
      issues.push(located(where(services, earlier), ["services", earlier], message, true));
      keys.delete(earlier);
      continue;
    }
    firstName.set(key, name);
    if (leftOut.has(name)) continue;
    keys.set(name, key);
    hostNames.set(key, key);
  }
  for (const [name, key] of keys) {
    const svc = services[name];
    if (!isPlainObject(svc)) continue;
    const extra: unknown[] = [svc.hostname, svc.container_name];
    if (isPlainObject(svc.networks)) {
      for (const n of Object.values(svc.networks)) if (isPlainObject(n) && Array.isArray(n.aliases)) extra.push(...n.aliases);
    }
    const ext = extensionOf(svc);
    if (ext?.aliases) extra.push(...ext.aliases);
    for (const h of extra) if (typeof h === "string" && h !== "" && !hostNames.has(h.toLowerCase())) hostNames.set(h.toLowerCase(), key);
  }

  // Kinds first: needs on telemetry are soft by default.
  const kinds = new Map<string, { kind: InventoryComponent["kind"]; fixed: boolean }>();
  const completionTargets = new Map<string, Where | undefined>();
  for (const [name] of keys) {
    const svc = services[name];
    if (!isPlainObject(svc) || !isPlainObject(svc.depends_on)) continue;
    for (const [t, spec] of Object.entries(svc.depends_on)) {
      if (isPlainObject(spec) && spec.condition === "service_completed_successfully" && !completionTargets.has(keyOf(t))) completionTargets.set(keyOf(t), where(svc.depends_on, t));
    }
  }
  for (const [name, key] of keys) {
    const svc = services[name] as Record<string, unknown>;
    const ext = extensionOf(svc);
    if (ext?.kind) {
      kinds.set(key, { kind: ext.kind, fixed: true });
      continue;
    }
    const image = typeof svc.image === "string" ? svc.image : null;
    if (completionTargets.has(key)) {
      kinds.set(key, { kind: "job", fixed: false });
      notes.push({ kind: "kind-from-completion", component: key, reason: "other services wait for it to finish (depends_on condition service_completed_successfully): a one-shot job", at: pos(completionTargets.get(key)) });
      continue;
    }
    const guess = image ? kindFromImage(image) : null;
    if (guess && guess.kind !== "service") {
      kinds.set(key, { kind: guess.kind, fixed: false });
      notes.push({ kind: "kind-from-image", component: key, reason: `image ${image} looks like ${guess.why} (${guess.kind}); set x-pinchpoint.kind to change it`, at: pos(where(svc, "image")) });
    } else {
      kinds.set(key, { kind: "service", fixed: false });
    }
  }

  let needCount = 0;
  // Collected across services so that each missing file is reported once.
  const missingEnvFiles = new Set<string>();
  const droppedForProfiles: string[] = [];
  const components: InventoryComponent[] = [];
  for (const [name, key] of keys) {
    const svc = services[name] as Record<string, unknown>;
    const path: PathSegment[] = ["services", name];
    const ext = extensionOf(svc);
    const needs = new Map<string, Draft>();
    const add = (targetName: string, strength: Strength, provenance: Provenance, via: string | null, w: Where | undefined, p: PathSegment[], isHost = false, reason?: string): void => {
      const to = isHost ? targetName : keyOf(targetName);
      if (!isHost && !KEY_PATTERN.test(to)) {
        issues.push(located(w, p, `${JSON.stringify(targetName)} cannot be a component key: lower-cased it must be 1-128 characters of a-z, 0-9, ".", "_" or "-", starting with a letter or digit`));
        return;
      }
      if (to === key) {
        if (!isHost) issues.push(located(w, p, `service ${JSON.stringify(name)} depends on itself`));
        return;
      }
      needCount++;
      const leftOutName = [...leftOut.keys()].find((n) => keyOf(n) === to);
      if (leftOutName !== undefined) {
        droppedForProfiles.push(`${key} → ${to}`);
        return;
      }
      if (!isHost && !firstName.has(to)) warnings.push(located(w, p, `${JSON.stringify(targetName)} is not a service in this project; kept as a need`));
      const prior = needs.get(to);
      const at = provenance === "inferred" || opts.positions ? pos(w) : undefined;
      if (!prior) {
        needs.set(to, { strength, provenance: new Set([provenance]), via, ...(at ? { at } : {}), fixed: false, ...(reason ? { reason } : {}) });
        return;
      }
      if (reason && !prior.reason) prior.reason = `${reason} (declared too)`;
      // A host name in configuration confirms a declared need; it does not overrule its strength
      // (`required: false` stays soft, a start-up need stays start-up).
      if (provenance === "declared") prior.strength = strongerStrength(prior.strength, strength);
      prior.provenance.add(provenance);
      if (prior.via === null && via !== null) prior.via = via;
      if (!prior.at && at) prior.at = at;
    };

    const dependsOn = svc.depends_on;
    if (isPlainObject(dependsOn)) {
      for (const [t, spec] of Object.entries(dependsOn)) {
        const s = isPlainObject(spec) ? spec : {};
        const w = where(dependsOn, t);
        const p = [...path, "depends_on", w?.path[w.path.length - 1] ?? t];
        if (s.condition === "service_completed_successfully") {
          add(t, "startup", "declared", null, w, p);
          notes.push({ kind: "startup-need", component: key, target: keyOf(t), reason: "depends_on with condition service_completed_successfully: needed to start, not to keep running", at: pos(w) });
        } else add(t, s.required === false ? "soft" : "hard", "declared", null, w, p);
      }
    }
    if (Array.isArray(svc.links)) {
      svc.links.forEach((l, i) => {
        if (typeof l === "string") add(l.split(":")[0] ?? "", "hard", "declared", null, where(svc.links as object, i), [...path, "links", i]);
      });
    }
    if (typeof svc.network_mode === "string" && svc.network_mode.startsWith("service:")) {
      add(svc.network_mode.slice("service:".length), "hard", "declared", null, where(svc, "network_mode"), [...path, "network_mode"]);
    }
    if (Array.isArray(svc.volumes_from)) {
      svc.volumes_from.forEach((v, i) => {
        // `container:name` names a container outside the project, not a service.
        if (typeof v === "string" && !v.startsWith("container:")) add(v.split(":")[0] ?? "", "hard", "declared", null, where(svc.volumes_from as object, i), [...path, "volumes_from", i]);
      });
    }

    // Host names in configuration. env_file first, then environment, which wins for the same variable.
    const env = new Map<string, { value: string | null; w?: Where; at?: FilePosition }>();
    if (Array.isArray(svc.env_file)) {
      svc.env_file.forEach((entry, i) => {
        const file = isPlainObject(entry) && typeof entry.path === "string" ? entry.path : null;
        if (file === null) return;
        const read = project.readEnvFile(file);
        if (!read) {
          if (!(isPlainObject(entry) && entry.required === false)) missingEnvFiles.add(JSON.stringify([file, pos(where(svc.env_file as object, i))]));
          return;
        }
        const fileName = project.findEnvFile(file)?.name ?? file;
        for (const e of read.entries) env.set(e.name, { value: e.value, at: { file: fileName, line: e.line, column: e.column } });
      });
    }
    if (isPlainObject(svc.environment)) {
      for (const [n, v] of Object.entries(svc.environment)) {
        env.set(n, { value: v === null || v === undefined ? null : String(v), w: where(svc.environment, n) });
      }
    }
    for (const [variable, { value, w, at }] of env) {
      if (value === null || value === "") continue;
      for (const host of hostCandidates(value)) {
        const target = hostNames.get(host);
        if (target === undefined || target === key) continue;
        const before = needs.get(target);
        const p = [...path, "environment", variable];
        const reason = `${variable}${at?.file ? ` in ${at.file}` : ""} names ${host === target ? `service ${target}` : `${host}, a name of service ${target}`}`;
        if (at) {
          needCount++;
          if (!before) needs.set(target, { strength: "hard", provenance: new Set(["inferred"]), via: variable, at, fixed: false, reason });
          else {
            before.provenance.add("inferred");
            before.via ??= variable;
            before.at ??= at;
            before.reason ??= `${reason} (declared too)`;
          }
        } else add(target, "hard", "inferred", variable, w, p, true, reason);
      }
    }
    for (const field of ["command", "entrypoint"] as const) {
      const v = svc[field];
      const text = typeof v === "string" ? v : Array.isArray(v) ? v.filter((x) => typeof x === "string").join(" ") : null;
      if (!text) continue;
      for (const host of hostCandidates(text)) {
        const target = hostNames.get(host);
        if (target === undefined || target === key) continue;
        add(target, "hard", "inferred", field, where(svc, field), [...path, field], true, `${field} names ${host === target ? `service ${target}` : `${host}, a name of service ${target}`}`);
      }
    }

    // Telemetry: soft unless declared otherwise below.
    for (const [to, d] of needs) {
      if (kinds.get(to)?.kind === "telemetry" && d.strength === "hard") {
        d.strength = "soft";
        notes.push({ kind: "soft-on-telemetry", component: key, target: to, reason: `${to} is telemetry: losing it degrades observability, not ${key}; set x-pinchpoint.needs.${to}: hard to change it`, ...(d.at ? { at: d.at } : {}) });
      }
    }
    // x-pinchpoint.needs: per-need strength (and a need the file does not otherwise show).
    const extWhere = where(svc, "x-pinchpoint");
    if (ext?.needs) {
      for (const [t, spec] of Object.entries(ext.needs)) {
        const strength = typeof spec === "string" ? spec : (spec.strength ?? "hard");
        const via = typeof spec === "string" ? null : (spec.via ?? null);
        const to = keyOf(t);
        const w = extWhere && isPlainObject(svc["x-pinchpoint"]) && isPlainObject((svc["x-pinchpoint"] as Record<string, unknown>).needs)
          ? where((svc["x-pinchpoint"] as { needs: object }).needs, t)
          : extWhere;
        if (to === key) {
          issues.push(located(w, [...path, "x-pinchpoint", "needs", t], `service ${JSON.stringify(name)} depends on itself`));
          continue;
        }
        if (!KEY_PATTERN.test(to)) {
          issues.push(located(w, [...path, "x-pinchpoint", "needs", t], `${JSON.stringify(t)} cannot be a component key`));
          continue;
        }
        const d = needs.get(to);
        if (d) {
          d.strength = strength;
          d.fixed = true;
          if (via !== null) d.via = via;
        } else {
          needCount++;
          needs.set(to, { strength, provenance: new Set(["declared"]), via, fixed: true, ...(opts.positions ? { at: pos(w) } : {}) });
        }
      }
    }
    const list: Need[] = [];
    const inGroup = new Set<string>();
    if (ext?.any_of) {
      ext.any_of.forEach((g, gi) => {
        const members = [...new Set((Array.isArray(g) ? g : g.members).map(keyOf))];
        const gw = extWhere ? { file: extWhere.file, path: [...extWhere.path, "any_of", gi] } : undefined;
        if (members.includes(key)) {
          issues.push(located(gw, [...path, "x-pinchpoint", "any_of", gi], `service ${JSON.stringify(name)} cannot be a member of its own any_of group`));
          return;
        }
        if (members.length < 2) {
          issues.push(located(gw, [...path, "x-pinchpoint", "any_of", gi], "an any_of group needs at least two distinct members"));
          return;
        }
        // Single needs on the members (a depends_on on each, say) are what the group replaces.
        const strength: Strength = Array.isArray(g) ? "hard" : (g.strength ?? "hard");
        const provenance = new Set<Provenance>(["declared"]);
        for (const m of members) {
          for (const pv of needs.get(m)?.provenance ?? []) provenance.add(pv);
          inGroup.add(m);
        }
        needCount++;
        list.push({ type: "any_of", keys: members, strength, via: Array.isArray(g) ? null : (g.via ?? null), ...provenanceField(provenance), ...(opts.positions && gw ? { at: pos(gw) } : {}) });
      });
    }
    for (const [to, d] of needs) {
      if (inGroup.has(to)) continue;
      list.push({ type: "single", key: to, strength: d.strength, via: d.via, ...provenanceField(d.provenance), ...(d.at ? { at: d.at } : {}), ...(d.reason && d.provenance.has("inferred") ? { reason: d.reason } : {}) });
    }

    // Aliases: x-pinchpoint.aliases and the name traces will carry (OTEL_SERVICE_NAME).
    const aliases = new Set<string>(ext?.aliases?.map(keyOf) ?? []);
    const otel = env.get("OTEL_SERVICE_NAME")?.value;
    if (otel) {
      const a = otel.toLowerCase();
      if (KEY_PATTERN.test(a)) aliases.add(a);
    }
    aliases.delete(key);
    for (const a of [...aliases]) {
      if (firstName.has(a)) {
        warnings.push(located(extWhere ?? where(services, name), path, `alias ${JSON.stringify(a)} of ${key} is the name of another service; left out`));
        aliases.delete(a);
      }
    }

    const deploy = isPlainObject(svc.deploy) ? svc.deploy : {};
    const count = (v: unknown): number | null => {
      const n = typeof v === "string" && /^\d+$/.test(v) ? Number(v) : v;
      return typeof n === "number" && Number.isInteger(n) && n >= 1 ? n : null;
    };
    const replicas = ext?.replicas ?? count(deploy.replicas) ?? count(svc.scale) ?? 1;
    const team = ext && "team" in ext ? (ext.team ?? null) : (projectExt?.team ?? null);
    components.push({
      key,
      name: ext?.name ?? name,
      kind: kinds.get(key)?.kind ?? "service",
      team,
      tier: (ext?.tier ?? 3) as Tier,
      replicas,
      zones: [...new Set(ext?.zones ?? [])],
      tags: [...new Set(ext?.tags ?? [])],
      links: {},
      aliases: [...aliases].sort(),
      needs: list,
      ...(opts.positions ? { at: pos(where(services, name)) } : {}),
    });
  }

  for (const m of missingEnvFiles) {
    const [file, at] = JSON.parse(m) as [string, FilePosition | undefined];
    warnings.push({ path: "env_file", ...(at ?? {}), message: `env_file ${JSON.stringify(file)} is not in this push: its variables were not read for host names (push it in the same request)` });
  }

  if (leftOut.size > 0) {
    const byProfile = [...new Set([...leftOut.values()].flat())].sort();
    const names = [...leftOut].map(([n, p]) => `${keyOf(n)} (${p.join(", ")})`).join(", ");
    const first = [...leftOut.keys()][0] as string;
    const dropped = droppedForProfiles.length > 0 ? `; needs on them were dropped: ${droppedForProfiles.join(", ")}` : "";
    warnings.push(
      located(
        where(services, first),
        ["services", first],
        `${leftOut.size} service${leftOut.size === 1 ? " is" : "s are"} only in profiles that are not active and ${leftOut.size === 1 ? "was" : "were"} left out: ${names}${dropped}. Push with ?profiles=${byProfile.join(",")} to include ${leftOut.size === 1 ? "it" : "them"}`,
        true,
      ),
    );
    for (const [n, p] of leftOut) {
      notes.push({
        kind: "left-out",
        component: keyOf(n),
        reason: `only in profile${p.length === 1 ? "" : "s"} ${p.join(", ")}, which ${p.length === 1 ? "is" : "are"} not active; push with ?profiles=${p.join(",")} to include it`,
        at: project.position(where(services, n), { key: true }),
      });
    }
  }
  return { components, issues, warnings, notes, needCount, projectExtension: projectExt };
}

function extensionOf(svc: Record<string, unknown>): ServiceExtension | null {
  const x = svc["x-pinchpoint"];
  return isPlainObject(x) ? (x as ServiceExtension) : null;
}

function provenanceField(p: Set<Provenance>): { provenance?: Provenance[] } {
  if (p.size === 1 && p.has("declared")) return {};
  return { provenance: [...p].sort() };
}
