// Aliases the drift screen proposes: a name from traces that is no component key or alias, and
// looks like exactly one declared component's key. Three readings, each a common naming habit
// (rules of thumb, not a standard):
//   1. the same letters and digits once separators are dropped: "cart_service" ~ "cart-service",
//      "CartService" (traced, normalised to "cartservice") ~ "cart-service";
//   2. the first label of a DNS name: "cart.shop.svc.cluster.local" ~ "cart" (server.address
//      values are host names, general/attributes.md);
//   3. the same once a trailing service/svc/server/srv/api/app/backend word is dropped from either:
//      "cartservice" ~ "cart", "cart" ~ "cart-api".
// A name matching several components gets no proposal: guessing between them would mislead.

export interface AliasProposal {
  /** the declared component */
  key: string;
  /** the trace name to list in its aliases */
  alias: string;
  reason: string;
}

const squash = (s: string): string => s.replace(/[-_.]/g, "");
const SUFFIX = /(service|svc|server|srv|api|app|backend)$/;
const stem = (s: string): string => {
  const q = squash(s);
  const t = q.replace(SUFFIX, "");
  return t === "" ? q : t;
};

export function proposeAliases({ tracedNames, declaredKeys, known }: { tracedNames: Iterable<string>; declaredKeys: readonly string[]; known: ReadonlySet<string> }): AliasProposal[] {
  const bySquash = new Map<string, string[]>();
  const byStem = new Map<string, string[]>();
  for (const k of declaredKeys) {
    bySquash.set(squash(k), [...(bySquash.get(squash(k)) ?? []), k]);
    byStem.set(stem(k), [...(byStem.get(stem(k)) ?? []), k]);
  }
  const out: AliasProposal[] = [];
  for (const name of new Set(tracedNames)) {
    if (known.has(name)) continue;
    const candidates = new Map<string, string>();
    for (const k of bySquash.get(squash(name)) ?? []) candidates.set(k, `"${name}" and "${k}" differ only in separators`);
    const label = name.includes(".") ? name.split(".")[0]! : null;
    if (label) for (const k of [...(bySquash.get(squash(label)) ?? [])]) if (!candidates.has(k)) candidates.set(k, `"${name}" is a host name whose first label is "${label}"`);
    if (candidates.size === 0) for (const k of byStem.get(stem(label ?? name)) ?? []) candidates.set(k, `"${name}" and "${k}" differ only in a service-like suffix`);
    if (candidates.size !== 1) continue;
    const [[key, reason]] = [...candidates] as [[string, string]];
    if (key !== name) out.push({ key, alias: name, reason });
  }
  return out.sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : a.alias < b.alias ? -1 : 1));
}
