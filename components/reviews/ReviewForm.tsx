"use client";
// Set or change the review of one component: status, why, and when to look again. The same rules
// as PUT …/reviews/{key} (reviewFieldsSchema, checkReviewDates) are checked before sending.
import { useWatch } from "react-hook-form";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField, SelectInput, TextAreaField } from "@/components/ui/form/fields";
import { rankingsResponseSchema } from "@/lib/api/schemas/analysis";
import { keySchema } from "@/lib/api/schemas/common";
import { checkReviewDates, reviewFieldsSchema, reviewViewSchema, todayUtc, type ReviewView } from "@/lib/api/schemas/reviews";
import { sendJson, useApi } from "@/lib/client/api";
import { REVIEW_STATUSES } from "@/lib/review-status";
import { REVIEW_STATUS_LABELS } from "./ReviewBadge";

/** The review body and the component it is about (the key goes in the URL, not the body). */
const reviewFormSchema = reviewFieldsSchema.extend({ key: keySchema }).superRefine(checkReviewDates);

export interface ReviewDraft {
  key: string;
  status: ReviewView["status"];
  rationale: string;
  reviewBy: string | null;
}

const inDays = (days: number) => todayUtc(new Date(Date.now() + days * 86_400_000));

/** Mount it again (a new `key`) to start from another draft. */
export function ReviewForm({ env, draft, onSaved }: { env: string; draft: ReviewDraft | null; onSaved: (key: string) => void }) {
  // The components most worth a decision: the top of the list by pinch score.
  const top = useApi(rankingsResponseSchema, `/api/v1/environments/${env}/rankings?sort=pinchScore&order=desc&limit=30`);
  const form = useApiForm(reviewFormSchema, draft ? { ...draft, reviewBy: draft.reviewBy ?? (draft.status === "resolved" ? null : inDays(90)) } : { key: "", status: "accepted", rationale: "", reviewBy: inDays(90) });
  const status = useWatch({ control: form.control, name: "status" });
  const needsDate = status !== "resolved";
  const onSubmit = submitWith(
    form,
    ({ key, ...body }) => sendJson(reviewViewSchema, `/api/v1/environments/${env}/reviews/${encodeURIComponent(key)}`, "PUT", { ...body, reviewBy: needsDate ? body.reviewBy : null }),
    (_, { key }) => {
      form.reset({ key: "", status: "accepted", rationale: "", reviewBy: inDays(90) });
      onSaved(key);
    },
    (error) => (error.status === 404 ? `No component "${form.getValues("key")}" in ${env}` : null),
  );

  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Review a pinch point" className="grid gap-3 md:grid-cols-6">
      <InputField name="key" label="Component" hint="type a key or pick from the top by pinch score" list="review-top" autoComplete="off" className="md:col-span-2" controlClassName="font-mono" />
      <datalist id="review-top">
        {top.data?.items.map((i) => (
          <option key={i.key} value={i.key}>
            {`${i.name} · score ${i.pinchScore.toFixed(1)}`}
          </option>
        ))}
      </datalist>
      <SelectInput name="status" label="Decision" options={REVIEW_STATUSES.map((s) => ({ value: s, label: REVIEW_STATUS_LABELS[s] }))} />
      <InputField name="reviewBy" label="Look again by" hint={needsDate ? "required" : "not needed once resolved"} type="date" min={inDays(0)} max={inDays(730)} disabled={!needsDate} blank="null" />
      <TextAreaField name="rationale" label="Rationale" hint="required: what was decided and why" rows={2} maxLength={5000} className="md:col-span-6" />
      <div className="flex items-center gap-3 md:col-span-6">
        <SubmitButton working="Saving…">Save review</SubmitButton>
        <span className="text-xs text-muted">Recorded in the audit log under your name. Production changes still follow your own change process.</span>
      </div>
      <FormProblem className="md:col-span-6" />
    </ApiForm>
  );
}
