// Drift as an SRE meets it: an admin pushes a small OTLP/JSON trace export to `production`, then
// the drift screen lists the traced call that no file declares and the declared needs no trace shows.
// Writes only the observed edges of source `e2e-traces`, which no other test reads; traces never
// change the declared graph, the snapshots or the rankings.
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import type { Drift } from "@/lib/data/drift";
import { baseUrl, screenshot, browserForFile } from "./browser";
import { signedInPage } from "./pages/signin";

const browser = browserForFile();

let page: Page;

beforeAll(async () => {
  page = await signedInPage(browser(), "admin", { width: 1366, height: 900 });
});

const span = (traceId: string, spanId: string, parentSpanId: string, kind: number, peer?: string) => ({
  traceId,
  spanId,
  parentSpanId,
  name: "op",
  kind,
  ...(peer ? { attributes: [{ key: "peer.service", value: { stringValue: peer } }] } : {}),
});
const service = (name: string, spans: ReturnType<typeof span>[]) => ({
  resource: { attributes: [{ key: "service.name", value: { stringValue: name } }] },
  scopeSpans: [{ spans }],
});

// web-frontend → storefront-bff and storefront-bff → cart-service are declared in the demo
// (storefront.yaml); storefront-bff → pricing-service is not.
const T = "0af7651916cd43dd8448eb211c80319c";
const TRACE = {
  resourceSpans: [
    service("web-frontend", [span(T, "a000000000000001", "", 2), span(T, "a000000000000002", "a000000000000001", 3, "storefront-bff")]),
    service("storefront-bff", [
      span(T, "b000000000000001", "a000000000000002", 2),
      span(T, "b000000000000002", "b000000000000001", 3, "cart-service"),
      span(T, "b000000000000003", "b000000000000001", 3, "pricing-service"),
    ]),
    service("cart-service", [span(T, "c000000000000001", "b000000000000002", 2)]),
    service("pricing-service", [span(T, "d000000000000001", "b000000000000003", 2)]),
  ],
};

describe("drift screen", () => {
  it("explains how to push traces while there are none", async () => {
    const before = (await (await page.request.get(`${baseUrl()}/api/v1/environments/production/drift`)).json()) as Drift;
    // The demo seeds no traces; skip the empty state if another run already pushed some.
    if (before.observedSources.length > 0) return;
    await page.goto(`${baseUrl()}/environments/production/drift`);
    await page.getByTestId("drift-no-traces").waitFor();
    expect(await page.getByTestId("drift-no-traces").textContent()).toContain("format=otlp&source=");
    expect(await page.locator("table").count()).toBe(0);
    await screenshot(page, "drift-empty");
  });

  it("lists the undeclared traced call and the declared needs no trace shows", async () => {
    const res = await page.request.post(`${baseUrl()}/api/v1/environments/production/inventory?format=otlp&source=e2e-traces`, {
      headers: { "content-type": "application/json" },
      data: JSON.stringify(TRACE),
    });
    expect(res.status()).toBe(200);
    const pushed = (await res.json()) as { changed: boolean; observed?: { edges: number } };
    expect(pushed.changed).toBe(false);
    // 3 pairs, each with peer.service and span-parent evidence
    expect(pushed.observed?.edges).toBe(6);

    await page.goto(`${baseUrl()}/environments/production/drift`);
    const seen = page.getByTestId("seen-not-declared-row");
    await expect.poll(() => seen.count(), { timeout: 15_000 }).toBe(1);
    const row = (await seen.first().textContent()) ?? "";
    expect(row).toContain("storefront-bff");
    expect(row).toContain("pricing-service");
    expect(row).toContain("storefront-repo");
    expect(await seen.first().getByRole("link", { name: "pricing-service" }).getAttribute("href")).toBe("/environments/production/components/pricing-service");

    const api = (await (await page.request.get(`${baseUrl()}/api/v1/environments/production/drift`)).json()) as Drift;
    expect(api.agreeing).toBe(2);
    expect(await page.getByTestId("declared-not-seen-row").count()).toBe(api.declaredNotSeen.length);
    expect(api.declaredNotSeen.every((d) => d.from === "web-frontend" || d.from === "storefront-bff")).toBe(true);
    expect(api.declaredNotSeen.some((d) => d.from === "storefront-bff" && d.to === "session-service")).toBe(true);
    expect(await page.getByRole("heading", { name: `Declared, never seen in traces (${api.declaredNotSeen.length})` }).count()).toBe(1);
    expect(await page.getByTestId("observed-sources").textContent()).toContain("e2e-traces");
    expect(await page.getByTestId("observed-sources").textContent()).toContain("UTC");
    await expect.poll(() => page.getByRole("link", { name: "Drift" }).getAttribute("aria-current")).toBe("page");
    await screenshot(page, "drift");
  });
});
