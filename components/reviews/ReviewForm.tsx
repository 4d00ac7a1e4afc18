"use client";
// Set or change the review of one component: status, why, and when to look again.
import { useEffect, useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { FormError, Label, Select, TextArea, TextInput } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson } from "@/lib/client/fetcher";
import type { ReviewView } from "@/lib/data/reviews";
import { REVIEW_STATUS_LABELS } from "./ReviewBadge";

type Status = ReviewView["status"];
interface RankingsSlice {
  items: Array<{ key: string; name: string; pinchScore: number }>;
}

export interface ReviewDraft {
  key: string;
  status: Status;
  rationale: string;
  reviewBy: string;
}

const addDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

export function ReviewForm({ env, draft, onSaved }: { env: string; draft: ReviewDraft | null; onSaved: (key: string) => void }) {
  const [key, setKey] = useState("");
  const [status, setStatus] = useState<Status>("accepted");
  const [rationale, setRationale] = useState("");
  const [reviewBy, setReviewBy] = useState(addDays(90));
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // The components most worth a decision: the top of the list by pinch score.
  const top = useSWR<RankingsSlice>(`/api/v1/environments/${env}/rankings?sort=pinchScore&order=desc&limit=30`, fetchJson);

  useEffect(() => {
    if (!draft) return;
    setKey(draft.key);
    setStatus(draft.status);
    setRationale(draft.rationale);
    setReviewBy(draft.reviewBy || addDays(90));
  }, [draft]);

  const needsDate = status !== "resolved";

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    const body = { status, rationale, ...(needsDate ? { reviewBy } : {}) };
    const res = await sendJson(`/api/v1/environments/${env}/reviews/${encodeURIComponent(key.trim())}`, "PUT", body);
    setBusy(false);
    if (!res.ok) return setError(res.status === 404 ? `No component "${key.trim()}" in ${env}` : res.message);
    setError(null);
    setRationale("");
    onSaved(key.trim());
    setKey("");
  }

  return (
    <form onSubmit={submit} className="grid gap-3 md:grid-cols-6" aria-label="Review a pinch point">
      <div className="md:col-span-2">
        <Label htmlFor="review-key" hint="type a key or pick from the top by pinch score">
          Component
        </Label>
        <TextInput id="review-key" list="review-top" value={key} onChange={(e) => setKey(e.target.value)} required className="font-mono" autoComplete="off" />
        <datalist id="review-top">
          {top.data?.items.map((i) => (
            <option key={i.key} value={i.key}>
              {`${i.name} · score ${i.pinchScore.toFixed(1)}`}
            </option>
          ))}
        </datalist>
      </div>
      <div>
        <Label htmlFor="review-status">Decision</Label>
        <Select id="review-status" value={status} onChange={(e) => setStatus(e.target.value as Status)}>
          {(Object.keys(REVIEW_STATUS_LABELS) as Status[]).map((s) => (
            <option key={s} value={s}>
              {REVIEW_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
      </div>
      <div>
        <Label htmlFor="review-by" hint={needsDate ? "required" : "not needed once resolved"}>
          Look again by
        </Label>
        <TextInput id="review-by" type="date" value={needsDate ? reviewBy : ""} min={addDays(0)} max={addDays(730)} onChange={(e) => setReviewBy(e.target.value)} disabled={!needsDate} required={needsDate} />
      </div>
      <div className="md:col-span-6">
        <Label htmlFor="review-rationale" hint="required: what was decided and why">
          Rationale
        </Label>
        <TextArea id="review-rationale" rows={2} value={rationale} onChange={(e) => setRationale(e.target.value)} required maxLength={5000} />
      </div>
      <div className="flex items-center gap-3 md:col-span-6">
        <Button type="submit" variant="primary" disabled={busy}>
          Save review
        </Button>
        <span className="text-xs text-muted">Recorded in the audit log under your name. Production changes still follow your own change process.</span>
      </div>
      <div className="md:col-span-6">
        <FormError id="review-error" message={error} />
      </div>
    </form>
  );
}
