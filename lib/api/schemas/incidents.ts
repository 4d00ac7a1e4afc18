// Requests of the alert webhook and the incident screens (lib/data/incidents.ts).
import { z } from "zod";
import { ALERT_FORMATS, alertmanagerWebhookSchema, pinchpointAlertsSchema } from "@/lib/incidents/payload";
import { slugSchema } from "./common";

/** `?format=` names the body's format; without it the body says (lib/incidents/payload.ts). */
export const alertsQuerySchema = z.object({ format: z.enum(ALERT_FORMATS, { error: "pinchpoint or alertmanager" }).optional() }).strict();

/** Either body the webhook takes, for the OpenAPI document. */
export const alertsBodySchema = z.union([pinchpointAlertsSchema, alertmanagerWebhookSchema]);

export const incidentParamsSchema = z.object({ env: slugSchema, number: z.coerce.number().int().min(1).max(2_147_483_647) });

export const resolveIncidentSchema = z
  .object({ reason: z.string().trim().min(1, "say why it is over (e.g. the sender never sends resolved alerts)").max(500, "at most 500 characters") })
  .strict();
