// Shapes of the incident API's responses (lib/data/incidents.ts builds them; the screens read them).
import type { OriginResult } from "@/lib/analysis/origin";
import type { AlertFormat } from "./payload";
import type { PageEntry, UnknownAlertGroup } from "./view";

export interface IncidentAlert {
  id: string;
  fingerprint: string;
  format: AlertFormat;
  name: string | null;
  severity: string | null;
  summary: string | null;
  link: string | null;
  startsAt: string;
  /** null while firing. */
  endsAt: string | null;
  lastReceivedAt: string;
  /** The component key it resolved to under the current inventory and label setting; null: unknown. */
  component: string | null;
  /** What the alert called it (a Pinchpoint component, or the label that named it). */
  named: { label: string | null; value: string } | null;
}

interface IncidentSnapshotRef {
  number: number;
  createdAt: string;
}

/** A stored origin ranking, small enough to keep one per incident (history). */
export interface StoredRanking {
  computedAt: string;
  snapshot: IncidentSnapshotRef | null;
  firing: string[];
  alerts: number;
  unknownAlerts: UnknownAlertGroup[];
  origins: Array<{ key: string; explains: number; degraded: number; newlyExplained: number }>;
  explainedCount: number;
  jointly: OriginResult["jointly"];
  unexplained: string[];
  silent: Array<{ kind: "component" | "zone"; key: string; explains: number }>;
  pagerank: Array<{ key: string; score: number; usual: number; firing: boolean }>;
  ranking: Array<{ key: string; explains: number }>;
  predicted: { down: number; degraded: number; firstDown: string[] };
}

export interface IncidentRow {
  number: number;
  status: "open" | "resolved";
  openedAt: string;
  resolvedAt: string | null;
  resolvedBy: string | null;
  peakFiring: number;
  alertCount: number;
  firingAlerts: number;
  /** The ranking when the most components fired (history), else the latest. */
  ranking: StoredRanking | null;
}

/** Every screen polls the current incident: predicted failures on a large estate are cut to this many. */
export const PREDICTED_LIST_CAP = 500;

export interface CurrentIncidentResponse {
  environment: string;
  incident: IncidentRow | null;
  snapshot: (IncidentSnapshotRef & { ageSeconds: number }) | null;
  firingAlerts: IncidentAlert[];
  /** Alerts of the open incident that have resolved already, newest first. */
  resolvedAlerts: IncidentAlert[];
  /** The origin result; lists of predicted failures are cut at PREDICTED_LIST_CAP (most critical first), see predictedTotal. */
  result: OriginResult;
  /** How many components the origins' failure takes down or degrades beyond what fires, uncut. */
  predictedTotal: { down: number; degraded: number };
  unknownAlerts: UnknownAlertGroup[];
  page: PageEntry[];
  summary: string;
  caution: string;
  computedAt: string;
}

export interface IncidentDetailResponse {
  environment: string;
  incident: IncidentRow;
  alerts: IncidentAlert[];
  caution: string;
}

export interface IncidentHistoryResponse {
  environment: string;
  items: IncidentRow[];
  total: number;
  /**
   * Components that were the first probable origin of an incident, with how often, beside their
   * current pinch-point rank — next to the top of the ranking, whether or not they ever caused one.
   */
  causes: Array<{ key: string; incidents: number; lastAt: string; pinchRank: number | null; pinchScore: number | null }>;
  predicted: Array<{ key: string; pinchRank: number; pinchScore: number; incidents: number }>;
}

export interface ReceiveAlertsResponse {
  format: AlertFormat;
  received: number;
  /** Alerts that started firing with this request. */
  opened: number;
  /** Firing alerts already known (repeat notifications). */
  repeated: number;
  resolved: number;
  /** Resolved alerts this environment never saw firing. */
  unmatched: number;
  /** Firing notifications for an alert already resolved with the same start (late deliveries). */
  late: number;
  /** Alerts the sender left out (Alertmanager max_alerts). */
  truncated: number;
  /** Alerts of this request that name no known component: kept and listed on the incident screen. */
  unknown: UnknownAlertGroup[];
  incident: { number: number; status: "open" | "resolved"; firingAlerts: number; url: string } | null;
}
