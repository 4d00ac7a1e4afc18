"use client";
// Risk reviews of one environment: what has been decided about its pinch points, what is past
// its date, and (for architects and admins) the form to decide and the pinch-score weights.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useState } from "react";
import { UnownedQueue, type QueueViewer } from "@/components/teams/UnownedQueue";
import { ConfirmButton } from "@/components/ui/ConfirmButton";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { FormError } from "@/components/ui/Field";
import { When } from "@/components/ui/When";
import { clearedReviewSchema, type ReviewView } from "@/lib/api/schemas/reviews";
import { sendJson } from "@/lib/client/api";
import { ReviewBadge } from "./ReviewBadge";
import { ReviewForm, type ReviewDraft } from "./ReviewForm";
import { useReviews } from "./useReviews";
import { SettingsForm } from "./SettingsForm";
import { WeightsForm } from "./WeightsForm";

const col = createColumnHelper<ReviewView>();

function columns(env: string, canWrite: boolean, change: (r: ReviewView) => void, clear: (key: string) => Promise<void>) {
  return [
    col.accessor("key", {
      header: "Component",
      meta: { fixed: true },
      cell: (i) => (
        <>
          <Link href={`/environments/${env}/components/${encodeURIComponent(i.getValue())}`} className="font-mono text-ink hover:text-brass">
            {i.getValue()}
          </Link>
          {i.row.original.name === null ? <div className="text-xs text-degraded">no longer declared</div> : <div className="text-xs text-muted">{i.row.original.name}</div>}
        </>
      ),
    }),
    // Sorts past-due first, then by the date to look again.
    col.accessor((r) => `${r.overdue ? 0 : 1}${r.reviewBy ?? "9999"}`, { id: "decision", header: "Decision", cell: (i) => <ReviewBadge review={i.row.original} /> }),
    col.accessor("rationale", { header: "Rationale", meta: { className: "max-w-md text-muted" } }),
    col.accessor((r) => r.reviewer?.email ?? "", {
      id: "reviewer",
      header: "Reviewer",
      cell: (i) => (
        <span className="text-xs text-muted">
          {i.getValue() || "—"}
          <div className="text-faint">
            <When at={i.row.original.updatedAt} />
          </div>
        </span>
      ),
    }),
    col.accessor("createdAt", { header: "First reviewed", meta: { hidden: true }, cell: (i) => <When at={i.getValue()} /> }),
    ...(canWrite
      ? [
          col.display({
            id: "actions",
            header: () => <span className="sr-only">Actions</span>,
            meta: { label: "Change or clear", fixed: true, className: "whitespace-nowrap text-right" },
            cell: (i) => (
              <span className="inline-flex items-center gap-1">
                <Button variant="ghost" onClick={() => change(i.row.original)} aria-label={`Change review of ${i.row.original.key}`}>
                  Change
                </Button>
                <ConfirmButton
                  label="Clear"
                  name={`Clear review of ${i.row.original.key}`}
                  question={<>Clear the review of {i.row.original.key}? The audit log keeps what it said.</>}
                  confirmLabel="Yes, clear"
                  onConfirm={() => clear(i.row.original.key)}
                />
              </span>
            ),
          }),
        ]
      : []),
  ];
}

export function ReviewsScreen({ env, canWrite, canReadAudit, queueViewer }: { env: string; canWrite: boolean; canReadAudit: boolean; queueViewer: QueueViewer }) {
  const { items, error, isLoading, mutate } = useReviews(env);
  const [overdueOnly, setOverdueOnly] = useState(false);
  // A new draft mounts the form again with it (no effect copying props into the form).
  // ?decide=<key> (from a pinch-points row or a component page) starts the form on that component.
  const decide = useSearchParams().get("decide");
  const [draft, setDraft] = useState<{ n: number; value: ReviewDraft | null }>({ n: 0, value: decide ? { key: decide, status: "accepted", rationale: "", reviewBy: null } : null });
  const [actionError, setActionError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const overdueCount = (items ?? []).filter((r) => r.overdue).length;
  const shown = overdueOnly ? items?.filter((r) => r.overdue) : items;

  async function clear(key: string) {
    const res = await sendJson(clearedReviewSchema, `/api/v1/environments/${env}/reviews/${encodeURIComponent(key)}`, "DELETE");
    setActionError(res.ok ? null : res.error.detail);
    void mutate();
  }
  const change = (r: ReviewView) => setDraft((d) => ({ n: d.n + 1, value: { key: r.key, status: r.status, rationale: r.rationale, reviewBy: r.reviewBy } }));

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            Risk reviews <span className="font-mono text-muted">· {env}</span>
          </h1>
          <p className="mt-1 text-sm text-muted">
            What architects decided about each pinch point, and when to look again.{" "}
            <Link className="text-brass underline" href={`/environments/${env}/pinch-points`}>
              Pinch points
            </Link>
            {canReadAudit && (
              <>
                {" · "}
                <Link className="text-brass underline" href={`/admin/audit?environment=${env}&action=review`}>
                  Review history
                </Link>
              </>
            )}
          </p>
        </div>
        {overdueCount > 0 && (
          <span className="rounded-md border border-down/60 bg-down/10 px-3 py-1.5 text-sm text-down" data-testid="overdue-count">
            {overdueCount} past the review-by date
          </span>
        )}
      </div>

      {canWrite && (
        <div id="decide" className="scroll-mt-28">
        <Card title={draft.value ? <>Review <span className="font-mono">{draft.value.key}</span></> : "Review a pinch point"}>
          <ReviewForm
            key={draft.n}
            env={env}
            draft={draft.value}
            onSaved={(key) => {
              setSaved(key);
              // The form starts empty again for the next decision.
              setDraft((d) => ({ n: d.n + 1, value: null }));
              void mutate();
            }}
          />
          {saved && (
            <p className="mt-2 text-sm text-ok" role="status">
              Saved the review of <span className="font-mono">{saved}</span>.
            </p>
          )}
        </Card>
        </div>
      )}

      <Card
        title={`Reviews (${items?.length ?? "…"})`}
        action={
          <label className="flex items-center gap-2 text-sm text-muted">
            <input type="checkbox" checked={overdueOnly} onChange={(e) => setOverdueOnly(e.target.checked)} /> only past their date
          </label>
        }
      >
        <FormError message={actionError} />
        <DataTable
          id="reviews"
          testId="reviews-table"
          caption="Risk reviews"
          columns={columns(env, canWrite, change, clear)}
          data={shown}
          rowKey={(r) => r.key}
          rowTestId={(r) => `review-${r.key}`}
          rowClassName={(r) => (r.overdue ? "bg-down/5" : "")}
          error={error}
          loading={isLoading}
          paging={{ mode: "client", pageSize: 25, initialSort: [{ id: "decision", desc: false }], search: { label: "Find a review", placeholder: "component or rationale" } }}
          noun={["review", "reviews"]}
          empty={overdueOnly ? "Nothing is past its date." : "No pinch point in this environment has been reviewed yet."}
        />
      </Card>

      <div className="grid gap-6 xl:grid-cols-2">
        <div id="weights" className="scroll-mt-28">
          <WeightsForm env={env} canWrite={canWrite} />
        </div>
        <SettingsForm env={env} canWrite={canWrite} />
        <UnownedQueue environment={env} viewer={queueViewer} />
      </div>
    </div>
  );
}
