// Observed edges laid over the declared graph (lib/inventory/observed.ts): the rules of DESIGN §10
// worked by hand on small graphs.
import { describe, expect, it } from "vitest";
import { mergeSources } from "@/lib/inventory/merge";
import { applyObserved, OBSERVED_SOURCE, stripObserved, type ObservedPair } from "@/lib/inventory/observed";
import { snapshotHash, type SnapshotContent } from "@/lib/inventory/snapshot";
import type { InventoryComponent, NormalisedInventory } from "@/lib/inventory/types";

const component = (key: string, extra: Partial<InventoryComponent> = {}): InventoryComponent => ({
  key, name: key, kind: "service", team: "shop", tier: 3, replicas: 2, zones: [], tags: [], links: {}, aliases: [], needs: [], ...extra,
});
const inventory = (source: string, components: InventoryComponent[]): NormalisedInventory => ({ source, environment: null, components, observedEdges: [], warnings: [] });
const EMPTY: SnapshotContent = { components: [], dependencies: [] };
const pair = (from: string, to: string, toKind: ObservedPair["toKind"] = "service", via: string | null = "http"): ObservedPair => ({ from, to, toKind, via });

describe("observed edges in the graph", () => {
  it("a trace-only environment: every name a weak component of the pseudo-source, every pair an observed-only need", () => {
    const g = applyObserved(EMPTY, [pair("frontend", "cart"), pair("cart", "redis-cart", "datastore", "redis")]);
    expect(g.components.map((c) => [c.key, c.kind, c.source])).toEqual([
      ["cart", "service", OBSERVED_SOURCE],
      ["frontend", "service", OBSERVED_SOURCE],
      ["redis-cart", "datastore", OBSERVED_SOURCE],
    ]);
    expect(g.dependencies.map((d) => [d.from, d.to, d.strength, d.provenance, d.via])).toEqual([
      ["cart", "redis-cart", "hard", ["observed"], "redis"],
      ["frontend", "cart", "hard", ["observed"], "http"],
    ]);
  });

  it("a declared need that traces confirm is marked observed, not doubled; trace names resolve through aliases", () => {
    const declared = mergeSources({
      existing: EMPTY,
      source: "shop-repo",
      incoming: inventory("shop-repo", [
        component("frontend", { needs: [{ type: "single", key: "cart", strength: "hard", via: null }] }),
        component("cart", { aliases: ["cartservice"] }),
      ]),
    }).content;
    const g = applyObserved(declared, [pair("frontend", "cartservice"), pair("cartservice", "redis")]);
    expect(g.dependencies.map((d) => [d.from, d.to, d.source, d.provenance ?? ["declared"]])).toEqual([
      ["cart", "redis", OBSERVED_SOURCE, ["observed"]],
      ["frontend", "cart", "shop-repo", ["declared", "observed"]],
    ]);
    // Only `redis` is unknown to the files; cart and frontend stay the declared components.
    expect(g.components.filter((c) => c.source === OBSERVED_SOURCE).map((c) => c.key)).toEqual(["redis"]);
    // Taking the overlay off gives the declared graph back, hash for hash.
    expect(snapshotHash(stripObserved(g))).toBe(snapshotHash(declared));
  });

  it("weak components yield: a placeholder gives way to one, and a source declaring its key later takes it over without a conflict", () => {
    const declared = mergeSources({
      existing: EMPTY,
      source: "shop-repo",
      incoming: inventory("shop-repo", [component("frontend", { needs: [{ type: "single", key: "payments", strength: "hard", via: null }] })]),
    }).content;
    expect(declared.components.find((c) => c.key === "payments")?.kind).toBe("undeclared");
    const withTraces = applyObserved(declared, [pair("payments", "ledger-db", "datastore")]);
    expect(withTraces.components.find((c) => c.key === "payments")).toMatchObject({ kind: "service", source: OBSERVED_SOURCE });

    // The payments team now declares it: merged against the declared graph alone, then the traces laid over again.
    const merged = mergeSources({ existing: stripObserved(withTraces), source: "payments-repo", incoming: inventory("payments-repo", [component("payments", { team: "payments" })]) });
    expect(merged.conflicts).toEqual([]);
    const next = applyObserved(merged.content, [pair("payments", "ledger-db", "datastore")]);
    expect(next.components.find((c) => c.key === "payments")).toMatchObject({ source: "payments-repo", team: "payments" });
    expect(next.dependencies.find((d) => d.from === "payments")).toMatchObject({ to: "ledger-db", source: OBSERVED_SOURCE, provenance: ["observed"] });
  });

  it("a name that calls something is a service, whatever else named it", () => {
    const g = applyObserved(EMPTY, [pair("api", "search", "datastore"), pair("search", "index-db", "datastore")]);
    expect(g.components.find((c) => c.key === "search")?.kind).toBe("service");
  });
});
