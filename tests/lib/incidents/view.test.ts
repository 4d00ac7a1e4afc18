// Who to page and the pasted summary (lib/incidents/view.ts), on hand-derived origin results.
import { describe, expect, it } from "vitest";
import { buildGraph } from "@/lib/analysis/graph";
import { probableOrigin } from "@/lib/analysis/origin";
import { incidentSummaryText, lift, pageOrder, utc } from "@/lib/incidents/view";
import { node } from "../../analysis/helpers";

// db (data) ← api (orders) ← web (shop), mobile (shop); cache (nobody) ← api, softly.
const graph = buildGraph({
  nodes: [node("db", { team: "data", tier: 1 }), node("api", { team: "orders", tier: 1 }), node("web", { team: "shop", tier: 1 }), node("mobile", { team: "shop", tier: 2 }), node("cache", { team: null })],
  edges: [
    { from: "api", to: "db", strength: "hard", group: null },
    { from: "web", to: "api", strength: "hard", group: null },
    { from: "mobile", to: "api", strength: "hard", group: null },
    { from: "api", to: "cache", strength: "soft", group: null },
  ],
});
const teamOf = (k: string) => graph.team[graph.indexOf.get(k)!] ?? null;
const contacts = new Map([["data", { slug: "data", name: "Data platform", email: "data@example.test", oncall: "data rota" }]]);

describe("who to page", () => {
  it("origin's owners first, then the firing components' teams (most first), then those likely next", () => {
    const r = probableOrigin(graph, ["db", "api", "web"]);
    const page = pageOrder(r, teamOf, contacts);
    expect(page.map((p) => [p.team, p.reasons, p.origin, p.firing, p.predicted])).toEqual([
      ["data", ["origin"], ["db"], [], []],
      ["orders", ["firing"], [], ["api"], []],
      ["shop", ["firing", "predicted"], [], ["web"], ["mobile"]],
    ]);
    expect(page[0]!.contact).toMatchObject({ oncall: "data rota" });
  });

  it("lists components nobody owns as their own entry, where they fall", () => {
    const r = probableOrigin(graph, ["cache", "api"]);
    // cache's failure degrades api (a soft need): cache is the origin, and nobody owns it.
    expect(r.origins.map((o) => [o.key, o.degraded])).toEqual([["cache", ["api"]]]);
    expect(pageOrder(r, teamOf, contacts).map((p) => [p.team, p.reasons])).toEqual([
      [null, ["origin"]],
      ["orders", ["firing"]],
    ]);
  });
});

describe("the summary a responder pastes", () => {
  it("says the origin with both readings, the pages in order, absolute UTC times, the snapshot and the caution", () => {
    const r = probableOrigin(graph, ["db", "api", "web"]);
    const text = incidentSummaryText({
      env: "production",
      incident: { number: 7, openedAt: "2026-12-02T09:14:30Z" },
      alertCount: 4,
      result: r,
      page: pageOrder(r, teamOf, contacts),
      unknownAlerts: [{ value: "payments-gw", label: "service", alerts: 1 }],
      snapshot: { number: 12, createdAt: "2026-12-01T18:03:00Z" },
      now: new Date("2026-12-02T09:31:00Z"),
      link: "http://127.0.0.1:3000/environments/production/incidents",
    });
    const lines = text.split("\n");
    expect(lines[0]).toBe("Pinchpoint incident #7, production: open since 2026-12-02 09:14 UTC; 4 alerts on 3 components firing at 2026-12-02 09:31 UTC.");
    expect(lines[1]).toBe("Probable origin: db — explains 3 of 3 firing.");
    expect(text).toContain("Likely to fail next (not firing yet): 1 down — mobile; 0 degraded.");
    expect(text).toContain("Alerts naming no known component: 1 — service=payments-gw.");
    expect(text).toContain("1. Data platform (data): owns the probable origin db — on-call data rota, data@example.test");
    expect(text).toContain("2. orders (orders): 1 firing — no contact on file");
    expect(text).toContain("Read against snapshot #12, pushed 2026-12-01 18:03 UTC.");
    expect(text).toContain("not a diagnosis");
    expect(lines.at(-1)).toBe("http://127.0.0.1:3000/environments/production/incidents");
  });

  it("formats times in UTC whatever the input's offset, and the walk's lift", () => {
    expect(utc("2026-12-02T01:05:00+02:00")).toBe("2026-12-01 23:05 UTC");
    expect(lift({ score: 0.3, usual: 0.02 })).toBe("×15");
    expect(lift({ score: 0.03, usual: 0.02 })).toBe("×1.5");
  });
});
