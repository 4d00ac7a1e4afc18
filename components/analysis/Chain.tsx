"use client";
// "Why does A depend on B?" — the shortest chain of runtime needs from A to B (GET …/chain), each
// hop with its strength and how it is known, and what that means for A when B fails.
import Link from "next/link";
import { Badge } from "@/components/ui/Badge";
import { chainResponseSchema } from "@/lib/api/schemas/analysis";
import type { z } from "zod";

type ChainResponse = z.infer<typeof chainResponseSchema>;
import { useApi } from "@/lib/client/api";

function verdict(c: ChainResponse): string {
  if (!c.path) return c.reversed ? `${c.from} does not depend on ${c.to}; it is the other way round: ${c.to} depends on ${c.from}.` : `${c.from} does not depend on ${c.to}, directly or through others.`;
  if (c.hardAllTheWay) return `Every hop is a hard need: when ${c.to} fails, ${c.from} goes down.`;
  if (c.hops.some((h) => h.anyOf)) return `A hop is one choice of an “any of” group: ${c.from} goes down only when every choice fails, unless another chain takes it down.`;
  return `A hop is a soft need: when ${c.to} fails, ${c.from} is degraded through this chain, not down (unless another chain takes it down).`;
}

export function ChainView({ env, from, to, compact = false }: { env: string; from: string; to: string; compact?: boolean }) {
  const chain = useApi(chainResponseSchema, `/api/v1/environments/${env}/chain?${new URLSearchParams({ from, to })}`, { revalidateOnFocus: false });
  if (chain.error) return <p className="text-sm text-down">{chain.error.status === 404 ? chain.error.message : `Could not work out the chain: ${chain.error.message}`}</p>;
  const c = chain.data;
  if (!c) return <p className="text-sm text-muted">Working out the chain…</p>;
  return (
    <div className="space-y-1.5 text-sm" data-testid="dependency-chain">
      {c.path && (
        <ol className={`flex flex-wrap items-center gap-1 ${compact ? "text-xs" : ""}`} aria-label={`Chain from ${c.from} to ${c.to}`}>
          {c.path.map((key, i) => {
            const hop = i > 0 ? c.hops[i - 1] : undefined;
            return (
              <li key={`${key}-${i}`} className="flex items-center gap-1">
                {hop && (
                  <span className="flex items-center gap-1 text-muted">
                    <span aria-hidden>→</span>
                    <span className="sr-only">needs</span>
                    <Badge tone={hop.strength === "hard" && !hop.anyOf ? "down" : "degraded"} title={hop.anyOf ? "one member of an any-of group" : `${hop.strength} need`}>
                      {hop.anyOf ? "any of" : hop.strength}
                      {hop.via ? ` · ${hop.via}` : ""}
                      {hop.provenance.includes("declared") ? "" : ` · ${hop.provenance.join("+")}`}
                    </Badge>
                    <span aria-hidden>→</span>
                  </span>
                )}
                <Link href={`/environments/${env}/components/${encodeURIComponent(key)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass">
                  {key}
                </Link>
              </li>
            );
          })}
        </ol>
      )}
      <p className="text-muted">{verdict(c)}</p>
      {!compact && <p className="text-xs text-muted">From snapshot #{c.snapshot.number}: the shortest chain of declared (and, as the environment&apos;s settings say, inferred or observed) runtime needs. Start-up-only needs are left out.</p>}
    </div>
  );
}
