"use client";
// Reviews of one environment by component key, for screens that put a ReviewBadge beside components.
import { useMemo } from "react";
import useSWR from "swr";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { ReviewSummary, ReviewView } from "@/lib/data/reviews";

export function useReviews(env: string) {
  const res = useSWR<{ items: ReviewView[] }, ApiError>(`/api/v1/environments/${env}/reviews`, fetchJson, { refreshInterval: 60_000 });
  // Memoised so that screens can list it as a dependency without recomputing on every render.
  const byKey = useMemo(() => {
    const out: Record<string, ReviewSummary> = {};
    for (const r of res.data?.items ?? []) out[r.key] = { status: r.status, reviewBy: r.reviewBy, overdue: r.overdue };
    return out;
  }, [res.data]);
  return { byKey, items: res.data?.items ?? [], error: res.error, isLoading: res.isLoading, mutate: res.mutate };
}
