"use client";
// Risk reviews of one environment: what has been decided about its pinch points, what is past
// its date, and (for architects and admins) the form to decide and the pinch-score weights.
import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { UnownedQueue, type QueueViewer } from "@/components/teams/UnownedQueue";
import { ReviewBadge, formatDay } from "./ReviewBadge";
import { ReviewForm, type ReviewDraft } from "./ReviewForm";
import { useReviews } from "./useReviews";
import { SettingsForm } from "./SettingsForm";
import { WeightsForm } from "./WeightsForm";

export function ReviewsScreen({ env, canWrite, canReadAudit, queueViewer }: { env: string; canWrite: boolean; canReadAudit: boolean; queueViewer: QueueViewer }) {
  const { items, error, isLoading, mutate } = useReviews(env);
  const [overdueOnly, setOverdueOnly] = useState(false);
  const [draft, setDraft] = useState<ReviewDraft | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const overdueCount = items.filter((r) => r.overdue).length;
  const shown = overdueOnly ? items.filter((r) => r.overdue) : items;

  async function clear(key: string) {
    if (!window.confirm(`Clear the review of ${key}? The audit log keeps what it said.`)) return;
    const res = await sendJson(`/api/v1/environments/${env}/reviews/${key}`, "DELETE");
    setActionError(res.ok ? null : res.message);
    void mutate();
  }

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            Risk reviews <span className="font-mono text-muted">· {env}</span>
          </h1>
          <p className="mt-1 text-sm text-muted">
            What architects decided about each pinch point, and when to look again.{" "}
            <Link className="text-brass hover:underline" href={`/environments/${env}/pinch-points`}>
              Pinch points
            </Link>
            {canReadAudit && (
              <>
                {" · "}
                <Link className="text-brass hover:underline" href={`/admin/audit?environment=${env}&action=review`}>
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
        <Card title="Review a pinch point">
          <ReviewForm
            env={env}
            draft={draft}
            onSaved={(key) => {
              setSaved(key);
              setDraft(null);
              void mutate();
            }}
          />
          {saved && (
            <p className="mt-2 text-sm text-ok" role="status">
              Saved the review of <span className="font-mono">{saved}</span>.
            </p>
          )}
        </Card>
      )}

      <Card
        title={`Reviews (${items.length})`}
        action={
          <label className="flex items-center gap-2 text-sm text-muted">
            <input type="checkbox" checked={overdueOnly} onChange={(e) => setOverdueOnly(e.target.checked)} /> only past their date
          </label>
        }
      >
        {error && <FormError message={`Could not load the reviews: ${error.message}`} />}
        {isLoading && <p className="text-sm text-muted">Loading…</p>}
        <FormError message={actionError} />
        {!isLoading && shown.length === 0 && <p className="text-sm text-muted">{overdueOnly ? "Nothing is past its date." : "No pinch point in this environment has been reviewed yet."}</p>}
        {shown.length > 0 && (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="reviews-table">
              <thead className="text-xs uppercase tracking-wide text-faint">
                <tr>
                  <th className="pb-2 pr-3 font-medium">Component</th>
                  <th className="pb-2 pr-3 font-medium">Decision</th>
                  <th className="pb-2 pr-3 font-medium">Rationale</th>
                  <th className="pb-2 pr-3 font-medium">Reviewer</th>
                  {canWrite && <th className="pb-2 font-medium" />}
                </tr>
              </thead>
              <tbody>
                {shown.map((r) => (
                  <tr key={r.key} className={`border-t border-line align-top ${r.overdue ? "bg-down/5" : ""}`} data-testid={`review-${r.key}`}>
                    <td className="py-2 pr-3">
                      <Link href={`/environments/${env}/components/${r.key}`} className="font-mono text-ink hover:text-brass">
                        {r.key}
                      </Link>
                      {r.name === null ? <div className="text-xs text-degraded">no longer declared</div> : <div className="text-xs text-muted">{r.name}</div>}
                    </td>
                    <td className="py-2 pr-3">
                      <ReviewBadge review={r} />
                    </td>
                    <td className="max-w-md py-2 pr-3 text-muted">{r.rationale}</td>
                    <td className="py-2 pr-3 text-xs text-muted">
                      {r.reviewer?.email ?? "—"}
                      <div className="text-faint">{formatDay(r.updatedAt.slice(0, 10))}</div>
                    </td>
                    {canWrite && (
                      <td className="whitespace-nowrap py-2 text-right">
                        <Button variant="ghost" onClick={() => setDraft({ key: r.key, status: r.status, rationale: r.rationale, reviewBy: r.reviewBy ?? "" })} aria-label={`Change review of ${r.key}`}>
                          Change
                        </Button>
                        <Button variant="ghost" onClick={() => void clear(r.key)} aria-label={`Clear review of ${r.key}`}>
                          Clear
                        </Button>
                      </td>
                    )}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>

      <div className="grid gap-6 xl:grid-cols-2">
        <WeightsForm env={env} canWrite={canWrite} />
        <SettingsForm env={env} canWrite={canWrite} />
        <UnownedQueue environment={env} viewer={queueViewer} />
      </div>
    </div>
  );
}
