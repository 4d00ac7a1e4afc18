"use client";
// Reviews of one environment by component key, for screens that put a ReviewBadge beside components.
import { useMemo } from "react";
import { reviewsResponseSchema, type ReviewSummary } from "@/lib/api/schemas/reviews";
import { useApi } from "@/lib/client/api";

export function useReviews(env: string) {
  const res = useApi(reviewsResponseSchema, `/api/v1/environments/${env}/reviews`, { refreshInterval: 60_000 });
  // Memoised so that screens can list it as a dependency without recomputing on every render.
  const byKey = useMemo(() => {
    const out: Record<string, ReviewSummary> = {};
    for (const r of res.data?.items ?? []) out[r.key] = { status: r.status, reviewBy: r.reviewBy, overdue: r.overdue };
    return out;
  }, [res.data]);
  return { byKey, items: res.data?.items, error: res.error, isLoading: res.isLoading, mutate: res.mutate };
}
