"use client";
// The overview's banner while alerts fire: which incident, since when, the probable origin as last
// ranked, and the way to the live screen. Reads the light history endpoint (no origin computation).
import Link from "next/link";
import { plural } from "@/components/ui/format";
import { When } from "@/components/ui/When";
import { incidentHistoryResponseSchema } from "@/lib/api/schemas/incidents";
import { useApi } from "@/lib/client/api";

export function IncidentBanner({ env }: { env: string }) {
  const latest = useApi(incidentHistoryResponseSchema, `/api/v1/environments/${env}/incidents?limit=1`, { refreshInterval: 15_000 });
  const open = latest.data?.items[0]?.status === "open" ? latest.data.items[0] : null;
  if (!open) return null;
  const origin = open.ranking?.origins[0];
  return (
    <div role="alert" className="flex flex-wrap items-center gap-x-3 gap-y-1 rounded-md border border-down/60 bg-down/10 px-4 py-3 text-sm" data-testid="incident-banner">
      <span className="font-semibold text-down">Incident #{open.number} open</span>
      <span className="text-ink">
        since <When at={open.openedAt} /> · {plural(open.firingAlerts, "alert")} firing
        {origin ? (
          <>
            {" "}
            · probable origin <span className="font-mono">{origin.key}</span> (explains {origin.explains} of {open.ranking?.firing.length ?? 0}; a probability, not a diagnosis)
          </>
        ) : null}
      </span>
      <Link href={`/environments/${env}/incidents`} className="ml-auto font-semibold text-brass hover:underline">
        Open the incident screen
      </Link>
    </div>
  );
}
