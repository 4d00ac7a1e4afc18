// Component keys for Kubernetes objects. Keys must fit ^[a-z0-9][a-z0-9._-]{0,127}$, so the
// `<namespace>/<name>` a person reads (kept as the component's display name) cannot be the key.
// The rule, in order:
//   1. a name used in one namespace only in the push is the key as it is: `web`;
//   2. a name used in several namespaces is qualified by each namespace, DNS-style: `web.shop`,
//      `web.blog` (namespace names are DNS labels without dots, so the last label is always the
//      namespace);
//   3. several objects of one namespace with one name (a Deployment and an Ingress both called
//      `web`): the first by rank keeps the name, the others take their kind as a suffix:
//      `web`, `web-ingress` (qualified the same way when rule 2 applied);
//   4. a key still claimed twice (a Deployment literally named `web-ingress`, or `a.b` beside
//      `a` in namespace `b`): short keys in the clash are qualified by their namespace; if that
//      does not settle it, the push is refused with an issue at each object. Never silently.
import { KEY_PATTERN } from "@/lib/inventory/types";

export interface KeyClaim {
  /** Unique per object: `<Kind>/<namespace>/<name>`. */
  id: string;
  name: string;
  namespace: string;
  /** Lower ranks keep the plain name when one namespace has several objects of that name. */
  rank: number;
  /** e.g. `ingress`, `statefulset` */
  suffix: string;
}

export interface KeyAllocation {
  keys: Map<string, string>;
  /** Claims left without a key: an unsettled clash or a name too long for a key. */
  problems: { claim: KeyClaim; message: string }[];
}

export function allocateKeys(claims: readonly KeyClaim[]): KeyAllocation {
  const namespacesOf = new Map<string, Set<string>>();
  for (const c of claims) {
    const set = namespacesOf.get(c.name) ?? new Set<string>();
    set.add(c.namespace);
    namespacesOf.set(c.name, set);
  }
  const qualified = (c: KeyClaim) => (namespacesOf.get(c.name)?.size ?? 0) > 1;
  const withNs = (base: string, c: KeyClaim) => `${base}.${c.namespace}`;

  const sameName = new Map<string, KeyClaim[]>();
  for (const c of claims) {
    const id = `${c.namespace}/${c.name}`;
    const list = sameName.get(id) ?? [];
    list.push(c);
    sameName.set(id, list);
  }
  const keys = new Map<string, string>();
  const short = new Set<string>();
  for (const group of sameName.values()) {
    group.sort((a, b) => a.rank - b.rank || (a.id < b.id ? -1 : 1));
    group.forEach((c, i) => {
      const base = i === 0 ? c.name : `${c.name}-${c.suffix}`;
      if (qualified(c)) keys.set(c.id, withNs(base, c));
      else {
        keys.set(c.id, base);
        short.add(c.id);
      }
    });
  }

  // Rule 4: qualify the short keys of a clash, once.
  const byKey = groupByKey(claims, keys);
  for (const group of byKey.values()) {
    if (group.length < 2) continue;
    for (const c of group) if (short.has(c.id)) keys.set(c.id, withNs(keys.get(c.id) ?? c.name, c));
  }

  const problems: KeyAllocation["problems"] = [];
  for (const group of groupByKey(claims, keys).values()) {
    if (group.length < 2) continue;
    const names = group.map((c) => `${c.id.split("/")[0]} ${c.namespace}/${c.name}`).join(" and ");
    for (const c of group) problems.push({ claim: c, message: `${names} would all get component key ${JSON.stringify(keys.get(c.id))}; rename one of them` });
  }
  for (const c of claims) {
    const key = keys.get(c.id);
    if (key !== undefined && !KEY_PATTERN.test(key)) {
      problems.push({ claim: c, message: `${c.namespace}/${c.name} cannot be a component key: ${JSON.stringify(key)} is longer than 128 characters or not lower-case` });
    }
  }
  for (const p of problems) keys.delete(p.claim.id);
  return { keys, problems };
}

function groupByKey(claims: readonly KeyClaim[], keys: ReadonlyMap<string, string>): Map<string, KeyClaim[]> {
  const out = new Map<string, KeyClaim[]>();
  for (const c of claims) {
    const k = keys.get(c.id);
    if (k === undefined) continue;
    const list = out.get(k) ?? [];
    list.push(c);
    out.set(k, list);
  }
  return out;
}
