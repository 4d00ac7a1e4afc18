"use client";
// The impact of the previewed file on the estate's failure points (lib/impact), shown before
// "Push": the change policies' results with their located findings, what moved in the ranking,
// and the structural changes (articulation points, cycles of hard needs, tier-1 blast radius,
// what entry points cannot avoid). Then the push controls, which a blocking policy holds back
// unless an architect or admin records a reason.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useState, type ReactNode } from "react";
import { Badge } from "@/components/ui/Badge";
import { Button } from "@/components/ui/Button";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { ApiForm, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { TextAreaField } from "@/components/ui/form/fields";
import type { ImpactReport } from "@/lib/api/schemas/impact";
import { overrideFormSchema, type DiffSummary } from "@/lib/api/schemas/inventory";
const score = (x: number) => x.toFixed(1);
const signed = (x: number) => `${x > 0 ? "+" : x < 0 ? "−" : "±"}${Math.abs(x).toFixed(1)}`;

function KeyList({ keys, total }: { keys: readonly string[]; total: number }) {
  return (
    <span className="font-mono text-xs">
      {keys.join(", ")}
      {total > keys.length && <span className="font-sans text-muted"> and {total - keys.length} more</span>}
    </span>
  );
}

function Line({ label, children, testId }: { label: string; children: ReactNode; testId?: string }) {
  return (
    <li className="grid gap-1 sm:grid-cols-[14rem_1fr]" data-testid={testId}>
      <span className="text-sm text-muted">{label}</span>
      <span className="text-sm">{children}</span>
    </li>
  );
}

function Policies({ impact, fileName }: { impact: ImpactReport; fileName: string }) {
  return (
    <ul className="divide-y divide-line rounded-md border border-line" data-testid="impact-policies">
      {impact.policies.map((p) => (
        <li key={p.rule} className="px-3 py-2" data-testid={`impact-policy-${p.rule}`}>
          <div className="flex flex-wrap items-center gap-2">
            {p.status === "off" ? <Badge>off</Badge> : p.status === "pass" ? <Badge tone="ok">passes</Badge> : p.severity === "block" ? <Badge tone="down">blocks</Badge> : <Badge tone="degraded">warns</Badge>}
            <span className="text-sm font-medium">{p.title}</span>
            {p.status === "fail" && <span className="text-xs text-muted">{p.findingsTotal === 1 ? "1 finding" : `${p.findingsTotal} findings`}</span>}
          </div>
          {p.status === "fail" && (
            <ul className="mt-1 space-y-1 pl-2">
              {p.findings.map((f, i) => (
                <li key={i} className="text-sm">
                  {f.at?.line && <span className="mr-2 font-mono text-xs text-muted">{`${f.at.file ?? fileName}:${f.at.line}${f.at.column ? `:${f.at.column}` : ""}`}</span>}
                  {f.message}
                </li>
              ))}
              {p.findingsTotal > p.findings.length && <li className="text-xs text-muted">… and {p.findingsTotal - p.findings.length} more</li>}
            </ul>
          )}
        </li>
      ))}
    </ul>
  );
}

type MovedRow = ImpactReport["moved"][number];
const movedCol = createColumnHelper<MovedRow>();

const MOVED_COLUMNS = [
  movedCol.accessor("key", { header: "Component", meta: { fixed: true, className: "font-mono" } }),
  movedCol.accessor((m) => m.tier ?? 5, { id: "tier", header: "Tier", meta: { numeric: true }, cell: (i) => i.row.original.tier ?? "—" }),
  movedCol.accessor((m) => (m.after?.pinchScore ?? 0) - (m.before?.pinchScore ?? 0), {
    id: "pinchScore",
    header: "Pinch score",
    meta: { className: "font-mono tabular-nums" },
    cell: (i) => {
      const m = i.row.original;
      if (m.before && m.after)
        return (
          <>
            {score(m.before.pinchScore)} → {score(m.after.pinchScore)} <span className={m.after.pinchScore > m.before.pinchScore ? "text-down" : "text-ok"}>({signed(m.after.pinchScore - m.before.pinchScore)})</span>
          </>
        );
      return m.after ? <>new: {score(m.after.pinchScore)}</> : <>removed (was {score(m.before!.pinchScore)})</>;
    },
  }),
  movedCol.accessor((m) => m.after?.rank ?? Infinity, {
    id: "rank",
    header: "Rank",
    meta: { className: "font-mono tabular-nums" },
    cell: (i) => {
      const m = i.row.original;
      return m.before && m.after ? `${m.before.rank} → ${m.after.rank}` : m.after ? `new at ${m.after.rank}` : `was ${m.before!.rank}`;
    },
  }),
];

function Moved({ impact }: { impact: ImpactReport }) {
  if (impact.moved.length === 0) return <p className="text-sm text-muted">No component&apos;s pinch score or rank moves by more than the thresholds.</p>;
  return (
    <>
      <DataTable id="impact-moved" caption="What moved in the ranking" columns={MOVED_COLUMNS} data={impact.moved} rowKey={(m) => m.key} paging={{ mode: "client", pageSize: 25 }} noun={["component", "components"]} empty="None." />
      {impact.summary.moved > impact.moved.length && <p className="text-xs text-muted">The impact lists {impact.moved.length} of {impact.summary.moved}; the API answer says how many in all.</p>}
    </>
  );
}

function Structure({ impact }: { impact: ImpactReport }) {
  const s = impact.summary;
  const lines: ReactNode[] = [];
  if (s.articulationAdded || s.articulationRemoved)
    lines.push(
      <Line key="ap" label="Articulation points" testId="impact-articulation">
        {s.articulationAdded ? <>new: <KeyList keys={impact.articulation.added.map((a) => a.key)} total={s.articulationAdded} /></> : "none new"}
        {s.articulationRemoved ? <>; no longer: <KeyList keys={impact.articulation.removed.map((a) => a.key)} total={s.articulationRemoved} /></> : null}
      </Line>,
    );
  if (s.bridgesAdded || s.bridgesRemoved) lines.push(<Line key="br" label="Bridges">{s.bridgesAdded} new, {s.bridgesRemoved} gone</Line>);
  for (const c of impact.hardCycles.added.slice(0, 5))
    lines.push(
      <Line key={`cy-${c.members.join()}`} label="New cycle of hard needs" testId="impact-cycle">
        <KeyList keys={c.members} total={c.members.length} />
        {c.closedBy[0] && <span className="text-muted"> — closed by {c.closedBy.map((n) => `${n.from} → ${n.to}`).join(", ")}</span>}
      </Line>,
    );
  if (s.hardCyclesRemoved) lines.push(<Line key="cy-gone" label="Cycles of hard needs broken">{s.hardCyclesRemoved}</Line>);
  for (const b of impact.tier1Blast.slice(0, 8))
    lines.push(
      <Line key={`t1-${b.key}`} label={`Tier-1 ${b.key} takes down`} testId="impact-tier1">
        <span className="font-mono">{b.before?.down ?? "—"} → {b.after?.down ?? "—"}</span>
        {b.newlyDownTotal > 0 && <> · newly down: <KeyList keys={b.newlyDown ?? []} total={b.newlyDownTotal} /></>}
      </Line>,
    );
  if (s.tier1BlastChanged > 8) lines.push(<Line key="t1-more" label="Tier-1 blast radius">changes for {s.tier1BlastChanged - 8} more</Line>);
  for (const e of impact.dominators.entries.slice(0, 5)) {
    const parts: ReactNode[] = [];
    if (e.addedTotal) parts.push(<span key="a">now cannot avoid <KeyList keys={e.added.map((x) => x.key)} total={e.addedTotal} /></span>);
    if (e.removedTotal) parts.push(<span key="r">{parts.length ? "; " : ""}no longer must pass <KeyList keys={e.removed.map((x) => x.key)} total={e.removedTotal} /></span>);
    if (parts.length) lines.push(<Line key={`dom-${e.entry}`} label={`Entry point ${e.entry}${e.status === "new-entry" ? " (new)" : ""}`}>{parts}</Line>);
  }
  if (lines.length === 0) return null;
  return <ul className="space-y-1.5">{lines}</ul>;
}

export function ImpactPanel({ impact, fileName, env }: { impact: ImpactReport; fileName: string; env: string }) {
  const tone = !impact.changed ? "border-line bg-raised" : impact.blocked ? "border-down/60 bg-down/10" : impact.summary.policiesFailed ? "border-degraded/60 bg-degraded/10" : "border-ok/60 bg-ok/10";
  return (
    <section aria-label="Impact on failure points" className="space-y-4" data-testid="impact-panel">
      <div className={`rounded-md border px-3 py-2 ${tone}`}>
        <h3 className="text-sm font-semibold" data-testid="impact-headline">
          {impact.headline}
        </h3>
        <p className="mt-1 text-xs text-muted">
          {impact.basis.snapshot === null
            ? "Compared with an empty environment."
            : `Compared with snapshot #${impact.basis.snapshot} (${impact.basis.analysis === "stored" ? "its stored analysis" : "analysed now"}).`}{" "}
          A what-if on the declared graph, not a guarantee: the analysis is only as good as the inventory.{" "}
          <Link className="text-brass underline underline-offset-4" href={`/environments/${env}/policies`}>
            Change policies
          </Link>
        </p>
      </div>
      <Policies impact={impact} fileName={fileName} />
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">What moved in the ranking</h3>
        <Moved impact={impact} />
      </div>
      <Structure impact={impact} />
    </section>
  );
}

/**
 * The push button under an impact: held back while a blocking policy fails; an architect or admin
 * may push anyway with a reason (the server checks the role and audits the reason).
 */
/** "+2 components, −1, 3 changed; +4 needs, −1": what the push changes, in one line. */
function diffLine(diff: DiffSummary): string {
  const c = diff.counts;
  const parts = [`+${c.componentsAdded} / −${c.componentsRemoved} / ~${c.componentsChanged} components`, `+${c.dependenciesAdded} / −${c.dependenciesRemoved} needs`];
  return parts.join("; ");
}

/** Push asked twice: the second question repeats what changes and what it does, beside the button. */
function ConfirmPush({ env, diff, impact, busy, onPush }: { env: string; diff: DiffSummary; impact: ImpactReport | undefined; busy: boolean; onPush: () => void }) {
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <Button type="button" variant="primary" disabled={busy} onClick={() => setAsking(true)} data-testid="push-button">
        {busy ? "Pushing…" : `Push to ${env}…`}
      </Button>
    );
  }
  return (
    <div role="group" aria-label={`Confirm the push to ${env}`} className="w-full space-y-2 rounded-md border border-brass/60 bg-brass/10 px-3 py-2 text-sm" data-testid="push-confirmation">
      <p className="font-semibold">Push to {env}?</p>
      <p>
        Changes: <span className="font-mono">{diffLine(diff)}</span>.
      </p>
      {impact && <p>Impact: {impact.headline}</p>}
      <div className="flex flex-wrap gap-2">
        <Button type="button" variant="primary" disabled={busy} onClick={onPush} data-testid="push-confirm">
          {busy ? "Pushing…" : `Yes, push to ${env}`}
        </Button>
        <Button type="button" variant="ghost" disabled={busy} onClick={() => setAsking(false)}>
          Not yet
        </Button>
      </div>
    </div>
  );
}

export function GatedPush({ impact, diff, env, canOverride, busy, onPush }: { impact: ImpactReport | undefined; diff: DiffSummary; env: string; canOverride: boolean; busy: boolean; onPush: (overrideReason: string | null) => void }) {
  if (!impact?.blocked) return <ConfirmPush env={env} diff={diff} impact={impact} busy={busy} onPush={() => onPush(null)} />;
  if (!canOverride) {
    return (
      <p className="text-sm" data-testid="push-blocked">
        <Button type="button" variant="primary" disabled className="mr-3">
          Push to {env}
        </Button>
        A blocking change policy fails, so this file cannot be pushed as it is. Fix what the findings name, or ask an architect or admin, who can push it with a reason.
      </p>
    );
  }
  return <OverrideForm env={env} busy={busy} onPush={onPush} />;
}

/** Why an architect or admin pushes past a blocking policy: the reason is kept in the audit log. */
function OverrideForm({ env, busy, onPush }: { env: string; busy: boolean; onPush: (overrideReason: string) => void }) {
  const form = useApiForm(overrideFormSchema, { override_reason: "" });
  const onSubmit = form.handleSubmit((v) => onPush(v.override_reason));
  return (
    <div className="w-full" data-testid="push-override">
      <ApiForm form={form} onSubmit={onSubmit} label="Push despite the policy" className="space-y-2">
        <TextAreaField
          name="override_reason"
          label="A blocking policy fails. Why push it anyway?"
          hint="kept in the audit log with the policies it overrides"
          rows={2}
          maxLength={1000}
          placeholder="e.g. the second replica ships next sprint; accepted for the launch"
          help="At least 10 characters."
        />
        <SubmitButton variant="danger" disabled={busy} testId="push-override-button">
          {busy ? "Pushing…" : `Push to ${env} despite the policy`}
        </SubmitButton>
      </ApiForm>
    </div>
  );
}
