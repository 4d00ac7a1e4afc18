// Drift: what traces saw against what teams declared, for one environment, with the traffic behind
// each traced call over the rolling window (lib/data/trace-traffic.ts). Trace names are resolved
// through aliases first, so only real disagreements are listed; names that look like a declared
// component but are no alias of it yet are proposed as aliases (lib/traces/aliases.ts). Each
// undeclared call and each proposal carries a format 1 snippet for the file that should say so.
import "server-only";
import { OBSERVED_SOURCE } from "@/lib/inventory/observed";
import { aliasSnippet, needSnippet } from "@/lib/inventory/snippet";
import type { Strength } from "@/lib/inventory/types";
import { proposeAliases } from "@/lib/traces/aliases";
import { loadCurrentContent } from "./graph-content";
import { observedTraffic, type Traffic } from "./trace-traffic";

interface ObservedSource {
  source: string;
  lastSeenAt: string;
  /** distinct from→to pairs this source's traces showed within the window */
  edges: number;
}

interface SeenNotDeclared extends Traffic {
  from: string;
  to: string;
  /** calls within the window (the same as `calls`; kept for older clients of this API) */
  count: number;
  evidence: string[];
  via: string | null;
  async: boolean;
  /** the names traces used, when aliases resolved them */
  tracedAs: string[];
  /** declared by some file (not only seen in traces, nor an undeclared placeholder) */
  fromKnown: boolean;
  toKnown: boolean;
  /** whose file should declare the need: the source and team that declare `from`; null when no source declares it */
  declareIn: { source: string; team: string | null } | null;
  /** strength the snippet proposes: hard for a synchronous call, soft for an asynchronous hand-off */
  suggestedStrength: Strength;
  /** format 1 snippet that declares the need */
  snippet: string;
}

interface DeclaredNotSeen {
  from: string;
  to: string;
  strength: Strength;
  /** the source whose file declares the need */
  source: string;
  team: string | null;
  /** one of several alternatives (any_of): an unused alternative is expected to be absent from traces */
  anyOf: boolean;
}

interface AliasProposalRow {
  key: string;
  alias: string;
  reason: string;
  source: string;
  team: string | null;
  snippet: string;
}

export interface Drift {
  window: { days: number; since: string };
  observedSources: ObservedSource[];
  seenNotDeclared: SeenNotDeclared[];
  declaredNotSeen: DeclaredNotSeen[];
  /** declared from→to pairs that some trace confirmed */
  agreeing: number;
  aliasProposals: AliasProposalRow[];
}

const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

export async function getDrift({ environmentId, now }: { environmentId: string; now?: Date }): Promise<Drift> {
  const [traffic, content] = await Promise.all([observedTraffic({ environmentId, now }), loadCurrentContent({ environmentId })]);
  const declaredComponents = new Map(content.components.filter((c) => c.source !== null && c.source !== OBSERVED_SOURCE).map((c) => [c.key, c]));
  const declaredDeps = content.dependencies.filter((d) => d.source !== OBSERVED_SOURCE);
  const declaredPairs = new Set(declaredDeps.map((d) => `${d.from}\u0000${d.to}`));
  const observedPairs = new Set(traffic.edges.map((e) => `${e.from}\u0000${e.to}`));
  const callers = new Set(traffic.edges.map((e) => e.from));

  const seenNotDeclared: SeenNotDeclared[] = traffic.edges
    .filter((e) => !declaredPairs.has(`${e.from}\u0000${e.to}`))
    .map((e) => {
      const owner = declaredComponents.get(e.from);
      const declareIn = owner?.source ? { source: owner.source, team: owner.team } : null;
      const suggestedStrength: Strength = e.async ? "soft" : "hard";
      return {
        from: e.from,
        to: e.to,
        count: e.calls,
        calls: e.calls,
        errors: e.errors,
        callsPerMinute: e.callsPerMinute,
        errorRate: e.errorRate,
        p50Ms: e.p50Ms,
        p95Ms: e.p95Ms,
        firstSeenAt: e.firstSeenAt,
        lastSeenAt: e.lastSeenAt,
        evidence: e.evidence,
        via: e.via,
        async: e.async,
        tracedAs: e.tracedAs,
        fromKnown: owner !== undefined,
        toKnown: declaredComponents.has(e.to),
        declareIn,
        suggestedStrength,
        snippet: needSnippet({
          source: declareIn?.source ?? null,
          team: declareIn?.team ?? null,
          from: e.from,
          fromKind: owner && owner.kind !== "undeclared" ? owner.kind : "service",
          to: e.to,
          strength: suggestedStrength,
          via: e.via,
        }),
      };
    })
    .sort((a, b) => b.calls - a.calls || cmp(a.from, b.from) || cmp(a.to, b.to));

  // Only dependents that traces show calling something: a component no trace starts from says
  // nothing about its own needs, so its declared needs are left out rather than reported as unseen.
  const declaredNotSeen: DeclaredNotSeen[] = declaredDeps
    .filter((d) => callers.has(d.from) && !observedPairs.has(`${d.from}\u0000${d.to}`) && d.strength !== "startup")
    .map((d) => ({ from: d.from, to: d.to, strength: d.strength, source: d.source ?? "", team: declaredComponents.get(d.from)?.team ?? null, anyOf: d.group !== null }))
    .sort((a, b) => cmp(a.from, b.from) || cmp(a.to, b.to));

  let agreeing = 0;
  for (const pair of observedPairs) if (declaredPairs.has(pair)) agreeing += 1;

  const known = new Set<string>([...declaredComponents.keys(), ...[...declaredComponents.values()].flatMap((c) => c.aliases ?? [])]);
  const aliasProposals = proposeAliases({
    tracedNames: traffic.edges.flatMap((e) => [e.from, e.to]),
    declaredKeys: [...declaredComponents.keys()],
    known,
  }).flatMap((p) => {
    const c = declaredComponents.get(p.key);
    if (!c?.source || c.kind === "undeclared") return [];
    return [{ ...p, source: c.source, team: c.team, snippet: aliasSnippet({ source: c.source, team: c.team, key: p.key, kind: c.kind, alias: p.alias }) }];
  });

  return { window: traffic.window, observedSources: traffic.sources, seenNotDeclared, declaredNotSeen, agreeing, aliasProposals };
}
