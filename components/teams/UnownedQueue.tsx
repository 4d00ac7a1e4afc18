"use client";
// Components nobody owns, most pinching first. A lead claims one for a team they lead; an
// architect or admin assigns any team. The server (annotateComponent) enforces the same rule;
// the controls are shown only to those it would accept.
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { FormError, Select } from "@/components/ui/Field";
import { sendJson } from "@/components/ui/send-json";
import { fetchJson, type ApiError } from "@/lib/client/fetcher";
import type { UnownedComponent } from "@/lib/data/team-admin";

export interface QueueViewer {
  /** slugs of the teams the viewer leads */
  ledTeams: string[];
  /** architects and admins may assign any team */
  assignAny: boolean;
  /** every team slug and name, for the assign choice */
  teams: Array<{ slug: string; name: string }>;
}

function Row({ item, viewer, onDone }: { item: UnownedComponent; viewer: QueueViewer; onDone: () => void }) {
  const choices = viewer.assignAny ? viewer.teams : viewer.teams.filter((t) => viewer.ledTeams.includes(t.slug));
  // Architects pick deliberately (no preselected team to assign by accident); a lead of one team has one choice.
  const [team, setTeam] = useState(viewer.assignAny || choices.length > 1 ? "" : (choices[0]?.slug ?? ""));
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const id = `${item.environment}-${item.key}`;

  async function save() {
    setBusy(true);
    setError(null);
    const res = await sendJson(`/api/v1/environments/${item.environment}/components/${item.key}`, "PATCH", { team });
    setBusy(false);
    if (!res.ok) setError(res.message);
    else onDone();
  }

  return (
    <tr className="border-t border-line align-top" data-testid={`unowned-${id}`}>
      <td className="py-2 pr-3 font-mono text-xs text-muted">{item.environment}</td>
      <td className="py-2 pr-3">
        <Link href={`/environments/${item.environment}/components/${item.key}`} className="font-mono text-sm text-ink hover:text-brass">
          {item.key}
        </Link>
        <div className="text-xs text-muted">
          {item.name} · {item.kind} · tier {item.tier}
        </div>
      </td>
      <td className="py-2 pr-3 text-right font-mono text-sm tabular-nums">
        {item.pinchScore === null ? <span className="text-faint">—</span> : item.pinchScore.toFixed(1)}
        {item.pinchPoint && <div className="text-xs text-down">top {item.pinchRank}</div>}
      </td>
      <td className="py-2">
        {choices.length > 0 ? (
          <div className="flex flex-wrap items-center gap-2">
            {choices.length === 1 && !viewer.assignAny ? (
              <span className="text-xs text-muted">for {choices[0]?.name}</span>
            ) : (
              <Select aria-label={`Team for ${item.key}`} value={team} onChange={(e) => setTeam(e.target.value)} className="w-auto min-w-40">
                <option value="">choose a team…</option>
                {choices.map((t) => (
                  <option key={t.slug} value={t.slug}>
                    {t.name}
                  </option>
                ))}
              </Select>
            )}
            <Button variant="primary" disabled={busy || !team} onClick={save} aria-label={`${viewer.assignAny ? "Assign" : "Claim"} ${item.key}`}>
              {viewer.assignAny ? "Assign" : "Claim"}
            </Button>
            {error && <div className="w-full"><FormError message={error} /></div>}
          </div>
        ) : (
          <span className="text-xs text-faint">a team lead or architect assigns an owner</span>
        )}
      </td>
    </tr>
  );
}

export function UnownedQueue({ environment, viewer }: { environment?: string; viewer: QueueViewer }) {
  const url = `/api/v1/teams/unowned${environment ? `?environment=${environment}` : ""}`;
  const { data, error, isLoading, mutate } = useSWR<{ items: UnownedComponent[] }, ApiError>(url, fetchJson);
  const items = data?.items ?? [];
  return (
    <Card
      title={
        <span>
          Unowned{environment ? <span className="font-mono text-muted"> · {environment}</span> : " · every environment"}
        </span>
      }
      action={data && <span className="font-mono text-xs text-muted" data-testid="unowned-count">{items.length} left</span>}
    >
      <p className="mb-3 text-xs text-muted">
        When one of these fails there is no team to page. Most pinching first; scores come from each environment&apos;s newest analysed snapshot.
      </p>
      {error && <FormError message={`Could not load the queue: ${error.message}`} />}
      {isLoading && <p className="text-sm text-muted">Loading…</p>}
      {data && items.length === 0 && <p className="text-sm text-ok">Every declared component has an owner.</p>}
      {items.length > 0 && (
        <div className="max-h-[28rem] overflow-y-auto">
          <table className="w-full text-left text-sm">
            <thead className="text-xs uppercase tracking-wide text-faint">
              <tr>
                <th className="pb-1 pr-3 font-medium">Env</th>
                <th className="pb-1 pr-3 font-medium">Component</th>
                <th className="pb-1 pr-3 text-right font-medium">Pinch score</th>
                <th className="pb-1 font-medium">Owner</th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <Row key={`${item.environment}/${item.key}`} item={item} viewer={viewer} onDone={() => void mutate()} />
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Card>
  );
}
