// Drift as an SRE meets it: a team's declared file and a trace file pushed to an environment of this
// test's own (so no other test, and no order of tests, changes what it sees), then the drift screen
// lists the traced call no file declares, with its traffic and a snippet to declare it, and the
// declared needs no trace shows. A second environment with no traces shows how to send some.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import type { DriftResponse as Drift } from "@/lib/api/schemas/drift";
import { baseUrl, browserForFile, screenshot } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();
const ENV = "drift-e2e";
const QUIET = "drift-e2e-quiet";

let page: Page;

const FILE = `pinchpoint: 1
source: storefront-repo
components:
  - { key: web-frontend, kind: service, team: storefront, needs: [storefront-bff] }
  - { key: storefront-bff, kind: service, team: storefront, needs: [cart-service, session-service] }
  - { key: cart-service, kind: service, team: storefront }
  - { key: session-service, kind: service, team: identity }
`;

const span = (traceId: string, spanId: string, parentSpanId: string, kind: number, attrs: Record<string, string> = {}) => ({
  traceId,
  spanId,
  parentSpanId,
  name: "op",
  kind,
  startTimeUnixNano: "1767225600000000000",
  endTimeUnixNano: "1767225600020000000",
  attributes: Object.entries(attrs).map(([key, v]) => ({ key, value: { stringValue: v } })),
});
const service = (name: string, spans: ReturnType<typeof span>[]) => ({
  resource: { attributes: [{ key: "service.name", value: { stringValue: name } }] },
  scopeSpans: [{ spans }],
});

// web-frontend → storefront-bff and storefront-bff → cart-service are declared; storefront-bff →
// pricing-service is not. Each call is named by its SERVER child.
const T = "0af7651916cd43dd8448eb211c80319c";
const TRACE = {
  resourceSpans: [
    service("web-frontend", [span(T, "a000000000000001", "", 2), span(T, "a000000000000002", "a000000000000001", 3, { "server.address": "bff" })]),
    service("storefront-bff", [
      span(T, "b000000000000001", "a000000000000002", 2),
      span(T, "b000000000000002", "b000000000000001", 3, { "peer.service": "cart-service" }),
      span(T, "b000000000000003", "b000000000000001", 3, { "peer.service": "pricing-service" }),
    ]),
    service("cart-service", [span(T, "c000000000000001", "b000000000000002", 2)]),
    service("pricing-service", [span(T, "d000000000000001", "b000000000000003", 2)]),
  ],
};

async function push(env: string, query: string, body: string, contentType: string): Promise<{ status: number; json: unknown }> {
  const res = await page.request.post(`${baseUrl()}/api/v1/environments/${env}/inventory${query}`, { headers: { "content-type": contentType, origin: baseUrl() }, data: body });
  return { status: res.status(), json: await res.json() };
}

beforeAll(async () => {
  page = await signedInPage(browser(), "admin", { width: 1366, height: 900 });
  expect((await push(ENV, "", FILE, "application/yaml")).status).toBe(200);
  expect((await push(QUIET, "", FILE, "application/yaml")).status).toBe(200);
  const traced = await push(ENV, "?format=otlp&source=e2e-traces", JSON.stringify(TRACE), "application/json");
  expect(traced.status).toBe(200);
  // Three calls, three pairs; the undeclared one becomes an observed need in the graph.
  expect(traced.json).toMatchObject({ changed: true, observed: { edges: 3, calls: 3 } });
});

describe("drift screen", () => {
  it("explains how to send traces where there are none", async () => {
    await page.goto(`${baseUrl()}/environments/${QUIET}/drift`);
    await page.getByTestId("drift-no-traces").waitFor();
    const text = (await page.getByTestId("drift-no-traces").textContent()) ?? "";
    expect(text).toContain(`/api/v1/environments/${QUIET}/otlp`);
    expect(text).toContain("format=otlp&source=");
    expect(await page.locator("table").count()).toBe(0);
    await screenshot(page, "drift-empty");
  });

  it("lists the undeclared traced call with its traffic and a snippet to declare it, and the declared needs no trace shows", async () => {
    await page.goto(`${baseUrl()}/environments/${ENV}/drift`);
    const seen = page.getByTestId("seen-not-declared-row");
    await expect.poll(() => seen.count(), { timeout: 15_000 }).toBe(1);
    const row = (await seen.first().textContent()) ?? "";
    expect(row).toContain("storefront-bff");
    expect(row).toContain("pricing-service");
    expect(row).toContain("storefront-repo");
    expect(await seen.first().getByTestId("drift-traffic").textContent()).toMatch(/\/min/);
    expect(await seen.first().getByRole("link", { name: "pricing-service" }).getAttribute("href")).toBe(`/environments/${ENV}/components/pricing-service`);

    await seen.first().getByTestId("declare-need").click();
    const snippet = (await seen.first().getByTestId("declare-need-snippet").textContent()) ?? "";
    expect(snippet).toContain("- key: storefront-bff");
    expect(snippet).toContain("- key: pricing-service");

    const api = (await (await page.request.get(`${baseUrl()}/api/v1/environments/${ENV}/drift`)).json()) as Drift;
    expect(api.agreeing).toBe(2);
    expect(api.declaredNotSeen.items).toEqual([{ from: "storefront-bff", to: "session-service", strength: "hard", source: "storefront-repo", team: "storefront", anyOf: false }]);
    expect(await page.getByTestId("declared-not-seen-row").count()).toBe(1);
    expect(await page.getByRole("heading", { name: "Declared, never seen in traces (1)" }).count()).toBe(1);
    expect(await page.getByTestId("observed-sources").textContent()).toContain("e2e-traces");
    expect(await page.getByTestId("observed-sources").textContent()).toContain("UTC");
    // Drift is a reference screen, behind the header's closed "More" menu, which names the screen it is on.
    expect(await page.getByRole("navigation", { name: "Main" }).locator("summary").textContent()).toContain("More: Drift");
    expect(await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Drift", includeHidden: true }).getAttribute("aria-current")).toBe("page");
    await screenshot(page, "drift");
  });
});
