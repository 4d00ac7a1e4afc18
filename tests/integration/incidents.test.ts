// The alert webhook and the incident screens' API against real PostgreSQL. Alertmanager bodies follow
// the JSON the Prometheus Alertmanager documents for its webhook receiver (prometheus/alertmanager
// docs/configuration.md, section `<webhook_config>`: "The Alertmanager will send HTTP POST requests
// in the following JSON format": version "4", groupKey, truncatedAlerts, status, receiver,
// groupLabels, commonLabels, commonAnnotations, externalURL, alerts[] with status, labels,
// annotations, startsAt, endsAt, generatorURL, fingerprint).
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as alertsRoute } from "@/app/api/v1/environments/[env]/alerts/route";
import { GET as historyRoute } from "@/app/api/v1/environments/[env]/incidents/route";
import { GET as currentRoute } from "@/app/api/v1/environments/[env]/incidents/current/route";
import { GET as detailRoute } from "@/app/api/v1/environments/[env]/incidents/[number]/route";
import { POST as resolveRoute } from "@/app/api/v1/environments/[env]/incidents/[number]/resolve/route";
import { PATCH as settingsRoute } from "@/app/api/v1/environments/[env]/settings/route";
import { drainAnalysisQueue } from "@/lib/jobs/analysis";
import { pushInventory } from "@/lib/data/push";
import { utc } from "@/lib/incidents/view";
import type { CurrentIncidentResponse, IncidentDetailResponse, IncidentHistoryResponse, ReceiveAlertsResponse } from "@/lib/incidents/types";
import { db } from "@/models";
import { call, createApiToken, createUser, type TestUser } from "../support/api";

// orders-db ← orders-api ← checkout ← web; courier → orders-api; search → search-index (unrelated).
const FILE = `pinchpoint: 1
source: shop-repo
components:
  - { key: orders-db, kind: datastore, tier: 1, team: data, aliases: [ordersdb-primary] }
  - { key: orders-api, kind: service, tier: 1, team: orders, needs: [orders-db] }
  - { key: checkout, kind: service, tier: 1, team: checkout, needs: [orders-api] }
  - { key: web, kind: service, tier: 1, team: storefront, needs: [checkout] }
  - { key: courier, kind: service, tier: 2, team: fleet, needs: [orders-api] }
  - { key: search, kind: service, tier: 2, team: discovery, needs: [search-index] }
  - { key: search-index, kind: datastore, tier: 3, team: discovery }
`;

const system = { type: "system" as const, label: "test", canCreateEnvironments: true as const };
let admin: TestUser;
let engineer: TestUser;
let viewer: TestUser;
let writeToken: string;
let readToken: string;

beforeAll(async () => {
  admin = await createUser("admin");
  engineer = await createUser("engineer");
  viewer = await createUser("viewer");
  writeToken = await createApiToken({ scopes: ["inventory:write"], createdBy: admin.id });
  readToken = await createApiToken({ scopes: ["read"], createdBy: admin.id });
  await db().models.Team.bulkCreate([
    { slug: "data", name: "Data platform", email: "data@example.test", oncall: "data rota", description: null },
    { slug: "orders", name: "Orders", email: "orders@example.test", oncall: null, description: null },
    { slug: "checkout", name: "Checkout", email: "checkout@example.test", oncall: "checkout rota", description: null },
  ]);
  for (const env of ["shop", "other"]) await pushInventory({ environment: env, format: "pinchpoint", body: FILE, dryRun: false, actor: system });
  await drainAnalysisQueue();
});

// Times relative to now (an end in the future is taken as now); T0 keeps Alertmanager's nanoseconds.
const BASE = Math.floor(Date.now() / 60_000) * 60_000 - 30 * 60_000;
const at = (minutes: number) => new Date(BASE + minutes * 60_000).toISOString();
const T0 = at(0).replace(".000Z", ".123456789Z");
const T1 = at(1.5);

interface AmAlert {
  status: "firing" | "resolved";
  labels: Record<string, string>;
  annotations: Record<string, string>;
  startsAt: string;
  endsAt: string;
  generatorURL: string;
  fingerprint: string;
}

function amAlert(status: "firing" | "resolved", labels: Record<string, string>, fingerprint: string, startsAt = T0, endsAt = "0001-01-01T00:00:00Z"): AmAlert {
  return {
    status,
    labels: { alertname: "HighErrorRate", severity: "critical", ...labels },
    annotations: { summary: `errors on ${Object.values(labels)[0]}` },
    startsAt,
    endsAt,
    generatorURL: "http://prometheus.example.test:9090/graph?g0.expr=errors",
    fingerprint,
  };
}

function amBody(alerts: AmAlert[], extra: Record<string, unknown> = {}) {
  return {
    version: "4",
    groupKey: '{}:{alertname="HighErrorRate"}',
    truncatedAlerts: 0,
    status: alerts.some((a) => a.status === "firing") ? "firing" : "resolved",
    receiver: "pinchpoint",
    groupLabels: { alertname: "HighErrorRate" },
    commonLabels: { alertname: "HighErrorRate" },
    commonAnnotations: {},
    externalURL: "http://alertmanager.example.test:9093",
    alerts,
    ...extra,
  };
}

const post = (env: string, body: unknown, as: TestUser | { token: string } | null = { token: writeToken }, query = "") =>
  call(alertsRoute, { url: `/api/v1/environments/${env}/alerts${query}`, method: "POST", params: { env }, as, body: typeof body === "string" ? body : (body as object), headers: { "content-type": "application/json" } });
const current = async (env = "shop") => (await call(currentRoute, { url: `/api/v1/environments/${env}/incidents/current`, params: { env }, as: viewer })).json as CurrentIncidentResponse;
const history = async (env = "shop") => (await call(historyRoute, { url: `/api/v1/environments/${env}/incidents`, params: { env }, as: viewer })).json as IncidentHistoryResponse;
const counts = async () => {
  const [r] = await db().sequelize.query<{ alerts: string; incidents: string; audit: string }>(
    "SELECT (SELECT count(*) FROM alerts) AS alerts, (SELECT count(*) FROM incidents) AS incidents, (SELECT count(*) FROM audit_events WHERE action LIKE 'alerts.%' OR action LIKE 'incident.%') AS audit",
    { type: QueryTypes.SELECT },
  );
  return r;
};

// The four firing components of the outage: the datastore named by an alias in `service`, the
// others by `job` and `app` (the default alertLabels setting tries service, app, job in order).
const OUTAGE = [
  amAlert("firing", { service: "ordersdb-primary", instance: "db-1:5432" }, "a1"),
  amAlert("firing", { job: "orders-api" }, "a2"),
  amAlert("firing", { app: "checkout" }, "a3"),
  amAlert("firing", { app: "courier", job: "courier-scrape" }, "a4"),
  amAlert("firing", { service: "payments-gw" }, "a5"),
];

describe("alert webhook: an Alertmanager outage", () => {
  it("opens incident #1 with the firing alerts and lists the one naming no known component", async () => {
    const res = await post("shop", amBody(OUTAGE));
    expect(res.status).toBe(200);
    const body = res.json as ReceiveAlertsResponse;
    expect(body).toMatchObject({ format: "alertmanager", received: 5, opened: 5, repeated: 0, resolved: 0, truncated: 0 });
    expect(body.unknown).toEqual([{ value: "payments-gw", label: "service", alerts: 1 }]);
    expect(body.incident).toEqual({ number: 1, status: "open", firingAlerts: 5, url: "/environments/shop/incidents/1" });
  });

  it("names orders-db as the probable origin, what it does not explain, and pages its owners first", async () => {
    const view = await current();
    expect(view.incident).toMatchObject({ number: 1, status: "open", openedAt: at(0).replace(".000Z", ".123Z") });
    expect(view.result.firing).toEqual(["checkout", "courier", "orders-api", "orders-db"]);
    expect(view.result.origins.map((o) => [o.key, o.explains.length])).toEqual([["orders-db", 4]]);
    expect(view.result.explainedCount).toBe(4);
    // web needs checkout: down once orders-db is, though it does not alert (yet).
    expect(view.result.predicted.down).toEqual(["web"]);
    expect(view.predictedTotal).toEqual({ down: 1, degraded: 0 });
    expect(view.unknownAlerts).toEqual([{ value: "payments-gw", label: "service", alerts: 1 }]);
    // courier's alert carries app=courier and job=courier-scrape: app comes first in the setting.
    expect(view.firingAlerts.find((a) => a.fingerprint === "am:a4")).toMatchObject({ component: "courier", named: { label: "app", value: "courier" } });
    expect(view.page.map((p) => [p.team, p.reasons])).toEqual([
      ["data", ["origin"]],
      ["checkout", ["firing"]],
      ["fleet", ["firing"]],
      ["orders", ["firing"]],
      ["storefront", ["predicted"]],
    ]);
    expect(view.page[0]!.contact).toMatchObject({ name: "Data platform", oncall: "data rota" });
    expect(view.summary).toContain(`Pinchpoint incident #1, shop: open since ${utc(T0)}; 5 alerts on 4 components firing`);
    expect(view.summary).toContain("Probable origin: orders-db — explains 4 of 4 firing.");
    expect(view.summary).toContain("Alerts naming no known component: 1 — service=payments-gw.");
    expect(view.summary).toContain("1. Data platform (data): owns the probable origin orders-db — on-call data rota, data@example.test");
    expect(view.summary).toMatch(/Read against snapshot #1, pushed \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC\./);
    expect(view.summary).toContain("not a diagnosis");
    expect(view.caution).toContain("not a diagnosis");
  });

  it("treats a repeat notification as a repeat: nothing new opens", async () => {
    const before = await counts();
    const res = await post("shop", amBody(OUTAGE));
    expect(res.json).toMatchObject({ opened: 0, repeated: 5 });
    const after = await counts();
    expect(after!.alerts).toBe(before!.alerts);
    expect(Number(after!.audit)).toBe(Number(before!.audit) + 1);
  });

  it("refuses bad bodies with a located 422 and changes nothing", async () => {
    const before = await counts();
    const badTime = await post("shop", amBody([{ ...OUTAGE[0]!, startsAt: "yesterday" }]));
    expect(badTime.status).toBe(422);
    expect((badTime.json as { issues: Array<{ path: string }> }).issues.map((i) => i.path)).toEqual(["alerts[0].startsAt"]);
    const badLabels = await post("shop", amBody([{ ...OUTAGE[0]!, labels: { ...OUTAGE[0]!.labels, service: 42 as unknown as string } }]));
    expect(badLabels.status).toBe(422);
    expect((badLabels.json as { issues: Array<{ path: string }> }).issues[0]!.path).toBe("alerts[0].labels.service");
    const unknownField = await post("shop", { alerts: [{ component: "web", colour: "red" }] });
    expect(unknownField.status).toBe(422);
    expect((unknownField.json as { issues: Array<{ path: string; message: string }> }).issues[0]).toMatchObject({ path: "alerts[0]" });
    const badLink = await post("shop", { alerts: [{ component: "web", link: "javascript:alert(1)" }] });
    expect((badLink.json as { issues: Array<{ path: string }> }).issues.map((i) => i.path)).toEqual(["alerts[0].link"]);
    const wrongFormat = await post("shop", { alerts: [{ component: "web" }] }, undefined, "?format=alertmanager");
    expect(wrongFormat.status).toBe(422);
    const notJson = await post("shop", "{not json");
    expect(notJson.status).toBe(400);
    // One bad alert among good ones: the whole body is refused.
    const mixed = await post("shop", amBody([amAlert("firing", { app: "web" }, "new-1"), { ...OUTAGE[1]!, status: "exploded" as "firing" }]));
    expect(mixed.status).toBe(422);
    expect(await counts()).toEqual(before);
  });

  it("is reached only with write rights on this environment", async () => {
    expect((await post("shop", amBody(OUTAGE), null)).status).toBe(401);
    expect((await post("shop", amBody(OUTAGE), { token: readToken })).status).toBe(403);
    expect((await post("shop", amBody(OUTAGE), viewer)).status).toBe(403);
    const env = await db().models.Environment.findOne({ where: { slug: "other" } });
    const bound = await createApiToken({ scopes: ["inventory:write"], environmentId: env!.id, createdBy: admin.id });
    expect((await post("shop", amBody(OUTAGE), { token: bound })).status).toBe(403);
    expect((await post("nowhere", amBody(OUTAGE))).status).toBe(404);
  });

  it("closes resolved alerts and resolves the incident when the last one resolves, keeping its ranking", async () => {
    const partial = await post("shop", amBody([amAlert("resolved", { app: "checkout" }, "a3", T0, T1), amAlert("resolved", { service: "payments-gw" }, "a5", T0, T1)]));
    expect(partial.json).toMatchObject({ resolved: 2, incident: { number: 1, status: "open", firingAlerts: 3 } });
    const view = await current();
    expect(view.firingAlerts.map((a) => a.fingerprint).sort()).toEqual(["am:a1", "am:a2", "am:a4"]);
    expect(view.resolvedAlerts.map((a) => [a.fingerprint, a.endsAt])).toEqual([["am:a3", T1], ["am:a5", T1]]);
    const end = at(10);
    const rest = await post("shop", amBody(["a1", "a2", "a4"].map((f) => amAlert("resolved", { app: "x" }, f, T0, end))));
    expect(rest.json).toMatchObject({ resolved: 3, incident: { number: 1, status: "resolved", firingAlerts: 0 } });
    expect((await current()).incident).toBeNull();
    const detail = (await call(detailRoute, { url: "/api/v1/environments/shop/incidents/1", params: { env: "shop", number: "1" }, as: viewer })).json as IncidentDetailResponse;
    expect(detail.incident).toMatchObject({ number: 1, status: "resolved", resolvedAt: end, peakFiring: 4, alertCount: 5, firingAlerts: 0 });
    // The ranking from when the most components fired: orders-db explained all four.
    expect(detail.incident.ranking?.origins).toEqual([{ key: "orders-db", explains: 4, degraded: 0, newlyExplained: 4 }]);
    expect(detail.alerts.every((a) => a.endsAt !== null)).toBe(true);
  });

  it("ignores a late firing notice of an alert already resolved with the same start, and opens #2 when it fires again", async () => {
    const late = await post("shop", amBody([OUTAGE[0]!]));
    expect(late.json).toMatchObject({ late: 1, opened: 0, incident: null });
    const again = await post("shop", amBody([amAlert("firing", { service: "orders-db" }, "a1", at(20)), amAlert("firing", { app: "web" }, "a6", at(21))]));
    expect(again.json).toMatchObject({ opened: 2, incident: { number: 2, status: "open" } });
    const unmatched = await post("shop", amBody([amAlert("resolved", { app: "web" }, "never-seen", T0, T1)]));
    expect(unmatched.json).toMatchObject({ unmatched: 1, resolved: 0 });
  });

  it("keeps every incident in history beside the pinch points the measures predict", async () => {
    const h = await history();
    expect(h.items.map((i) => [i.number, i.status])).toEqual([[2, "open"], [1, "resolved"]]);
    expect(h.causes.map((c) => [c.key, c.incidents])).toEqual([["orders-db", 2]]);
    expect(h.causes[0]!.pinchRank).toBeGreaterThanOrEqual(1);
    expect(h.predicted.length).toBe(7);
    expect(h.predicted.find((p) => p.key === "orders-db")?.incidents).toBe(2);
  });

  it("closes an incident by hand with a reason, audited; a second close is a conflict", async () => {
    const res = await call(resolveRoute, { url: "/api/v1/environments/shop/incidents/2/resolve", method: "POST", params: { env: "shop", number: "2" }, as: engineer, body: { reason: "the sender never sends resolved alerts" } });
    expect(res.status).toBe(200);
    expect(res.json).toMatchObject({ incident: { number: 2, status: "resolved", firingAlerts: 0 } });
    const again = await call(resolveRoute, { url: "/api/v1/environments/shop/incidents/2/resolve", method: "POST", params: { env: "shop", number: "2" }, as: engineer, body: { reason: "again" } });
    expect(again.status).toBe(409);
    const bad = await call(resolveRoute, { url: "/api/v1/environments/shop/incidents/2/resolve", method: "POST", params: { env: "shop", number: "2" }, as: engineer, body: {} });
    expect(bad.status).toBe(422);
    expect((bad.json as { issues: Array<{ path: string }> }).issues[0]!.path).toBe("reason");
    const [audit] = await db().sequelize.query<{ actor_label: string; after: { reason: string } }>("SELECT actor_label, after FROM audit_events WHERE action = 'incident.resolve'", { type: QueryTypes.SELECT });
    expect(audit).toMatchObject({ actor_label: engineer.email, after: { reason: "the sender never sends resolved alerts" } });
  });
});

describe("alert webhook: Pinchpoint alerts and the label setting", () => {
  it("takes the small Pinchpoint format: a component key or alias, default start, resolved by id", async () => {
    const res = await post("other", { pinchpoint: "alerts/1", alerts: [{ component: "ORDERSDB-PRIMARY", severity: "critical", id: "db-latency", summary: "p95 above 2 s", link: "https://grafana.example.test/d/1" }, { component: "search" }] });
    expect(res.json).toMatchObject({ format: "pinchpoint", opened: 2, unknown: [], incident: { number: 1, status: "open" } });
    const view = await current("other");
    expect(view.firingAlerts.map((a) => [a.component, a.severity, a.link])).toEqual([
      ["orders-db", "critical", "https://grafana.example.test/d/1"],
      ["search", null, null],
    ]);
    // Two unrelated firing components: neither explains the other.
    expect(view.result.origins).toEqual([]);
    expect(view.result.unexplained).toEqual(["orders-db", "search"]);
    const done = await post("other", { alerts: [{ component: "orders-db", id: "db-latency", status: "resolved" }, { component: "search", status: "resolved" }] });
    expect(done.json).toMatchObject({ resolved: 2, incident: { status: "resolved" } });
  });

  it("maps components by the environment's alertLabels setting, in its order", async () => {
    const bad = await call(settingsRoute, { url: "/api/v1/environments/other/settings", method: "PATCH", params: { env: "other" }, as: admin, body: { alertLabels: [] } });
    expect(bad.status).toBe(422);
    expect((bad.json as { issues: Array<{ path: string }> }).issues[0]!.path).toBe("alertLabels");
    const ok = await call(settingsRoute, { url: "/api/v1/environments/other/settings", method: "PATCH", params: { env: "other" }, as: admin, body: { alertLabels: ["k8s_app", "service"] } });
    expect(ok.status).toBe(200);
    const res = await post("other", amBody([amAlert("firing", { service: "search", k8s_app: "search-index" }, "s1"), amAlert("firing", { job: "web" }, "s2")]));
    expect((res.json as ReceiveAlertsResponse).unknown).toEqual([{ value: null, label: null, alerts: 1 }]);
    const view = await current("other");
    expect(view.firingAlerts.map((a) => a.component)).toEqual(["search-index", null]);
  });
});
