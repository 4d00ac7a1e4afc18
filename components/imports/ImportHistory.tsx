"use client";

import Link from "next/link";
import { dateTime } from "@/components/ui/format";
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";

export interface ImportRow {
  id: string;
  createdAt: string;
  source: string;
  format: string;
  actor: string;
  changed: boolean;
  snapshot: number | null;
  summary: Partial<Record<"componentsAdded" | "componentsRemoved" | "componentsChanged" | "dependenciesAdded" | "dependenciesRemoved" | "components" | "dependencies" | "observedEdges", number>> | null;
  warnings: unknown[] | null;
}

export const HISTORY_PAGE_SIZE = 20;

export const historyKey = (env: string, offset: number) => `/api/v1/environments/${env}/imports?limit=${HISTORY_PAGE_SIZE}&offset=${offset}`;

const when = (iso: string) => dateTime(iso, { seconds: true });

function Counts({ s }: { s: NonNullable<ImportRow["summary"]> }) {
  const parts: [string, number | undefined, string][] = [
    ["+", s.componentsAdded, "text-ok"],
    ["−", s.componentsRemoved, "text-down"],
    ["~", s.componentsChanged, "text-degraded"],
  ];
  const deps = (s.dependenciesAdded ?? 0) + (s.dependenciesRemoved ?? 0);
  return (
    <span className="font-mono text-xs">
      {parts.map(([sign, n, cls]) => (n ? <span key={sign} className={`mr-2 ${cls}`}>{sign}{n}</span> : null))}
      {deps > 0 && <span className="text-muted">{deps} dependency changes</span>}
      {s.observedEdges ? <span className="text-muted">{s.observedEdges} observed edges</span> : null}
    </span>
  );
}

export function ImportHistory({ env }: { env: string }) {
  const [offset, setOffset] = useState(0);
  const history = useSWR<{ total: number; items: ImportRow[] }, ApiError>(historyKey(env, offset), fetchJson, { keepPreviousData: true });
  const total = history.data?.total ?? 0;
  const items = history.data?.items ?? [];
  return (
    <Card
      title="Import history"
      action={
        total > 0 && (
          <span className="text-xs text-muted" data-testid="history-range">
            {offset + 1}–{Math.min(offset + HISTORY_PAGE_SIZE, total)} of {total}
          </span>
        )
      }
    >
      {history.error?.status === 404 ? (
        <p className="text-sm text-muted">
          Nothing has been pushed to <span className="font-mono text-ink">{env}</span> yet, so there is no history.
        </p>
      ) : history.error ? (
        <p role="alert" className="text-sm text-down">Could not load the history: {history.error.message}</p>
      ) : history.isLoading ? (
        <p className="text-sm text-muted">Loading…</p>
      ) : items.length === 0 ? (
        <p className="text-sm text-muted">No imports yet.</p>
      ) : (
        <>
          <p className="mb-3 text-xs text-muted">Accepted pushes and uploads, newest first. Rejected files write nothing, so they are not listed.</p>
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="text-xs uppercase tracking-wide text-faint">
                <tr>
                  <th className="py-2 pr-4 font-medium">When</th>
                  <th className="py-2 pr-4 font-medium">Who</th>
                  <th className="py-2 pr-4 font-medium">Source</th>
                  <th className="py-2 pr-4 font-medium">Format</th>
                  <th className="py-2 pr-4 font-medium">Result</th>
                  <th className="py-2 pr-4 font-medium">Changes</th>
                </tr>
              </thead>
              <tbody>
                {items.map((row) => (
                  <tr key={row.id} className="border-t border-line" data-testid="history-row">
                    <td className="py-2 pr-4 whitespace-nowrap">{when(row.createdAt)}</td>
                    <td className="py-2 pr-4">{row.actor}</td>
                    <td className="py-2 pr-4 font-mono">{row.source}</td>
                    <td className="py-2 pr-4">{row.format}</td>
                    <td className="py-2 pr-4 whitespace-nowrap">
                      {row.changed && row.snapshot !== null ? (
                        <Link href={`/environments/${env}/history?snapshot=${row.snapshot}`} className="text-brass underline underline-offset-4">
                          snapshot #{row.snapshot}
                        </Link>
                      ) : (
                        <span className="text-muted">no change</span>
                      )}
                      {row.warnings && row.warnings.length > 0 && <span className="ml-2 text-xs text-degraded">{row.warnings.length} warning{row.warnings.length === 1 ? "" : "s"}</span>}
                    </td>
                    <td className="py-2 pr-4">{row.summary && <Counts s={row.summary} />}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {total > HISTORY_PAGE_SIZE && (
            <div className="mt-3 flex items-center gap-2">
              <Button type="button" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - HISTORY_PAGE_SIZE))}>
                Newer
              </Button>
              <Button type="button" disabled={offset + HISTORY_PAGE_SIZE >= total} onClick={() => setOffset(offset + HISTORY_PAGE_SIZE)}>
                Older
              </Button>
            </div>
          )}
        </>
      )}
    </Card>
  );
}
