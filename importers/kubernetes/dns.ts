// Which Service a host name in configuration means, by the Kubernetes DNS-based service discovery
// specification and the "DNS for Services and Pods" page:
//   <svc>.<ns>.svc.<cluster-domain>            a Service's A/AAAA record
//   <hostname>.<svc>.<ns>.svc.<cluster-domain>  a Pod behind a headless Service (StatefulSet Pods)
// A Pod's resolver completes shorter names with its search list
//   <ns>.svc.<cluster-domain>  svc.<cluster-domain>  <cluster-domain>
// in that order, so `svc` is the Service in the Pod's own namespace, `svc.ns` and `svc.ns.svc` a
// Service in namespace ns, and `a.b` is first Pod `a` of headless Service `b` in the Pod's own
// namespace, then Service `a` in namespace `b` — the first that exists wins, as in the resolver.
// Kubelet also gives each container `<SVC>_SERVICE_HOST` / `_PORT` variables for the Services of
// its namespace ("Service", section "Environment variables"): the name upper-cased, `-` → `_`.

export interface ServiceRef {
  namespace: string;
  name: string;
}

export interface ServiceLookup {
  /** Whether namespace/name is a Service of the push; `headless` when its clusterIP is None. */
  get(namespace: string, name: string): { headless: boolean } | undefined;
}

export const DEFAULT_CLUSTER_DOMAIN = "cluster.local";

/** The Service a host name reaches from a Pod in `namespace`, or null when it names none of the push. */
export function resolveServiceHost(host: string, namespace: string, domain: string, services: ServiceLookup): ServiceRef | null {
  const h = host.toLowerCase().replace(/\.$/, "");
  const tail = `.svc.${domain}`;
  const names = h.endsWith(tail) ? [h] : [`${h}.${namespace}${tail}`, `${h}${tail}`, `${h}.${domain}`];
  for (const fqdn of names) {
    if (!fqdn.endsWith(tail)) continue;
    const labels = fqdn.slice(0, -tail.length).split(".");
    if (labels.length === 2) {
      const [name, ns] = labels as [string, string];
      if (services.get(ns, name)) return { namespace: ns, name };
    } else if (labels.length === 3) {
      const [, name, ns] = labels as [string, string, string];
      if (services.get(ns, name)?.headless) return { namespace: ns, name };
    }
  }
  return null;
}

/** A name that can only be a cluster name (it ends in `.svc` or `.svc.<domain>`), for a warning when no Service of the push has it. */
export function clusterNameOf(host: string, domain: string): ServiceRef | null {
  const h = host.toLowerCase().replace(/\.$/, "");
  const stem = h.endsWith(`.svc.${domain}`) ? h.slice(0, -`.svc.${domain}`.length) : h.endsWith(".svc") ? h.slice(0, -4) : null;
  if (stem === null) return null;
  const labels = stem.split(".");
  if (labels.length < 2 || labels.length > 3) return null;
  return { namespace: labels[labels.length - 1]!, name: labels[labels.length - 2]! };
}

const SERVICE_ENV = /\$(?:\(|\{)?([A-Z][A-Z0-9_]*)_SERVICE_(?:HOST|PORT)\b/g;

/** Service names referred to through kubelet's `<SVC>_SERVICE_HOST` variables in a value (`$(X_SERVICE_HOST)`, `${X_SERVICE_HOST}`, `$X_SERVICE_HOST`). */
export function serviceEnvReferences(value: string): string[] {
  const out: string[] = [];
  for (const m of value.matchAll(SERVICE_ENV)) {
    const name = (m[1] ?? "").toLowerCase().replace(/_/g, "-");
    if (!out.includes(name)) out.push(name);
  }
  return out;
}
