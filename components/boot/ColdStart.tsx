"use client";
// Cold start after a full outage: the stages in which components can be brought up (each stage
// needs only earlier ones, start-up-only needs included), the cycles that block a clean start
// with the needs to break first, printable as a runbook that names its snapshot and when it was
// printed. A runbook drawn from the declared inventory, not a guarantee.
import Link from "next/link";
import { useMemo, useState } from "react";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { Card, Stat } from "@/components/ui/Card";
import { When } from "@/components/ui/When";
import { plural } from "@/components/ui/format";
import { Notice } from "@/components/ui/Notice";
import { bootOrderResponseSchema } from "@/lib/api/schemas/analysis";
import { useApi } from "@/lib/client/api";

/** Stages longer than this open folded on screen (a 20,000-component estate has stages of thousands). */
const FOLD_AT = 150;

const BREAK_WORDS: Record<string, { tone: "down" | "degraded" | "muted"; label: string; advice: (from: string, to: string) => string }> = {
  hard: { tone: "down", label: "hard", advice: (from, to) => `${from} cannot run without ${to}: bring ${from} up by hand against a stand-in for ${to}, or ${to} first by hand, then restart ${from} once ${to} is up.` },
  startup: { tone: "muted", label: "start-up only", advice: (from, to) => `${from} needs ${to} only while starting: skip or stub that step, start ${from}, and run ${to} once the cycle is up.` },
  soft: { tone: "degraded", label: "soft", advice: (from, to) => `${from} starts degraded without ${to} and recovers when ${to} is up.` },
};

function Key({ env, k }: { env: string; k: string }) {
  return (
    <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink underline decoration-line underline-offset-2 hover:decoration-brass print:no-underline">
      {k}
    </Link>
  );
}

export function ColdStart({ env }: { env: string }) {
  const boot = useApi(bootOrderResponseSchema, `/api/v1/environments/${env}/boot-order?components=true`);
  const [unfolded, setUnfolded] = useState<Set<number>>(new Set());
  // Fixed when the page is opened, so that the printed sheet says when it was taken.
  const [openedAt] = useState(() => new Date().toISOString());
  const d = boot.data;
  const inCycle = useMemo(() => new Map((d?.cycles ?? []).flatMap((c, i) => c.members.map((k) => [k, i] as const))), [d]);
  const waiting = useMemo(() => new Set(d?.waitingOnCycle ?? []), [d]);

  if (boot.error) {
    return (
      <div className="space-y-3">
        <h1 className="text-2xl font-semibold tracking-tight">Cold start</h1>
        <Notice tone={boot.error.status === 404 ? "info" : "error"} title={boot.error.status === 404 ? "No boot order yet" : "Could not load the boot order"}>
          {boot.error.message}
        </Notice>
      </div>
    );
  }
  if (!d) return <p className="text-muted">Loading the boot order…</p>;
  const total = d.stages.reduce((n, s) => n + s.length, 0);
  const startup = d.startupNeeds ?? {};
  const startupCount = Object.values(startup).reduce((n, xs) => n + xs.length, 0);
  const printAll = () => {
    setUnfolded(new Set(d.stages.map((_, i) => i)));
    // Let React render the unfolded stages before the print dialog takes its snapshot.
    setTimeout(() => window.print(), 50);
  };

  return (
    <div className="space-y-5" data-testid="cold-start">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            Cold start <span className="font-mono text-lg text-muted">{env}</span>
          </h1>
          <p className="mt-1 text-sm text-muted" data-testid="runbook-provenance">
            Runbook from snapshot #{d.snapshot.number} (pushed <When at={d.snapshot.createdAt} />){d.analysis.computedAt ? <>, analysed <When at={d.analysis.computedAt} /></> : ""}; opened{" "}
            <When at={openedAt} />.
          </p>
          {d.latest && (
            <p className="mt-1 text-sm text-degraded print:text-ink" role="status">
              Snapshot #{d.latest.number} is newer and still {d.latest.status}: this runbook may miss its changes.
            </p>
          )}
        </div>
        <div className="flex gap-2 print:hidden">
          <Button type="button" onClick={printAll}>
            Print runbook
          </Button>
        </div>
      </div>

      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Stat label="Stages" value={d.stages.length} hint="each needs only the stages before it" />
        <Stat label="Components" value={total} />
        <Stat label="Blocking cycles" value={d.cycles.length} tone={d.cycles.length ? "down" : "ok"} hint="cannot start unaided" />
        <Stat label="Start-up-only needs" value={startupCount} hint="order the start, take nothing down later" />
      </div>

      <Card title={d.cycles.length ? `Cycles that block a clean start (${d.cycles.length})` : "Cycles that block a clean start"}>
        {d.cycles.length === 0 ? (
          <p className="text-sm text-muted">None: every component can start once the stages before it are up.</p>
        ) : (
          <ol className="space-y-4" data-testid="boot-cycles">
            {d.cycles.map((c, i) => (
              <li key={c.members.join(">")} className="break-inside-avoid border-l-2 border-down/60 pl-3 text-sm">
                <p className="font-medium">
                  Cycle {i + 1}: {plural(c.members.length, "component")} in stage {d.stages.findIndex((s) => s.includes(c.members[0]!))} that need each other
                </p>
                <p className="mt-1 text-muted">
                  Start in this order: {(c.startOrder ?? c.members).slice(0, 40).map((k, j) => (
                    <span key={k}>
                      {j > 0 && " → "}
                      <Key env={env} k={k} />
                    </span>
                  ))}
                  {(c.startOrder ?? c.members).length > 40 && ` → … ${(c.startOrder ?? c.members).length - 40} more`}
                </p>
                {c.breaks && c.breaks.length > 0 && (
                  <div className="mt-1">
                    <p>Break first{c.breakCount !== null && c.breakCount > c.breaks.length ? ` (the first ${c.breaks.length} of ${c.breakCount})` : ""}:</p>
                    <ul className="mt-0.5 space-y-1" data-testid="boot-breaks">
                      {c.breaks.map((b) => {
                        const words = BREAK_WORDS[b.strength] ?? BREAK_WORDS.hard!;
                        return (
                          <li key={`${b.from}>${b.to}`}>
                            <input type="checkbox" aria-label={`done: ${b.from} without ${b.to}`} className="mr-2 align-middle" />
                            <Key env={env} k={b.from} /> needs <Key env={env} k={b.to} /> <Badge tone={words.tone}>{words.label}</Badge>{" "}
                            <span className="text-muted">— {b.from === b.to ? `${b.from} needs itself: remove that need.` : words.advice(b.from, b.to)}</span>
                          </li>
                        );
                      })}
                    </ul>
                  </div>
                )}
              </li>
            ))}
          </ol>
        )}
        {d.cycles.length > 0 && (
          <p className="mt-3 text-xs text-muted">
            The order comes from the Eades–Lin–Smyth heuristic for the fewest needs to break; it is a suggestion, not always the minimum. Soft needs are broken first where they suffice.
          </p>
        )}
      </Card>

      <section className="space-y-3" aria-label="Stages">
        <h2 className="text-lg font-semibold">Stages</h2>
        {d.stages.map((stage, i) => {
          const folded = stage.length > FOLD_AT && !unfolded.has(i);
          const shown = folded ? stage.slice(0, FOLD_AT) : stage;
          return (
            <Card key={i} title={`Stage ${i} · ${plural(stage.length, "component")}${i === 0 ? " · need nothing" : ""}`} className="break-inside-avoid-page">
              <ul className="grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2 xl:grid-cols-3" data-testid={`stage-${i}`}>
                {shown.map((k) => {
                  const c = d.components[k];
                  const cycle = inCycle.get(k);
                  return (
                    <li key={k} className="flex flex-wrap items-center gap-1.5">
                      <input type="checkbox" aria-label={`${k} is up`} className="align-middle" />
                      <Key env={env} k={k} />
                      {c?.tier === 1 && <Badge tone="info">tier 1</Badge>}
                      {cycle !== undefined && <Badge tone="cycle">cycle {cycle + 1}</Badge>}
                      {waiting.has(k) && <Badge tone="degraded" title="Needs something in a cycle: it waits until the cycle is broken">waits on a cycle</Badge>}
                      {startup[k] && (
                        <span className="text-xs text-muted">
                          after {startup[k].join(", ")} <Badge tone="muted" title="needed only to start">start-up only</Badge>
                        </span>
                      )}
                      <span className="text-xs text-faint">{c?.team ?? "unowned"}</span>
                    </li>
                  );
                })}
              </ul>
              {folded && (
                <button type="button" className="mt-2 text-sm text-info hover:underline print:hidden" onClick={() => setUnfolded(new Set([...unfolded, i]))}>
                  Show all {stage.length}
                </button>
              )}
            </Card>
          );
        })}
      </section>

      <p className="text-xs text-muted">
        Drawn from the declared inventory only: a need nobody declared is not in it, so check this against your own runbooks. Bringing production back follows your organisation&apos;s incident
        and change processes.
      </p>
    </div>
  );
}
