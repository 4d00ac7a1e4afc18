// What an environment's alert webhook accepts, and the one shape both formats become.
//
// 1. Pinchpoint alerts, version 1 — a small JSON for scripts and monitors that can post their own body:
//      { "pinchpoint": "alerts/1",                  (optional marker)
//        "alerts": [ { "component": "orders-db",     key or alias, required
//                      "status": "firing",           firing (default) | resolved
//                      "severity": "critical",       free text, e.g. critical | warning | info
//                      "startsAt": "2026-12-03T09:14:00Z",  RFC 3339; default: when received
//                      "endsAt": "…",                resolved alerts: when; default: when received
//                      "link": "https://…",          where the alert is explained
//                      "id": "orders-db/latency",    identity; default: the component
//                      "summary": "p95 above 2 s" } ] }
//    Unknown fields are errors, as in inventory format 1.
// 2. The webhook body the Prometheus Alertmanager sends (its docs/configuration.md, <webhook_config>:
//    version "4", groupKey, truncatedAlerts, status, receiver, groupLabels, commonLabels,
//    commonAnnotations, externalURL, alerts[] of status, labels, annotations, startsAt, endsAt,
//    generatorURL, fingerprint). Fields it may add later are ignored, not refused.
//
// An alert's identity is its fingerprint: Alertmanager's own, or a hash of its labels when the
// sender is older than the field; for Pinchpoint alerts the `id`, else the component.
import { createHash } from "node:crypto";
import { z } from "zod";
import { AppError, zodIssues } from "@/lib/errors";

export const ALERT_FORMATS = ["pinchpoint", "alertmanager"] as const;
export type AlertFormat = (typeof ALERT_FORMATS)[number];

/** Most alerts one request may carry (an Alertmanager group with max_alerts 0 sends all of them). */
const MAX_ALERTS_PER_REQUEST = 5000;

const rfc3339 = z.iso.datetime({ offset: true, error: "an RFC 3339 date-time with a time zone, e.g. 2026-12-03T09:14:00Z" });
const httpUrl = z.url({ protocol: /^https?$/, error: "an http(s) URL" }).max(2000, "at most 2,000 characters");

const pinchpointAlertSchema = z.strictObject({
  component: z.string().trim().min(1, "name the component (its key or an alias)").max(200, "at most 200 characters"),
  status: z.enum(["firing", "resolved"]).default("firing"),
  severity: z.string().trim().min(1).max(40, "at most 40 characters").optional(),
  startsAt: rfc3339.optional(),
  endsAt: rfc3339.optional(),
  link: httpUrl.optional(),
  id: z.string().trim().min(1).max(200, "at most 200 characters").optional(),
  summary: z.string().max(1000, "at most 1,000 characters").optional(),
});

export const pinchpointAlertsSchema = z.strictObject({
  pinchpoint: z.literal("alerts/1", { error: 'the marker is "alerts/1"' }).optional(),
  alerts: z.array(pinchpointAlertSchema).max(MAX_ALERTS_PER_REQUEST, `at most ${MAX_ALERTS_PER_REQUEST} alerts a request`),
});

const labelSet = z.record(z.string(), z.string({ error: "label values are strings" }));

const alertmanagerAlertSchema = z.looseObject({
  status: z.enum(["firing", "resolved"]),
  labels: labelSet,
  annotations: labelSet.optional(),
  startsAt: rfc3339,
  endsAt: rfc3339.optional(),
  generatorURL: z.string().max(2000).optional(),
  fingerprint: z.string().min(1).max(200).optional(),
});

export const alertmanagerWebhookSchema = z.looseObject({
  version: z.string(),
  groupKey: z.string().optional(),
  truncatedAlerts: z.int().min(0).optional(),
  status: z.enum(["firing", "resolved"]).optional(),
  receiver: z.string().optional(),
  groupLabels: labelSet.optional(),
  commonLabels: labelSet.optional(),
  commonAnnotations: labelSet.optional(),
  externalURL: z.string().optional(),
  alerts: z.array(alertmanagerAlertSchema).max(MAX_ALERTS_PER_REQUEST, `at most ${MAX_ALERTS_PER_REQUEST} alerts a request`),
});

/** One alert, whichever format it came in. */
export interface ReceivedAlert {
  fingerprint: string;
  format: AlertFormat;
  status: "firing" | "resolved";
  /** Alertmanager's `alertname`, or the Pinchpoint alert's id when one was given. */
  name: string | null;
  /** The component a Pinchpoint alert names; null for Alertmanager (its labels name it). */
  component: string | null;
  labels: Record<string, string>;
  severity: string | null;
  summary: string | null;
  link: string | null;
  /** null: the sender did not say (the receiver uses the time it arrived). */
  startsAt: Date | null;
  endsAt: Date | null;
}

export interface ParsedAlerts {
  format: AlertFormat;
  alerts: ReceivedAlert[];
  /** Alerts the sender left out (Alertmanager's max_alerts): said in the response, never hidden. */
  truncated: number;
}

/**
 * Go's zero time, which Alertmanager writes for "no end yet" (0001-01-01T00:00:00Z): not a time.
 * Anything before 1970 is treated the same way.
 */
function time(value: string | undefined): Date | null {
  if (value === undefined) return null;
  const t = Date.parse(value);
  return Number.isFinite(t) && t > 0 ? new Date(t) : null;
}

/** Alertmanager's body has `version` and `receiver` or `groupKey`; anything else is read as ours. */
export function detectAlertFormat(body: unknown): AlertFormat {
  if (typeof body === "object" && body !== null && "version" in body && ("receiver" in body || "groupKey" in body)) return "alertmanager";
  return "pinchpoint";
}

function labelsFingerprint(labels: Record<string, string>): string {
  const canonical = JSON.stringify(Object.keys(labels).sort().map((k) => [k, labels[k]]));
  return createHash("sha256").update(canonical).digest("hex").slice(0, 16);
}

/** Parse a webhook body in either format; a body that fails is a 422 naming every problem's path. */
export function parseAlertPayload(body: unknown, format: AlertFormat = detectAlertFormat(body)): ParsedAlerts {
  if (format === "alertmanager") {
    const result = alertmanagerWebhookSchema.safeParse(body);
    if (!result.success) throw new AppError("invalid_request", "Invalid Alertmanager webhook body", zodIssues(result.error));
    return {
      format,
      truncated: result.data.truncatedAlerts ?? 0,
      alerts: result.data.alerts.map((a) => {
        const annotations = a.annotations ?? {};
        return {
          fingerprint: `am:${a.fingerprint ?? labelsFingerprint(a.labels)}`,
          format,
          status: a.status,
          name: a.labels.alertname || null,
          component: null,
          labels: a.labels,
          severity: a.labels.severity ? a.labels.severity.slice(0, 40) : null,
          summary: annotations.summary || annotations.description || null,
          link: a.generatorURL || null,
          startsAt: time(a.startsAt),
          endsAt: time(a.endsAt),
        };
      }),
    };
  }
  const result = pinchpointAlertsSchema.safeParse(body);
  if (!result.success) throw new AppError("invalid_request", "Invalid alerts body (Pinchpoint alerts, version 1)", zodIssues(result.error));
  return {
    format,
    truncated: 0,
    alerts: result.data.alerts.map((a) => ({
      fingerprint: `pp:${a.id ?? a.component.toLowerCase()}`,
      format,
      status: a.status,
      name: a.id ?? null,
      component: a.component,
      labels: {},
      severity: a.severity ?? null,
      summary: a.summary ?? null,
      link: a.link ?? null,
      startsAt: time(a.startsAt),
      endsAt: time(a.endsAt),
    })),
  };
}
