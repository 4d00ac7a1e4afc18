// The alert webhook and the incident screens (lib/data/incidents.ts): requests and answers.
import { z } from "zod";
import { ALERT_FORMATS, alertmanagerWebhookSchema, pinchpointAlertsSchema } from "@/lib/incidents/payload";
import { PAGE_REASONS } from "@/lib/incidents/view";
import { teamContactSchema } from "./analysis";
import { defineList, instantSchema, listQuery, pageOf, slugSchema } from "./common";

/** `?format=` names the body's format; without it the body says (lib/incidents/payload.ts). */
export const alertsQuerySchema = z.object({ format: z.enum(ALERT_FORMATS, { error: "pinchpoint or alertmanager" }).optional() }).strict();

/** Either body the webhook takes, for the OpenAPI document. */
export const alertsBodySchema = z.union([pinchpointAlertsSchema, alertmanagerWebhookSchema]);

export const INCIDENT_LIST = defineList({
  sorts: { number: "desc", peakFiring: "desc", alertCount: "desc" },
  defaultSort: "number",
  defaultLimit: 20,
  maxLimit: 500,
});
export const incidentsQuerySchema = listQuery(INCIDENT_LIST)
  .extend({ status: z.enum(["open", "resolved"]).optional() })
  .strict();
export type IncidentsQuery = z.infer<typeof incidentsQuerySchema>;

export const incidentParamsSchema = z.object({ env: slugSchema, number: z.coerce.number().int().min(1).max(2_147_483_647) });

export const resolveIncidentSchema = z
  .object({ reason: z.string().trim().min(1, "say why it is over (e.g. the sender never sends resolved alerts)").max(500, "at most 500 characters") })
  .strict();

// ---------------------------------------------------------------------------------------------
// Responses (lib/incidents/types.ts describes what lib/data/incidents.ts builds; these say what is sent)

const unknownAlertGroupSchema = z.object({ value: z.string().nullable(), label: z.string().nullable(), alerts: z.int() });

const incidentAlertSchema = z.object({
  id: z.string(),
  fingerprint: z.string(),
  format: z.enum(ALERT_FORMATS),
  name: z.string().nullable(),
  severity: z.string().nullable(),
  summary: z.string().nullable(),
  link: z.string().nullable(),
  startsAt: instantSchema,
  /** null while firing */
  endsAt: instantSchema.nullable(),
  lastReceivedAt: instantSchema,
  /** the component it resolved to under the current inventory and label setting; null: unknown */
  component: z.string().nullable(),
  named: z.object({ label: z.string().nullable(), value: z.string() }).nullable(),
});
export type IncidentAlert = z.infer<typeof incidentAlertSchema>;

const snapshotRefSchema = z.object({ number: z.int(), createdAt: instantSchema });

const storedRankingSchema = z.object({
  computedAt: instantSchema,
  snapshot: snapshotRefSchema.nullable(),
  firing: z.array(z.string()),
  alerts: z.int(),
  unknownAlerts: z.array(unknownAlertGroupSchema),
  origins: z.array(z.object({ key: z.string(), explains: z.int(), degraded: z.int(), newlyExplained: z.int() })),
  explainedCount: z.int(),
  jointly: z.array(z.object({ key: z.string(), by: z.array(z.string()) })),
  unexplained: z.array(z.string()),
  silent: z.array(z.object({ kind: z.enum(["component", "zone"]), key: z.string(), explains: z.int() })),
  pagerank: z.array(z.object({ key: z.string(), score: z.number(), usual: z.number(), firing: z.boolean() })),
  ranking: z.array(z.object({ key: z.string(), explains: z.int() })),
  predicted: z.object({ down: z.int(), degraded: z.int(), firstDown: z.array(z.string()) }),
});

const incidentRowSchema = z.object({
  number: z.int(),
  status: z.enum(["open", "resolved"]),
  openedAt: instantSchema,
  resolvedAt: instantSchema.nullable(),
  resolvedBy: z.string().nullable(),
  peakFiring: z.int(),
  alertCount: z.int(),
  firingAlerts: z.int(),
  /** the ranking when the most components fired (history), else the latest */
  ranking: storedRankingSchema.nullable(),
});
export type IncidentRow = z.infer<typeof incidentRowSchema>;

const explanation = { explains: z.array(z.string()), degraded: z.array(z.string()) };

/** The probable-origin result (lib/analysis/origin.ts). */
const originResultSchema = z.object({
  firing: z.array(z.string()),
  unknown: z.array(z.string()),
  origins: z.array(z.object({ ...explanation, key: z.string(), newlyExplained: z.array(z.string()), predicted: z.object({ down: z.array(z.string()), degraded: z.array(z.string()) }) })),
  explainedCount: z.int(),
  jointly: z.array(z.object({ key: z.string(), by: z.array(z.string()) })),
  unexplained: z.array(z.string()),
  ranking: z.array(z.object({ key: z.string(), explains: z.int(), degraded: z.int(), reach: z.number() })),
  silent: z.array(z.object({ ...explanation, kind: z.enum(["component", "zone"]), key: z.string(), predicted: z.object({ down: z.int(), degraded: z.int() }) })),
  pagerank: z.array(z.object({ key: z.string(), score: z.number(), usual: z.number(), firing: z.boolean() })),
  predicted: z.object({ down: z.array(z.string()), degraded: z.array(z.string()) }),
});

const pageEntrySchema = z.object({
  /** null: components nobody owns */
  team: z.string().nullable(),
  contact: teamContactSchema.nullable(),
  reasons: z.array(z.enum(PAGE_REASONS)),
  origin: z.array(z.string()),
  silent: z.array(z.string()),
  firing: z.array(z.string()),
  predicted: z.array(z.string()),
});
export type PageEntry = z.infer<typeof pageEntrySchema>;

/** GET …/incidents/current. */
export const currentIncidentResponseSchema = z.object({
  environment: z.string(),
  incident: incidentRowSchema.nullable(),
  snapshot: snapshotRefSchema.extend({ ageSeconds: z.number() }).nullable(),
  firingAlerts: z.array(incidentAlertSchema),
  resolvedAlerts: z.array(incidentAlertSchema),
  result: originResultSchema,
  predictedTotal: z.object({ down: z.int(), degraded: z.int() }),
  unknownAlerts: z.array(unknownAlertGroupSchema),
  page: z.array(pageEntrySchema),
  summary: z.string(),
  caution: z.string(),
  computedAt: instantSchema,
});

/** GET …/incidents/{number}. */
export const incidentDetailResponseSchema = z.object({ environment: z.string(), incident: incidentRowSchema, alerts: z.array(incidentAlertSchema), caution: z.string() });

/** GET …/incidents: a page of incidents, what caused them, and the top of the ranking beside them. */
export const incidentHistoryResponseSchema = pageOf(incidentRowSchema).extend({
  environment: z.string(),
  causes: z.array(z.object({ key: z.string(), incidents: z.int(), lastAt: instantSchema, pinchRank: z.int().nullable(), pinchScore: z.number().nullable() })),
  predicted: z.array(z.object({ key: z.string(), pinchRank: z.int(), pinchScore: z.number(), incidents: z.int() })),
});

/** POST …/alerts. */
export const receiveAlertsResponseSchema = z.object({
  format: z.enum(ALERT_FORMATS),
  received: z.int(),
  opened: z.int(),
  repeated: z.int(),
  resolved: z.int(),
  unmatched: z.int(),
  late: z.int(),
  truncated: z.int(),
  unknown: z.array(unknownAlertGroupSchema),
  incident: z.object({ number: z.int(), status: z.enum(["open", "resolved"]), firingAlerts: z.int(), url: z.string() }).nullable(),
});

/** POST …/incidents/{number}/resolve. */
export const resolvedIncidentSchema = z.object({ incident: incidentRowSchema });
