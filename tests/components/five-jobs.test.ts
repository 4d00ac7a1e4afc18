// Pure pieces of the five jobs' screens: who to page first, the pasted outage summary, the
// environment switcher's paths, the "What is down?" parsing.
import { describe, expect, it } from "vitest";
import { drillPageOrder, incidentSummary } from "@/components/drills/summary";
import { pathInEnvironment } from "@/components/shell/EnvironmentSwitcher";
import { typedKeys } from "@/components/shell/DownSearch";
import { isScratchEnvironment } from "@/components/shell/nav";
import type { DrillResponse } from "@/lib/api/schemas/analysis";

const result: DrillResponse = {
  snapshot: { id: "s", number: 7, createdAt: "2025-03-04T05:06:07.000Z", components: 10, undeclaredShare: 0.1 },
  failed: { components: ["payments-db"], zones: [] },
  down: ["payments-db", "payment-orchestrator", "checkout-web", "label-printer"],
  degraded: ["order-history"],
  teams: [
    { team: null, contact: null, down: ["label-printer"], degraded: [] },
    { team: "storefront", contact: { slug: "storefront", name: "Storefront", email: "sf@example.test", oncall: "sf-oncall" }, down: ["checkout-web"], degraded: ["order-history"] },
    { team: "payments", contact: { slug: "payments", name: "Payments", email: "pay@example.test", oncall: null }, down: ["payments-db", "payment-orchestrator"], degraded: [] },
  ],
  byTier: { "1": 3, "2": 0, "3": 1, "4": 0 },
} as unknown as DrillResponse;

describe("who to page after a failure", () => {
  it("pages the failed component's owners first, then by how much is down, unowned last", () => {
    expect(drillPageOrder(result).map((t) => t.team)).toEqual(["payments", "storefront", null]);
  });

  it("an outage summary names the tier 1 casualties, the UTC time, the snapshot and the link", () => {
    const tiers: Record<string, number> = { "payments-db": 1, "payment-orchestrator": 1, "checkout-web": 1, "label-printer": 3 };
    const text = incidentSummary({ env: "production", result, undeclared: new Set(), link: "https://pp.example/environments/production/drills?fail=payments-db&down=1", outage: true, tierOf: (k) => tiers[k], now: new Date("2025-03-04T05:30:00Z") });
    const lines = text.split("\n");
    expect(lines[0]).toBe("Pinchpoint outage view, production, 2025-03-04 05:30 UTC: component payments-db is down");
    expect(text).toContain("Tier 1 down with it: payment-orchestrator, checkout-web");
    expect(text).toContain("From snapshot #7, pushed 2025-03-04 05:06 UTC");
    expect(lines.indexOf("- Payments (payments): 2 down, 0 degraded; pay@example.test")).toBeLessThan(lines.findIndex((l) => l.startsWith("- Storefront")));
    expect(lines.at(-1)).toBe("https://pp.example/environments/production/drills?fail=payments-db&down=1");
  });
});

describe("header", () => {
  it("keeps the screen when switching environments, and goes to the list from one component", () => {
    expect(pathInEnvironment("/environments/production/pinch-points", "production", "staging")).toBe("/environments/staging/pinch-points");
    expect(pathInEnvironment("/environments/production/components/payments-db", "production", "staging")).toBe("/environments/staging/components");
    expect(pathInEnvironment("/teams", "production", "staging")).toBe("/environments/staging");
  });

  it("lists test and scratch environments apart by their name", () => {
    expect(["production", "staging", "scratch-ana", "load-test", "test"].filter(isScratchEnvironment)).toEqual(["scratch-ana", "load-test", "test"]);
  });

  it("reads several keys typed into What is down?", () => {
    expect(typedKeys(" payments-db, dns-resolver  ")).toEqual(["payments-db", "dns-resolver"]);
  });
});
