// The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the handlers parse
// with (z.toJSONSchema), so the document cannot drift from what the server accepts. Who may call
// each operation comes from the same rules the authorization-matrix test holds the handlers to.
import { z } from "zod";
import type { RouteRule } from "@/lib/auth/with-permission";
import { kubernetesJsonSchema } from "@/importers/kubernetes/schema";
import { inventoryJsonSchema } from "@/lib/inventory/schema";
import {
  bootCyclesResponseSchema,
  bootOrderQuerySchema,
  bootOrderResponseSchema,
  chainQuerySchema,
  chainResponseSchema,
  drillBodySchema,
  drillResponseSchema,
  rankHistoryQuerySchema,
  rankingsExportQuerySchema,
  rankingsQuerySchema,
  rankingsResponseSchema,
  rankTrendResponseSchema,
} from "./schemas/analysis";
import { errorBodySchema } from "./schemas/common";
import {
  annotateBodySchema,
  annotationResultSchema,
  componentDetailResponseSchema,
  componentHistoryResponseSchema,
  componentsQuerySchema,
  componentsResponseSchema,
} from "./schemas/components";
import { driftQuerySchema, driftResponseSchema } from "./schemas/drift";
import {
  createEnvironmentSchema,
  deletedEnvironmentSchema,
  deleteEnvironmentQuerySchema,
  environmentResponseSchema,
  environmentSummarySchema,
  environmentsResponseSchema,
  renameEnvironmentSchema,
  settingsPatchSchema,
  settingsViewSchema,
} from "./schemas/environments";
import { healthResponseSchema } from "./schemas/health";
import { diffResponseSchema, importsQuerySchema, importsResponseSchema, snapshotsQuerySchema, snapshotsResponseSchema } from "./schemas/history";
import {
  alertsBodySchema,
  alertsQuerySchema,
  currentIncidentResponseSchema,
  incidentDetailResponseSchema,
  incidentHistoryResponseSchema,
  incidentsQuerySchema,
  receiveAlertsResponseSchema,
  resolvedIncidentSchema,
  resolveIncidentSchema,
} from "./schemas/incidents";
import { pushQuerySchema, pushResultSchema } from "./schemas/inventory";
import { mapGraphSchema, mapLayoutsResponseSchema, positionsResponseSchema, positionsSchema } from "./schemas/map";
import { policiesViewSchema } from "./schemas/policies";
import {
  auditPageSchema,
  auditQuerySchema,
  clearedReviewSchema,
  reviewBodySchema,
  reviewsQuerySchema,
  reviewsResponseSchema,
  reviewViewSchema,
  weightsViewSchema,
} from "./schemas/reviews";
import {
  addMemberSchema,
  createTeamSchema,
  memberRemovedSchema,
  teamDetailSchema,
  teamMemberSchema,
  teamQuerySchema,
  teamRecordSchema,
  teamsResponseSchema,
  unownedQuerySchema,
  unownedResponseSchema,
  updateTeamSchema,
} from "./schemas/teams";
import { createdTokenSchema, createTokenSchema, tokenInfoSchema, tokensResponseSchema } from "./schemas/tokens";
import { acceptedInviteSchema, acceptInviteSchema, adminUserSchema, inviteResultSchema, inviteUserSchema, updateUserSchema, usersResponseSchema } from "./schemas/users";
import { pinchWeightsSchema } from "@/lib/analysis/types";
import { policySetSchema } from "@/lib/impact/policies";

type Method = "get" | "post" | "put" | "patch" | "delete";

interface Operation {
  summary: string;
  rule: RouteRule;
  query?: z.ZodType;
  body?: z.ZodType | "inventory" | "otlp";
  /** the JSON answer (lib/api/schemas), or a document of another kind */
  response: z.ZodType | "csv" | "otlp" | "json-schema" | "openapi";
  /** the success status when it is not 200 */
  status?: 201;
}

/** Path (OpenAPI template) → method → operation. */
export const OPERATIONS: Record<string, Partial<Record<Method, Operation>>> = {
  "/environments": {
    get: { summary: "Environments with their latest snapshot and analysis status", rule: "read", response: environmentsResponseSchema },
    post: { summary: "Create an empty environment (409 if the slug exists); audited", rule: "admin", response: environmentSummarySchema, status: 201, body: createEnvironmentSchema },
  },
  "/environments/{env}": {
    get: { summary: "One environment: counts, latest snapshot, analysis status", rule: "read", response: environmentResponseSchema },
    patch: { summary: "Rename an environment (the slug never changes); audited", rule: "admin", response: environmentSummarySchema, body: renameEnvironmentSchema },
    delete: { summary: "Delete an environment and everything of it, bound tokens included; ?confirm=<slug> required; audited", rule: "admin", response: deletedEnvironmentSchema, query: deleteEnvironmentQuerySchema },
  },
  "/environments/{env}/inventory": {
    post: { summary: "Push an inventory (YAML, JSON, Compose, CSV, Kubernetes manifests, or OTLP/JSON and JSON Lines traces streamed; a layered Compose project as a multipart body of its files); dry_run=true writes nothing; impact=true reports what the change does to the failure points and the change policies (impact_format=markdown answers text/markdown, sarif application/sarif+json; 200 whatever the policies say); a real push a blocking policy refuses answers 409 policy_blocked unless an architect or admin gives override_reason", rule: "inventory:write", response: pushResultSchema, query: pushQuerySchema, body: "inventory" },
  },
  "/environments/{env}/otlp/v1/traces": {
    post: {
      summary: "OTLP/HTTP trace receiver (set an exporter's endpoint to …/environments/{env}/otlp): ExportTraceServiceRequest as protobuf or JSON, gzip or not; spans are folded into observed edges, never stored",
      rule: "inventory:write", response: "otlp",
      body: "otlp",
    },
  },
  "/environments/{env}/components": { get: { summary: "One page of the components (100 by default, at most 1,000), sorted and filtered, with the environment's counts", rule: "read", response: componentsResponseSchema, query: componentsQuerySchema } },
  "/environments/{env}/components/{key}": {
    get: { summary: "One component: needs, dependents, measures, owner, notes", rule: "read", response: componentDetailResponseSchema },
    patch: { summary: "Owner and notes (lead of the team, architect, admin); audited", rule: "components:annotate", response: annotationResultSchema, body: annotateBodySchema },
  },
  "/environments/{env}/components/{key}/blast-radius": { get: { summary: "What goes down or degraded when this component fails", rule: "read", response: drillResponseSchema } },
  "/environments/{env}/components/{key}/history": { get: { summary: "Snapshots that added, changed or removed this component", rule: "read", response: componentHistoryResponseSchema } },
  "/environments/{env}/rankings": { get: { summary: "Ranked pinch points of the newest analysed snapshot; equal values share a rank (1, 2, 2, 4); a measure that did not converge is null with the reason in analysis.measures; ETag per snapshot, analysis and owners", rule: "read", response: rankingsResponseSchema, query: rankingsQuerySchema } },
  "/environments/{env}/rankings/export": { get: { summary: "The ranking as CSV", rule: "read", response: "csv", query: rankingsExportQuerySchema } },
  "/environments/{env}/rankings/history": { get: { summary: "Ranks of components over recent snapshots", rule: "read", response: rankTrendResponseSchema, query: rankHistoryQuerySchema } },
  "/environments/{env}/chain": {
    get: { summary: "Why does one component depend on another: the shortest chain of runtime needs from `from` to `to` (null when it does not), each hop with its strength and how it is known", rule: "read", response: chainResponseSchema, query: chainQuerySchema },
  },
  "/environments/{env}/drills": { post: { summary: "Fail components and/or zones: down, degraded, teams to page", rule: "read", response: drillResponseSchema, body: drillBodySchema } },
  "/environments/{env}/alerts": {
    post: {
      summary:
        "Alert webhook: Pinchpoint alerts ({ alerts: [{ component, status, severity, startsAt, endsAt, link, id, summary }] }) or the body Prometheus Alertmanager's webhook_config sends (labels named in the alertLabels setting name the component); firing alerts join the open incident, resolved ones close; alerts naming no known component are kept and listed; audited",
      rule: "inventory:write", response: receiveAlertsResponseSchema,
      query: alertsQuerySchema,
      body: alertsBodySchema,
    },
  },
  "/environments/{env}/incidents": { get: { summary: "Incidents (newest first by default) with their origin ranking, the components that caused them and the top pinch points beside them; paged, sorted, filtered by status", rule: "read", response: incidentHistoryResponseSchema, query: incidentsQuerySchema } },
  "/environments/{env}/incidents/current": {
    get: { summary: "The open incident: firing alerts, probable origin(s) by set cover and personalised PageRank, silent suspects, what will likely fail next, who to page in order, a copyable summary", rule: "read", response: currentIncidentResponseSchema },
  },
  "/environments/{env}/incidents/{number}": { get: { summary: "One incident: its alerts with their lifetimes and the origin ranking from when the most components fired", rule: "read", response: incidentDetailResponseSchema } },
  "/environments/{env}/incidents/{number}/resolve": { post: { summary: "Close an incident by hand (its firing alerts end now); audited", rule: "inventory:write", response: resolvedIncidentSchema, body: resolveIncidentSchema } },
  "/environments/{env}/drift": { get: { summary: "Traced calls against declared needs: seen but never declared, declared but never seen, each list paged, sorted and filtered with its own prefixed parameters (seen_…, declared_…)", rule: "read", response: driftResponseSchema, query: driftQuerySchema } },
  "/environments/{env}/boot-order": { get: { summary: "Cold-start stages (start-up-only needs included); cycles that cannot start unaided, each with a start order and the needs to break first", rule: "read", response: z.union([bootOrderResponseSchema, bootCyclesResponseSchema]), query: bootOrderQuerySchema } },
  "/environments/{env}/graph": { get: { summary: "Components, dependencies and measures for the map", rule: "read", response: mapGraphSchema } },
  "/environments/{env}/map/layouts": {
    get: { summary: "Map layouts of the map's snapshot, computed by the worker after each analysis, per view (teams, grouped, flat, team:<slot>)", rule: "read", response: mapLayoutsResponseSchema },
  },
  "/environments/{env}/map/positions": {
    get: { summary: "Pinned map positions", rule: "read", response: positionsResponseSchema },
    put: { summary: "Replace pinned map positions", rule: "components:annotate", response: positionsResponseSchema, body: positionsSchema },
  },
  "/environments/{env}/snapshots": { get: { summary: "Snapshot history (newest first by default); paged, sorted, filtered by source or pusher", rule: "read", response: snapshotsResponseSchema, query: snapshotsQuerySchema } },
  "/environments/{env}/snapshots/{a}/diff/{b}": { get: { summary: "What changed from snapshot a to snapshot b", rule: "read", response: diffResponseSchema } },
  "/environments/{env}/imports": { get: { summary: "Accepted pushes and uploads (newest first by default); paged, sorted, filtered", rule: "read", response: importsResponseSchema, query: importsQuerySchema } },
  "/environments/{env}/reviews": { get: { summary: "Risk reviews", rule: "read", response: reviewsResponseSchema, query: reviewsQuerySchema } },
  "/environments/{env}/reviews/{key}": {
    put: { summary: "Accept, mitigate or resolve a pinch point, with rationale and review date", rule: "reviews:write", response: reviewViewSchema, body: reviewBodySchema },
    delete: { summary: "Clear a risk review", rule: "reviews:write", response: clearedReviewSchema },
  },
  "/environments/{env}/settings": {
    get: { summary: "Environment settings with defaults filled in", rule: "read", response: settingsViewSchema },
    patch: { summary: "Change environment settings (re-queues analysis when it reads them)", rule: "reviews:write", response: settingsViewSchema, body: settingsPatchSchema },
  },
  "/environments/{env}/policies": {
    get: { summary: "Change policies (rules a push's impact is held to, each block or warn) with the defaults", rule: "read", response: policiesViewSchema },
    put: { summary: "Replace the change policies; audited", rule: "reviews:write", response: policiesViewSchema, body: policySetSchema },
  },
  "/environments/{env}/weights": {
    get: { summary: "Pinch-score weights", rule: "read", response: weightsViewSchema },
    put: { summary: "Change pinch-score weights (re-queues analysis)", rule: "reviews:write", response: weightsViewSchema, body: pinchWeightsSchema },
  },
  "/teams": {
    get: { summary: "Teams", rule: "read", response: teamsResponseSchema },
    post: { summary: "Create a team", rule: "admin", response: teamRecordSchema, status: 201, body: createTeamSchema },
  },
  "/teams/unowned": { get: { summary: "Components nobody owns, across environments (most pinching first by default); paged, sorted, filtered", rule: "read", response: unownedResponseSchema, query: unownedQuerySchema } },
  "/teams/{slug}": {
    get: { summary: "One team: members, contacts, pinch points, and a page of its components across environments", rule: "read", response: teamDetailSchema, query: teamQuerySchema },
    patch: { summary: "Change a team (admin; a lead for e-mail, on-call and description)", rule: "components:annotate", response: teamRecordSchema, body: updateTeamSchema },
  },
  "/teams/{slug}/members": { post: { summary: "Add a member", rule: "admin", response: teamMemberSchema, body: addMemberSchema } },
  "/teams/{slug}/members/{userId}": { delete: { summary: "Remove a member", rule: "admin", response: memberRemovedSchema } },
  "/tokens": {
    get: { summary: "API tokens (never their secrets)", rule: "admin", response: tokensResponseSchema },
    post: { summary: "Create an API token; the secret is shown once", rule: "admin", response: createdTokenSchema, status: 201, body: createTokenSchema },
  },
  "/tokens/{id}": { delete: { summary: "Revoke a token", rule: "admin", response: tokenInfoSchema } },
  "/users": {
    get: { summary: "Users", rule: "admin", response: usersResponseSchema },
    post: { summary: "Invite a user by e-mail", rule: "admin", response: inviteResultSchema, status: 201, body: inviteUserSchema },
  },
  "/users/{id}": { patch: { summary: "Change a user's role or deactivate", rule: "admin", response: adminUserSchema, body: updateUserSchema } },
  "/users/{id}/invite": { post: { summary: "Issue a new invite link", rule: "admin", response: inviteResultSchema, status: 201 } },
  "/invites/{token}": { post: { summary: "Accept an invite by setting a password", rule: "public", response: acceptedInviteSchema, body: acceptInviteSchema } },
  "/audit": { get: { summary: "The audit log (architects and admins)", rule: "reviews:write", response: auditPageSchema, query: auditQuerySchema } },
  "/schema/inventory": { get: { summary: "JSON Schema of inventory format 1", rule: "public", response: "json-schema" } },
  "/openapi.json": { get: { summary: "This document", rule: "public", response: "openapi" } },
};

/** Operations outside /api/v1 (the server is the app's root): the health check. */
export const ROOT_OPERATIONS: Record<string, Partial<Record<Method, Operation>>> = {
  "/api/health": {
    get: { summary: "App, database, analysis worker heartbeat and queue depth; 503 with Retry-After while the database is unreachable", rule: "public", response: healthResponseSchema },
  },
};

const jsonSchema = (schema: z.ZodType, io: "input" | "output" = "input") => z.toJSONSchema(schema, { io, unrepresentable: "any" });

/** The success answer of an operation: its JSON schema, or the document type it answers with. */
function successContent(response: Operation["response"]) {
  switch (response) {
    case "csv":
      return { "text/csv": { schema: { type: "string", description: "one row per component, the ranking's columns; cells that a spreadsheet would read as a formula are quoted" } } };
    case "otlp":
      return {
        "application/x-protobuf": { schema: { type: "string", format: "binary", description: "opentelemetry.proto.collector.trace.v1.ExportTraceServiceResponse" } },
        "application/json": { schema: { type: "object", description: "ExportTraceServiceResponse in the OTLP JSON encoding (partialSuccess when spans were refused)" } },
      };
    case "json-schema":
      return { "application/schema+json": { schema: { type: "object", description: "JSON Schema (draft 2020-12) of inventory format 1" } } };
    case "openapi":
      return { "application/json": { schema: { type: "object", description: "OpenAPI 3.1" } } };
    default:
      return { "application/json": { schema: jsonSchema(response, "output") } };
  }
}

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
          [String(op.status ?? 200)]: { description: op.status === 201 ? "Created" : "OK", content: successContent(op.response) },
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
      schemas: { Error: jsonSchema(errorBodySchema, "output") },
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
                    "200": { description: "OK (status ok, or degraded while no analysis worker is running)", content: op ? successContent(op.response) : {} },
                    "503": { description: "The database is unreachable; Retry-After says when to ask again", content: op ? successContent(op.response) : {} },
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
