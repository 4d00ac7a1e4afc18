// Needs a Pod template names in its configuration, marked `inferred` (DESIGN §10): a host name that
// is a Service of the push (dns.ts) in
//   - a container's `env` values, `$(VAR)` references expanded as kubelet does (earlier entries of
//     the same container, "Define Dependent Environment Variables"), and values taken from a
//     ConfigMap key (`valueFrom.configMapKeyRef`);
//   - every value of a ConfigMap loaded with `envFrom.configMapRef` (via = prefix + key, position =
//     the ConfigMap's key, where the value is written);
//   - the keys — never the values — of a Secret loaded with `envFrom.secretRef`: a key that is
//     itself a Service's name (per-host credentials are keyed so); `secretKeyRef` gives nothing;
//   - `command` and `args` (shell scripts included; `$(cat …/serviceaccount/namespace)` is the
//     Pod's namespace);
//   - kubelet's `<SVC>_SERVICE_HOST` variables referred to anywhere above.
// Strength: hard for containers, and for init containers with `restartPolicy: Always` (sidecars run
// for the Pod's whole life); `startup` for other init containers, which run to completion before
// the app starts — typically a loop waiting for a Service to answer ("Init Containers").
// A Service whose selector matches several workloads is an `any_of` need over them (it answers
// while any one of them has ready Pods). A Pod naming its own Service (a peer list) is no need.
import { strongerStrength, type Need, type Strength } from "@/lib/inventory/types";
import { hostCandidates } from "../shared/hosts";
import type { Position } from "../shared/structured";
import { clusterNameOf, resolveServiceHost, serviceEnvReferences, type ServiceLookup, type ServiceRef } from "./dns";
import type { Container, PodSpec } from "./schema";

export interface ConfigMapEntry {
  data: Readonly<Record<string, string>>;
  /** The `data` mapping, for key positions. */
  node: object | null;
}

export interface NeedContext {
  namespace: string;
  selfKey: string;
  domain: string;
  services: ServiceLookup;
  configMaps: ReadonlyMap<string, ConfigMapEntry>;
  secretKeys: ReadonlyMap<string, readonly string[]>;
  /** Component keys that answer for a Service, or null when the push cannot tell. */
  targetOf(ref: ServiceRef): string[] | null;
  positionOf(node: object): Position;
  keyPosition(node: object, key: string): Position;
  /** A warning about a cluster name that no Service of the push has; each once per workload. */
  warn(message: string, at: Position): void;
}

interface Found {
  need: Need;
  order: number;
}

const SERVICEACCOUNT_NAMESPACE = /\$\(\s*cat\s+\/var\/run\/secrets\/kubernetes\.io\/serviceaccount\/namespace\s*\)/g;

/** kubelet's `$(VAR)` expansion against the variables known so far; unknown references stay as written. */
function expand(value: string, vars: ReadonlyMap<string, string | undefined>): string {
  return value.replace(/\$\(([A-Za-z_][A-Za-z0-9_.-]*)\)/g, (m, name: string) => vars.get(name) ?? m);
}

export function podNeeds(spec: PodSpec, ctx: NeedContext): Need[] {
  const found = new Map<string, Found>();
  const warned = new Set<string>();
  let order = 0;

  const add = (ref: ServiceRef, strength: Strength, via: string, reason: string, at: Position): void => {
    const keys = (ctx.targetOf(ref) ?? []).filter((k) => k !== ctx.selfKey);
    if (keys.length === 0) return;
    const id = [...keys].sort().join(",");
    const what = keys.length > 1 ? `; its selector matches ${keys.length} workloads, any one of which answers` : "";
    const need: Need = {
      ...(keys.length === 1 ? { type: "single" as const, key: keys[0]! } : { type: "any_of" as const, keys: [...keys].sort() }),
      strength,
      via,
      provenance: ["inferred"],
      at,
      reason: `${reason} names Service ${ref.namespace}/${ref.name}${what}${strength === "startup" ? " (an init container: needed to start only)" : ""}`,
    };
    const prior = found.get(id);
    if (!prior) found.set(id, { need, order: order++ });
    else if (strongerStrength(prior.need.strength, strength) !== prior.need.strength) found.set(id, { need, order: prior.order });
  };

  const scan = (value: string, strength: Strength, via: string, reason: string, at: Position): void => {
    const text = value.replace(SERVICEACCOUNT_NAMESPACE, ctx.namespace);
    for (const host of hostCandidates(text)) {
      const ref = resolveServiceHost(host, ctx.namespace, ctx.domain, ctx.services);
      if (ref) add(ref, strength, via, reason, at);
      else {
        const named = clusterNameOf(host, ctx.domain);
        const id = named ? `${named.namespace}/${named.name}` : "";
        if (named && !warned.has(id)) {
          warned.add(id);
          ctx.warn(`${reason} names ${host}, Service ${id}, which is not in this push: no need was recorded (push that namespace in the same source, or declare the need)`, at);
        }
      }
    }
    for (const name of serviceEnvReferences(text)) {
      if (ctx.services.get(ctx.namespace, name)) add({ namespace: ctx.namespace, name }, strength, via, `${reason} (its ${name.toUpperCase().replace(/-/g, "_")}_SERVICE_HOST variable)`, at);
    }
  };

  const readContainer = (c: Container, strength: Strength, label: string): void => {
    const vars = new Map<string, string | undefined>();
    // envFrom first: an `env` entry with the same name wins over it (core/v1 Container.envFrom).
    for (const from of c.envFrom ?? []) {
      const prefix = from.prefix ?? "";
      const cmName = from.configMapRef?.name;
      const secretName = from.secretRef?.name;
      if (cmName) {
        const cm = ctx.configMaps.get(`${ctx.namespace}/${cmName}`);
        for (const [k, v] of Object.entries(cm?.data ?? {})) {
          vars.set(prefix + k, v);
          scan(v, strength, prefix + k, `${label}envFrom ConfigMap ${ctx.namespace}/${cmName} key ${k}`, cm?.node ? ctx.keyPosition(cm.node, k) : ctx.positionOf(from));
        }
      }
      if (secretName) {
        for (const k of ctx.secretKeys.get(`${ctx.namespace}/${secretName}`) ?? []) {
          vars.set(prefix + k, undefined);
          scan(k, strength, prefix + k, `${label}envFrom Secret ${ctx.namespace}/${secretName}: the key name ${k} (values are never read)`, ctx.positionOf(from));
        }
      }
    }
    for (const e of c.env ?? []) {
      const at = ctx.positionOf(e);
      if (typeof e.value === "string") {
        const v = expand(e.value, vars);
        vars.set(e.name, v);
        scan(v, strength, e.name, `${label}env ${e.name}`, at);
      } else if (e.valueFrom?.configMapKeyRef) {
        const ref = e.valueFrom.configMapKeyRef;
        const v = ref.name ? ctx.configMaps.get(`${ctx.namespace}/${ref.name}`)?.data[ref.key] : undefined;
        vars.set(e.name, v);
        if (v !== undefined) scan(v, strength, e.name, `${label}env ${e.name} (ConfigMap ${ctx.namespace}/${ref.name ?? ""} key ${ref.key})`, at);
      } else {
        vars.set(e.name, undefined);
      }
    }
    for (const field of ["command", "args"] as const) {
      const list = c[field];
      if (!list) continue;
      list.forEach((item, i) => scan(expand(item, vars), strength, field, `${label}${field}[${i}]`, ctx.positionOf(list)));
    }
  };

  for (const c of spec.initContainers ?? []) {
    const sidecar = c.restartPolicy === "Always";
    readContainer(c, sidecar ? "hard" : "startup", `${sidecar ? "sidecar" : "init container"} ${c.name ?? "?"}: `);
  }
  const several = (spec.containers ?? []).length > 1;
  for (const c of spec.containers ?? []) readContainer(c, "hard", several ? `container ${c.name ?? "?"}: ` : "");
  return [...found.values()].sort((a, b) => a.order - b.order).map((f) => f.need);
}
