// The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the handlers parse
// with (z.toJSONSchema), so the document cannot drift from what the server accepts. Who may call
// each operation comes from the same rules the authorization-matrix test holds the handlers to.
import { z } from "zod";
import type { RouteRule } from "@/lib/auth/with-permission";
import { kubernetesJsonSchema } from "@/importers/kubernetes/schema";
import { inventoryJsonSchema } from "@/lib/inventory/schema";
import { annotateBodySchema, bootOrderQuerySchema, chainQuerySchema, drillBodySchema, rankHistoryQuerySchema, rankingsExportQuerySchema, rankingsQuerySchema } from "./schemas/analysis";
import { pageQuerySchema } from "./schemas/history";
import { componentsQuerySchema, pushQuerySchema } from "./schemas/inventory";
import { positionsSchema } from "./schemas/map";
import { reviewBodySchema, reviewsQuerySchema, auditQuerySchema } from "./schemas/reviews";
import { addMemberSchema, createTeamSchema, unownedQuerySchema, updateTeamSchema } from "./schemas/teams";
import { createEnvironmentSchema, deleteEnvironmentQuerySchema, renameEnvironmentSchema, settingsPatchSchema } from "./schemas/environments";
import { alertsBodySchema, alertsQuerySchema, resolveIncidentSchema } from "./schemas/incidents";
import { createTokenSchema } from "./schemas/tokens";
import { acceptInviteSchema, inviteUserSchema, updateUserSchema } from "./schemas/users";
import { pinchWeightsSchema } from "@/lib/analysis/types";
import { policySetSchema } from "@/lib/impact/policies";

type Method = "get" | "post" | "put" | "patch" | "delete";

interface Operation {
  summary: string;
  rule: RouteRule;
  query?: z.ZodType;
  body?: z.ZodType | "inventory" | "otlp";
}

/** Path (OpenAPI template) → method → operation. */
export const OPERATIONS: Record<string, Partial<Record<Method, Operation>>> = {
  "/environments": {
    get: { summary: "Environments with their latest snapshot and analysis status", rule: "read" },
    post: { summary: "Create an empty environment (409 if the slug exists); audited", rule: "admin", body: createEnvironmentSchema },
  },
  "/environments/{env}": {
    get: { summary: "One environment: counts, latest snapshot, analysis status", rule: "read" },
    patch: { summary: "Rename an environment (the slug never changes); audited", rule: "admin", body: renameEnvironmentSchema },
    delete: { summary: "Delete an environment and everything of it, bound tokens included; ?confirm=<slug> required; audited", rule: "admin", query: deleteEnvironmentQuerySchema },
  },
  "/environments/{env}/inventory": {
    post: { summary: "Push an inventory (YAML, JSON, Compose, CSV, Kubernetes manifests, or OTLP/JSON and JSON Lines traces streamed; a layered Compose project as a multipart body of its files); dry_run=true writes nothing; impact=true reports what the change does to the failure points and the change policies (impact_format=markdown answers text/markdown, sarif application/sarif+json; 200 whatever the policies say); a real push a blocking policy refuses answers 409 policy_blocked unless an architect or admin gives override_reason", rule: "inventory:write", query: pushQuerySchema, body: "inventory" },
  },
  "/environments/{env}/otlp/v1/traces": {
    post: {
      summary: "OTLP/HTTP trace receiver (set an exporter's endpoint to …/environments/{env}/otlp): ExportTraceServiceRequest as protobuf or JSON, gzip or not; spans are folded into observed edges, never stored",
      rule: "inventory:write",
      body: "otlp",
    },
  },
  "/environments/{env}/components": { get: { summary: "Components, filtered", rule: "read", query: componentsQuerySchema } },
  "/environments/{env}/components/{key}": {
    get: { summary: "One component: needs, dependents, measures, owner, notes", rule: "read" },
    patch: { summary: "Owner and notes (lead of the team, architect, admin); audited", rule: "components:annotate", body: annotateBodySchema },
  },
  "/environments/{env}/components/{key}/blast-radius": { get: { summary: "What goes down or degraded when this component fails", rule: "read" } },
  "/environments/{env}/components/{key}/history": { get: { summary: "Snapshots that added, changed or removed this component", rule: "read" } },
  "/environments/{env}/rankings": { get: { summary: "Ranked pinch points of the newest analysed snapshot; equal values share a rank (1, 2, 2, 4); a measure that did not converge is null with the reason in analysis.measures; ETag per snapshot, analysis and owners", rule: "read", query: rankingsQuerySchema } },
  "/environments/{env}/rankings/export": { get: { summary: "The ranking as CSV", rule: "read", query: rankingsExportQuerySchema } },
  "/environments/{env}/rankings/history": { get: { summary: "Ranks of components over recent snapshots", rule: "read", query: rankHistoryQuerySchema } },
  "/environments/{env}/chain": {
    get: { summary: "Why does one component depend on another: the shortest chain of runtime needs from `from` to `to` (null when it does not), each hop with its strength and how it is known", rule: "read", query: chainQuerySchema },
  },
  "/environments/{env}/drills": { post: { summary: "Fail components and/or zones: down, degraded, teams to page", rule: "read", body: drillBodySchema } },
  "/environments/{env}/alerts": {
    post: {
      summary:
        "Alert webhook: Pinchpoint alerts ({ alerts: [{ component, status, severity, startsAt, endsAt, link, id, summary }] }) or the body Prometheus Alertmanager's webhook_config sends (labels named in the alertLabels setting name the component); firing alerts join the open incident, resolved ones close; alerts naming no known component are kept and listed; audited",
      rule: "inventory:write",
      query: alertsQuerySchema,
      body: alertsBodySchema,
    },
  },
  "/environments/{env}/incidents": { get: { summary: "Incidents newest first with their origin ranking, the components that caused them and the top pinch points beside them", rule: "read", query: pageQuerySchema } },
  "/environments/{env}/incidents/current": {
    get: { summary: "The open incident: firing alerts, probable origin(s) by set cover and personalised PageRank, silent suspects, what will likely fail next, who to page in order, a copyable summary", rule: "read" },
  },
  "/environments/{env}/incidents/{number}": { get: { summary: "One incident: its alerts with their lifetimes and the origin ranking from when the most components fired", rule: "read" } },
  "/environments/{env}/incidents/{number}/resolve": { post: { summary: "Close an incident by hand (its firing alerts end now); audited", rule: "inventory:write", body: resolveIncidentSchema } },
  "/environments/{env}/drift": { get: { summary: "Traced calls against declared needs: seen but never declared, declared but never seen", rule: "read" } },
  "/environments/{env}/boot-order": { get: { summary: "Cold-start stages (start-up-only needs included); cycles that cannot start unaided, each with a start order and the needs to break first", rule: "read", query: bootOrderQuerySchema } },
  "/environments/{env}/graph": { get: { summary: "Components, dependencies and measures for the map", rule: "read" } },
  "/environments/{env}/map/positions": {
    get: { summary: "Pinned map positions", rule: "read" },
    put: { summary: "Replace pinned map positions", rule: "components:annotate", body: positionsSchema },
  },
  "/environments/{env}/snapshots": { get: { summary: "Snapshot history, newest first", rule: "read", query: pageQuerySchema } },
  "/environments/{env}/snapshots/{a}/diff/{b}": { get: { summary: "What changed from snapshot a to snapshot b", rule: "read" } },
  "/environments/{env}/imports": { get: { summary: "Accepted pushes and uploads", rule: "read", query: pageQuerySchema } },
  "/environments/{env}/reviews": { get: { summary: "Risk reviews", rule: "read", query: reviewsQuerySchema } },
  "/environments/{env}/reviews/{key}": {
    put: { summary: "Accept, mitigate or resolve a pinch point, with rationale and review date", rule: "reviews:write", body: reviewBodySchema },
    delete: { summary: "Clear a risk review", rule: "reviews:write" },
  },
  "/environments/{env}/settings": {
    get: { summary: "Environment settings with defaults filled in", rule: "read" },
    patch: { summary: "Change environment settings (re-queues analysis when it reads them)", rule: "reviews:write", body: settingsPatchSchema },
  },
  "/environments/{env}/policies": {
    get: { summary: "Change policies (rules a push's impact is held to, each block or warn) with the defaults", rule: "read" },
    put: { summary: "Replace the change policies; audited", rule: "reviews:write", body: policySetSchema },
  },
  "/environments/{env}/weights": {
    get: { summary: "Pinch-score weights", rule: "read" },
    put: { summary: "Change pinch-score weights (re-queues analysis)", rule: "reviews:write", body: pinchWeightsSchema },
  },
  "/teams": {
    get: { summary: "Teams", rule: "read" },
    post: { summary: "Create a team", rule: "admin", body: createTeamSchema },
  },
  "/teams/unowned": { get: { summary: "Components nobody owns, across environments", rule: "read", query: unownedQuerySchema } },
  "/teams/{slug}": {
    get: { summary: "One team: members, contacts, components", rule: "read" },
    patch: { summary: "Change a team (admin; a lead for e-mail, on-call and description)", rule: "components:annotate", body: updateTeamSchema },
  },
  "/teams/{slug}/members": { post: { summary: "Add a member", rule: "admin", body: addMemberSchema } },
  "/teams/{slug}/members/{userId}": { delete: { summary: "Remove a member", rule: "admin" } },
  "/tokens": {
    get: { summary: "API tokens (never their secrets)", rule: "admin" },
    post: { summary: "Create an API token; the secret is shown once", rule: "admin", body: createTokenSchema },
  },
  "/tokens/{id}": { delete: { summary: "Revoke a token", rule: "admin" } },
  "/users": {
    get: { summary: "Users", rule: "admin" },
    post: { summary: "Invite a user by e-mail", rule: "admin", body: inviteUserSchema },
  },
  "/users/{id}": { patch: { summary: "Change a user's role or deactivate", rule: "admin", body: updateUserSchema } },
  "/users/{id}/invite": { post: { summary: "Issue a new invite link", rule: "admin" } },
  "/invites/{token}": { post: { summary: "Accept an invite by setting a password", rule: "public", body: acceptInviteSchema } },
  "/audit": { get: { summary: "The audit log (architects and admins)", rule: "reviews:write", query: auditQuerySchema } },
  "/schema/inventory": { get: { summary: "JSON Schema of inventory format 1", rule: "public" } },
  "/openapi.json": { get: { summary: "This document", rule: "public" } },
};

/** Operations outside /api/v1 (the server is the app's root): the health check. */
export const ROOT_OPERATIONS: Record<string, Partial<Record<Method, Operation>>> = {
  "/api/health": {
    get: { summary: "App, database, analysis worker heartbeat and queue depth; 503 with Retry-After while the database is unreachable", rule: "public" },
  },
};

const errorSchema = z.object({
  error: z.string(),
  message: z.string(),
  issues: z.array(z.object({ path: z.string(), line: z.number().int().optional(), column: z.number().int().optional(), message: z.string() })).optional(),
});

const jsonSchema = (schema: z.ZodType) => z.toJSONSchema(schema, { io: "input", unrepresentable: "any" });

function queryParameters(schema: z.ZodType | undefined) {
  if (!schema) return [];
  const js = jsonSchema(schema) as { properties?: Record<string, unknown>; required?: string[] };
  return Object.entries(js.properties ?? {}).map(([name, s]) => ({ name, in: "query", required: js.required?.includes(name) ?? false, schema: s }));
}

export function openApiDocument(serverUrl: string) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const [p, methods] of Object.entries(OPERATIONS)) {
    const pathParams = [...p.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: "path", required: true, schema: { type: "string" } }));
    paths[p] = {};
    for (const [method, op] of Object.entries(methods) as Array<[Method, Operation]>) {
      const body =
        op.body === "inventory"
          ? {
              required: true,
              content: {
                "application/yaml": { schema: { oneOf: [inventoryJsonSchema(), kubernetesJsonSchema()] } },
                "application/json": { schema: { oneOf: [inventoryJsonSchema(), kubernetesJsonSchema()] } },
                "text/csv": { schema: { type: "string" } },
                // A layered Compose project: its files in order (base first, then overrides), `.env` files among them.
                "multipart/form-data": {
                  schema: { type: "object", properties: { file: { type: "array", items: { type: "string", format: "binary" } } } },
                },
                "application/x-ndjson": { schema: { type: "string", description: "OTLP/JSON traces, one ExportTraceServiceRequest a line (format=otlp)" } },
              },
            }
          : op.body === "otlp"
            ? {
                required: true,
                content: {
                  "application/x-protobuf": { schema: { type: "string", format: "binary", description: "opentelemetry.proto.collector.trace.v1.ExportTraceServiceRequest" } },
                  "application/json": { schema: { type: "object", description: "ExportTraceServiceRequest in the OTLP JSON encoding" } },
                },
              }
          : op.body
            ? { required: true, content: { "application/json": { schema: jsonSchema(op.body) } } }
            : undefined;
      paths[p][method] = {
        summary: op.summary,
        "x-pinchpoint-permission": op.rule,
        security: op.rule === "public" ? [] : [{ session: [] }, { token: [] }],
        parameters: [...pathParams, ...queryParameters(op.query)],
        ...(body ? { requestBody: body } : {}),
        responses: {
          "200": { description: "OK", content: { "application/json": { schema: {} } } },
          default: { description: "Error (400, 401, 403, 404, 409, 413, 422)", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } },
        },
      };
    }
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Pinchpoint API",
      version: "1",
      description: "Service-dependency inventory, pinch-point rankings, blast radius and drills. Rankings are only as good as the inventory pushed.",
    },
    servers: [{ url: `${serverUrl.replace(/\/$/, "")}/api/v1` }],
    components: {
      schemas: { Error: jsonSchema(errorSchema) },
      securitySchemes: {
        session: { type: "apiKey", in: "cookie", name: "next-auth.session-token" },
        token: { type: "http", scheme: "bearer", description: "API token, starts ppt_" },
      },
    },
    paths: {
      ...paths,
      ...Object.fromEntries(
        Object.entries(ROOT_OPERATIONS).map(([p, methods]) => [
          p,
          {
            servers: [{ url: serverUrl.replace(/\/$/, "") }],
            ...Object.fromEntries(
              Object.entries(methods).map(([method, op]) => [
                method,
                {
                  summary: op?.summary,
                  "x-pinchpoint-permission": op?.rule,
                  security: [],
                  responses: {
                    "200": { description: "OK (status ok, or degraded while no analysis worker is running)", content: { "application/json": { schema: {} } } },
                    "503": { description: "The database is unreachable; Retry-After says when to ask again", content: { "application/json": { schema: {} } } },
                  },
                },
              ]),
            ),
          },
        ]),
      ),
    },
  };
}
