"use client";
// Screen state kept in the query string, so every view can be pasted into an incident channel.
// Written with history.replaceState, which Next's router follows (useSearchParams sees it) without
// asking the server for the page again: a sort, a filter or a page turn costs one API request.
import { usePathname, useSearchParams } from "next/navigation";
import { useCallback } from "react";

export function useUrlState() {
  const pathname = usePathname();
  const params = useSearchParams();
  const get = useCallback((name: string): string | null => params.get(name), [params]);
  const set = useCallback(
    (changes: Record<string, string | null | undefined>) => {
      // The live URL, not the render's params: two changes in one event both land.
      const next = new URLSearchParams(window.location.search);
      for (const [k, v] of Object.entries(changes)) {
        if (v === null || v === undefined || v === "") next.delete(k);
        else next.set(k, v);
      }
      const qs = next.toString().replace(/%2C/g, ",");
      window.history.replaceState(null, "", qs ? `${pathname}?${qs}` : pathname);
    },
    [pathname],
  );
  return { get, set, params };
}
