"use client";
// A chip saying what an architect decided about a component and when to look at it again.
// Placed beside components on other screens; pass the review from `useReviews(env)` or from
// `reviewsByKey` on the server. Renders nothing for a component with no review.
import { day } from "@/components/ui/format";
import type { ReviewSummary } from "@/lib/api/schemas/reviews";

export const REVIEW_STATUS_LABELS: Record<ReviewSummary["status"], string> = {
  accepted: "Risk accepted",
  mitigating: "Mitigating",
  resolved: "Resolved",
};

const TONE: Record<ReviewSummary["status"], string> = {
  accepted: "border-info/50 text-info",
  mitigating: "border-degraded/50 text-degraded",
  resolved: "border-ok/50 text-ok",
};

export function ReviewBadge({ review, compact = false }: { review: ReviewSummary | null | undefined; compact?: boolean }) {
  if (!review) return null;
  const label = REVIEW_STATUS_LABELS[review.status];
  const when = review.reviewBy ? day(review.reviewBy) : null;
  const detail = review.overdue ? `look again was due ${when}` : when && review.status !== "resolved" ? `look again by ${when}` : null;
  const title = detail ? `${label}: ${detail}` : label;
  return (
    <span
      data-testid="review-badge"
      data-status={review.status}
      data-overdue={review.overdue ? "true" : "false"}
      title={title}
      className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${
        review.overdue ? "border-down bg-down/15 text-down" : TONE[review.status]
      }`}
    >
      {review.overdue && <span aria-hidden>!</span>}
      {label}
      {!compact && detail && <span className="font-normal text-muted">· {review.overdue ? `overdue since ${when}` : `by ${when}`}</span>}
      {compact && review.overdue && <span className="sr-only">, overdue</span>}
    </span>
  );
}
