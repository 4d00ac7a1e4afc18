// Live incidents end to end: an Alertmanager-shaped body (the JSON prometheus/alertmanager
// docs/configuration.md documents for `<webhook_config>`) posted to the running app's webhook with a
// write token; the incident screen, already open, follows without a reload and names the probable
// origin and the teams to page; the overview shows the banner, the map the overlay; resolving every
// alert closes the incident into history. The demo's session-store (Harbor Pantry, identity team)
// takes session-service and the checkout path down with it (examples/harbor-pantry/identity.yaml).
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { baseUrl, browserForFile, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
let page: Page;
let token: string;

const startsAt = new Date(Date.now() - 12 * 60_000).toISOString();
const ALERTS: Array<[string, Record<string, string>]> = [
  ["f-store", { alertname: "RedisDown", service: "session-store", severity: "critical" }],
  ["f-session", { alertname: "HighErrorRate", app: "session-service", severity: "critical" }],
  ["f-cart", { alertname: "HighErrorRate", job: "cart-service", severity: "warning" }],
  ["f-checkout", { alertname: "HighErrorRate", service: "checkout-service", severity: "critical" }],
  ["f-web", { alertname: "LatencyHigh", app: "web-frontend", severity: "warning" }],
  ["f-pay", { alertname: "HighErrorRate", service: "payment-orchestrator", severity: "critical" }],
  ["f-fax", { alertname: "QueueStuck", service: "legacy-fax-gateway", severity: "warning" }],
];

function webhookBody(status: "firing" | "resolved") {
  return {
    version: "4",
    groupKey: '{}:{alertname=~".*"}',
    truncatedAlerts: 0,
    status,
    receiver: "pinchpoint",
    groupLabels: {},
    commonLabels: {},
    commonAnnotations: {},
    externalURL: "http://alertmanager.harbor-pantry.example:9093",
    alerts: ALERTS.map(([fingerprint, labels]) => ({
      status,
      labels,
      annotations: { summary: `${labels.alertname} on ${Object.values(labels)[1]}` },
      startsAt,
      endsAt: status === "firing" ? "0001-01-01T00:00:00Z" : new Date().toISOString(),
      generatorURL: "http://prometheus.harbor-pantry.example:9090/graph?g0.expr=up",
      fingerprint,
    })),
  };
}

async function sendAlerts(status: "firing" | "resolved") {
  const res = await fetch(`${baseUrl()}/api/v1/environments/production/alerts`, {
    method: "POST",
    headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
    body: JSON.stringify(webhookBody(status)),
  });
  expect(res.status).toBe(200);
  return (await res.json()) as { incident: { number: number; status: string } | null; unknown: Array<{ value: string }> };
}

beforeAll(async () => {
  page = await signedInPage(browser(), "admin");
  await page.context().grantPermissions(["clipboard-read", "clipboard-write"], { origin: baseUrl() });
  const res = await page.request.post(`${baseUrl()}/api/v1/tokens`, { headers: { origin: baseUrl() }, data: { name: "e2e-alertmanager", scopes: ["inventory:write"], environment: "production" } });
  expect(res.status()).toBe(201);
  token = ((await res.json()) as { token: string }).token;
});

afterAll(async () => {
  // Leave production without an open incident for the files that run after this one.
  if (token) await sendAlerts("resolved").catch(() => undefined);
});

describe("live incidents", () => {
  let number = 0;

  it("shows how to send alerts while nothing fires", async () => {
    await page.goto(`${baseUrl()}/environments/production/incidents`);
    await expect.poll(() => page.getByTestId("incident-status").textContent()).toContain("No alerts firing.");
    expect(await page.getByTestId("webhook-help").textContent()).toContain("/api/v1/environments/production/alerts");
    expect(await page.getByTestId("incident-caution").textContent()).toContain("not a diagnosis");
  });

  it("follows an Alertmanager webhook without a reload: names the origin and the teams to page", async () => {
    const received = await sendAlerts("firing");
    expect(received.incident).toMatchObject({ status: "open" });
    expect(received.unknown).toEqual([{ value: "legacy-fax-gateway", label: "service", alerts: 1 }]);
    number = received.incident!.number;
    // The screen opened before the alerts arrived: swr's refresh brings them in.
    await expect.poll(() => page.getByTestId("origin").first().textContent(), { timeout: 30_000 }).toContain("session-store");
    expect(await page.getByTestId("origin").first().textContent()).toContain("explains 6 of 6 firing");
    expect(await page.getByTestId("incident-status").textContent()).toContain(`Incident #${number} open since`);
    // Who to page: the identity team owns the origin, so it comes first, with its on-call rota.
    const first = await page.getByTestId("page-entry").first().textContent();
    expect(first).toContain("Identity");
    expect(first).toContain("owns the probable origin");
    expect(first).toContain("rota identity-primary");
    expect(await page.getByTestId("page-entry").count()).toBeGreaterThan(3);
    expect(await page.getByTestId("unknown-alerts").textContent()).toContain("service=legacy-fax-gateway");
    expect(Number(await page.getByTestId("predicted").locator("span.text-down").first().textContent().then((t) => t?.split(" ")[0]))).toBeGreaterThan(10);
    expect(await page.getByTestId("pagerank").textContent()).toContain("session-store");
    expect(await page.getByTestId("incident-caution").textContent()).toContain("not a diagnosis");
    await screenshot(page, "incidents-live");
  });

  it("copies a summary with absolute UTC times and the snapshot", async () => {
    await page.getByRole("button", { name: "Copy incident summary" }).click();
    await expect.poll(() => page.getByText("Copied to the clipboard.").count()).toBe(1);
    const text = await page.evaluate(() => navigator.clipboard.readText());
    expect(text).toMatch(new RegExp(`Pinchpoint incident #${number}, production: open since \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} UTC; 7 alerts on 6 components firing at \\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} UTC`));
    expect(text).toContain("Probable origin: session-store — explains 6 of 6 firing.");
    expect(text).toMatch(/\n1\. Identity \(identity\): owns the probable origin session-store;.* — on-call rota identity-primary/);
    expect(text).toMatch(/Read against snapshot #\d+, pushed \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC\./);
    expect(text).toContain("not a diagnosis");
    expect(text).toContain("/environments/production/incidents");
  });

  it("shows the banner on the overview and the overlay on the map", async () => {
    await page.goto(`${baseUrl()}/environments/production`);
    await expect.poll(() => page.getByTestId("incident-banner").textContent(), { timeout: 20_000 }).toContain(`Incident #${number} open`);
    expect(await page.getByTestId("incident-banner").textContent()).toContain("probable origin session-store");
    await screenshot(page, "incidents-overview-banner");
    await page.getByRole("link", { name: "Open the incident screen" }).click();
    await page.waitForURL((u) => u.pathname === "/environments/production/incidents");
    await page.getByRole("link", { name: "Show on the map" }).click();
    await page.waitForURL((u) => u.searchParams.get("incident") === "current");
    await expect.poll(() => page.getByTestId("incident-overlay").textContent(), { timeout: 30_000 }).toContain("session-store");
    await expect.poll(() => page.locator('.pp-node[data-incident="origin"]').count(), { timeout: 60_000 }).toBe(1);
    expect(await page.locator('.pp-node[data-incident="origin"]').textContent()).toContain("probable origin");
    await screenshot(page, "incidents-map-overlay");
  });

  it("lets an admin name the alert labels that name a component, in the environment's settings", async () => {
    await page.goto(`${baseUrl()}/environments/production/reviews`);
    const field = page.getByLabel(/Alert labels that name a component/);
    await expect.poll(() => field.inputValue(), { timeout: 20_000 }).toBe("service, app, job");
    await field.fill("service, app, job, k8s_app");
    await page.getByRole("form", { name: "Analysis settings" }).getByRole("button", { name: "Save" }).click();
    await expect.poll(() => page.getByRole("form", { name: "Analysis settings" }).getByRole("status").textContent()).toContain("Saved");
    const res = await page.request.get(`${baseUrl()}/api/v1/environments/production/settings`);
    expect(((await res.json()) as { settings: { alertLabels: string[] } }).settings.alertLabels).toEqual(["service", "app", "job", "k8s_app"]);
    await screenshot(page, "incidents-settings");
  });

  it("closes the incident when every alert resolves and keeps it in history with its origin", async () => {
    await page.goto(`${baseUrl()}/environments/production/incidents`);
    await expect.poll(() => page.getByTestId("origin").count(), { timeout: 20_000 }).toBeGreaterThan(0);
    const resolved = await sendAlerts("resolved");
    expect(resolved.incident).toMatchObject({ number, status: "resolved" });
    await expect.poll(() => page.getByTestId("incident-status").textContent(), { timeout: 30_000 }).toContain("No alerts firing.");
    const row = page.getByTestId("incident-history").locator("tbody tr").first();
    expect(await row.textContent()).toContain(`#${number}`);
    expect(await row.textContent()).toContain("session-store");
    expect(await page.getByTestId("causes").textContent()).toContain("session-store");
    await screenshot(page, "incidents-history");
    await row.getByRole("link", { name: `#${number}` }).click();
    await page.waitForURL((u) => u.pathname === `/environments/production/incidents/${number}`);
    await expect.poll(() => page.getByTestId("stored-ranking").textContent()).toContain("session-store");
    expect(await page.getByTestId("incident-alerts").locator("tbody tr").count()).toBe(7);
    await screenshot(page, "incidents-detail");
  });
});
