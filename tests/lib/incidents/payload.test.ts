// Alert bodies (lib/incidents/payload.ts) and which component an alert means (lib/incidents/resolve.ts).
// Alertmanager bodies follow prometheus/alertmanager docs/configuration.md, `<webhook_config>`: "The
// Alertmanager will send HTTP POST requests in the following JSON format" — version "4", groupKey,
// truncatedAlerts ("how many alerts have been truncated due to max_alerts"), status, receiver,
// groupLabels, commonLabels, commonAnnotations, externalURL, and alerts of status, labels,
// annotations, startsAt and endsAt (RFC 3339), generatorURL ("identifies the entity that caused the
// alert") and fingerprint ("fingerprint to identify the alert").
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parse as parseYaml } from "yaml";
import { AppError } from "@/lib/errors";
import { detectAlertFormat, parseAlertPayload } from "@/lib/incidents/payload";
import { nameIndex, resolveAlert } from "@/lib/incidents/resolve";

const DOCUMENTED = {
  version: "4",
  groupKey: '{}/{severity="critical"}:{alertname="InstanceDown"}',
  truncatedAlerts: 2,
  status: "firing",
  receiver: "pinchpoint",
  groupLabels: { alertname: "InstanceDown" },
  commonLabels: { alertname: "InstanceDown", severity: "critical" },
  commonAnnotations: {},
  externalURL: "http://alertmanager.example.test:9093",
  alerts: [
    {
      status: "firing",
      labels: { alertname: "InstanceDown", severity: "critical", job: "orders-api", instance: "10.0.0.7:8080" },
      annotations: { summary: "orders-api is down", description: "no scrape for 5m" },
      // Go's time.Time marshals nanoseconds; the zero time stands for "no end yet".
      startsAt: "2026-12-02T09:51:03.157076123+02:00",
      endsAt: "0001-01-01T00:00:00Z",
      generatorURL: "http://prometheus.example.test:9090/graph?g0.expr=up+%3D%3D+0",
      fingerprint: "1a30ba71cca2921f",
    },
    {
      status: "resolved",
      labels: { alertname: "InstanceDown", severity: "critical", service: "search" },
      annotations: {},
      startsAt: "2026-12-02T07:00:00Z",
      endsAt: "2026-12-02T07:45:00Z",
      generatorURL: "",
    },
  ],
};

function issues(fn: () => unknown): Array<{ path: string; message: string }> {
  try {
    fn();
  } catch (e) {
    if (e instanceof AppError) return (e.issues ?? []) as Array<{ path: string; message: string }>;
    throw e;
  }
  throw new Error("expected a 422");
}

describe("Alertmanager webhook body", () => {
  it("is recognised by its version and receiver, and read field by field", () => {
    expect(detectAlertFormat(DOCUMENTED)).toBe("alertmanager");
    expect(detectAlertFormat({ alerts: [] })).toBe("pinchpoint");
    const parsed = parseAlertPayload(DOCUMENTED);
    expect(parsed.format).toBe("alertmanager");
    expect(parsed.truncated).toBe(2);
    expect(parsed.alerts[0]).toEqual({
      fingerprint: "am:1a30ba71cca2921f",
      format: "alertmanager",
      status: "firing",
      name: "InstanceDown",
      component: null,
      labels: DOCUMENTED.alerts[0]!.labels,
      severity: "critical",
      summary: "orders-api is down",
      link: "http://prometheus.example.test:9090/graph?g0.expr=up+%3D%3D+0",
      // 09:51:03.157 at +02:00 is 07:51:03.157 UTC; milliseconds are what a Date holds.
      startsAt: new Date("2026-12-02T07:51:03.157Z"),
      endsAt: null,
    });
    expect(parsed.alerts[1]).toMatchObject({ status: "resolved", endsAt: new Date("2026-12-02T07:45:00Z"), link: null });
  });

  it("identifies an alert without a fingerprint by its labels, whatever their order", () => {
    const a = parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[1]!, labels: { a: "1", b: "2" } }] }).alerts[0]!;
    const b = parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[1]!, labels: { b: "2", a: "1" } }] }).alerts[0]!;
    const c = parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[1]!, labels: { a: "1", b: "3" } }] }).alerts[0]!;
    expect(a.fingerprint).toMatch(/^am:[0-9a-f]{16}$/);
    expect(a.fingerprint).toBe(b.fingerprint);
    expect(a.fingerprint).not.toBe(c.fingerprint);
  });

  it("ignores fields a later Alertmanager (or a compatible sender) adds", () => {
    const extra = { ...DOCUMENTED, orgId: 1, alerts: [{ ...DOCUMENTED.alerts[0]!, silenceURL: "http://x", values: { B: 1 } }] };
    expect(parseAlertPayload(extra).alerts).toHaveLength(1);
  });

  it("refuses what breaks the documented shape, naming where", () => {
    expect(issues(() => parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[0]!, startsAt: "2026-12-02 09:51" }] })).map((i) => i.path)).toEqual(["alerts[0].startsAt"]);
    expect(issues(() => parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[0]!, status: "pending" }] })).map((i) => i.path)).toEqual(["alerts[0].status"]);
    expect(issues(() => parseAlertPayload({ ...DOCUMENTED, alerts: [{ ...DOCUMENTED.alerts[0]!, labels: { job: 7 } }] })).map((i) => i.path)).toEqual(["alerts[0].labels.job"]);
    expect(issues(() => parseAlertPayload({ version: "4", receiver: "x" })).map((i) => i.path)).toEqual(["alerts"]);
  });
});

describe("Pinchpoint alerts, version 1", () => {
  it("takes a component with defaults: firing, identity from the component, start when received", () => {
    const parsed = parseAlertPayload({ alerts: [{ component: "Orders-DB" }] });
    expect(parsed.alerts[0]).toEqual({ fingerprint: "pp:orders-db", format: "pinchpoint", status: "firing", name: null, component: "Orders-DB", labels: {}, severity: null, summary: null, link: null, startsAt: null, endsAt: null });
  });

  it("keeps an id as the identity, so two alerts on one component live apart", () => {
    const parsed = parseAlertPayload({ pinchpoint: "alerts/1", alerts: [{ component: "orders-db", id: "db/latency" }, { component: "orders-db", id: "db/disk" }] });
    expect(parsed.alerts.map((a) => a.fingerprint)).toEqual(["pp:db/latency", "pp:db/disk"]);
  });

  it("refuses unknown fields, a wrong marker, a link that is not http(s) and a start without a zone", () => {
    expect(issues(() => parseAlertPayload({ alerts: [{ component: "web", colour: "red" }] }))[0]!.path).toBe("alerts[0]");
    expect(issues(() => parseAlertPayload({ pinchpoint: "alerts/2", alerts: [] }))[0]!.path).toBe("pinchpoint");
    expect(issues(() => parseAlertPayload({ alerts: [{ component: "web", link: "javascript:alert(1)" }] }))[0]!.path).toBe("alerts[0].link");
    expect(issues(() => parseAlertPayload({ alerts: [{ component: "web", startsAt: "2026-12-02T09:00:00" }] }))[0]!.path).toBe("alerts[0].startsAt");
    expect(issues(() => parseAlertPayload({ alerts: [{ component: " " }] }))[0]!.path).toBe("alerts[0].component");
    expect(issues(() => parseAlertPayload([]))[0]!.path).toBe("(root)");
  });
});

describe("which component an alert means", () => {
  const index = nameIndex({
    components: [
      { key: "orders-api", aliases: ["ordersvc"] },
      { key: "search", aliases: [] },
    ] as never,
  });

  it("tries the configured labels in order; the first naming a key or alias wins, whatever the case", () => {
    expect(resolveAlert({ component: null, labels: { service: "unknown-thing", job: "OrderSvc" } }, ["service", "app", "job"], index)).toEqual({ key: "orders-api", named: { label: "job", value: "OrderSvc" } });
    expect(resolveAlert({ component: null, labels: { service: "search", job: "orders-api" } }, ["service", "job"], index)).toEqual({ key: "search", named: { label: "service", value: "search" } });
    expect(resolveAlert({ component: null, labels: { service: "search", job: "orders-api" } }, ["job", "service"], index)).toEqual({ key: "orders-api", named: { label: "job", value: "orders-api" } });
  });

  it("treats an empty label value as no label (Prometheus data model: 'Labels with an empty label value are considered equivalent to labels that do not exist')", () => {
    expect(resolveAlert({ component: null, labels: { service: "", app: "search" } }, ["service", "app"], index)).toEqual({ key: "search", named: { label: "app", value: "search" } });
  });

  it("says what an unknown alert called its component, or that no label named one", () => {
    expect(resolveAlert({ component: null, labels: { service: "payments-gw", app: "pgw" } }, ["service", "app"], index)).toEqual({ key: null, named: { label: "service", value: "payments-gw" } });
    expect(resolveAlert({ component: null, labels: { instance: "10.0.0.1" } }, ["service"], index)).toEqual({ key: null, named: null });
    expect(resolveAlert({ component: "nowhere", labels: {} }, ["service"], index)).toEqual({ key: null, named: { label: null, value: "nowhere" } });
  });
});

describe("the example Alertmanager receiver (examples/alerts/alertmanager.yml)", () => {
  it("uses only the documented <webhook_config> fields and points at the webhook route", () => {
    const root = path.resolve(__dirname, "../../..");
    const config = parseYaml(readFileSync(path.join(root, "examples/alerts/alertmanager.yml"), "utf8")) as {
      receivers: Array<{ webhook_configs: Array<Record<string, unknown> & { url: string; http_config: { authorization: { type?: string } } }> }>;
    };
    const hook = config.receivers[0]!.webhook_configs[0]!;
    // docs/configuration.md, <webhook_config>: send_resolved, url | url_file, http_config, max_alerts, timeout.
    for (const k of Object.keys(hook)) expect(["send_resolved", "url", "url_file", "http_config", "max_alerts", "timeout"]).toContain(k);
    expect(hook.send_resolved).toBe(true);
    // <http_config>.authorization: "type: <string> | default: Bearer".
    expect(hook.http_config.authorization.type ?? "Bearer").toBe("Bearer");
    const route = new URL(hook.url).pathname.replace(/^\/api\/v1\/environments\/[a-z0-9-]+\//, "app/api/v1/environments/[env]/");
    expect(existsSync(path.join(root, route, "route.ts"))).toBe(true);
  });
});
