import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { mergeSources, placeholderComponent } from "@/lib/inventory/merge";
import { diffSnapshots, type SnapshotContent, snapshotHash } from "@/lib/inventory/snapshot";
import type { NormalisedInventory } from "@/lib/inventory/types";

const EMPTY: SnapshotContent = { components: [], dependencies: [] };

function inventory(yaml: string): NormalisedInventory {
  const r = importInventory({ format: "pinchpoint", body: yaml });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.inventory;
}

const storefront = inventory(`pinchpoint: 1
source: storefront-repo
components:
  - key: web-frontend
    kind: service
    needs: [basket, session-store]
  - key: basket
    kind: service
    needs: [{ any_of: [orders-db, orders-replica] }]
`);

const platform = inventory(`pinchpoint: 1
source: platform-repo
components:
  - key: session-store
    kind: cache
  - key: orders-db
    kind: datastore
`);

const keys = (c: SnapshotContent) => c.components.map((x) => `${x.key}:${x.kind}:${x.source ?? "-"}`);

describe("mergeSources", () => {
  it("needs on keys nobody declares become undeclared placeholders, with a warning each", () => {
    const r = mergeSources({ existing: EMPTY, source: "storefront-repo", incoming: storefront });
    expect(r.conflicts).toEqual([]);
    expect(keys(r.content)).toEqual([
      "basket:service:storefront-repo",
      "orders-db:undeclared:-",
      "orders-replica:undeclared:-",
      "session-store:undeclared:-",
      "web-frontend:service:storefront-repo",
    ]);
    expect(r.content.components.find((c) => c.key === "orders-db")).toEqual(placeholderComponent("orders-db"));
    expect(r.placeholdersCreated).toEqual(["orders-db", "orders-replica", "session-store"]);
    expect(r.placeholdersRemoved).toEqual([]);
    expect(r.warnings.map((w) => [w.path, w.message])).toEqual([
      ["components[0].needs", expect.stringMatching(/"web-frontend" needs "session-store", which no source declares/)],
      ["components[1].needs", expect.stringMatching(/"basket" needs "orders-db"/)],
      ["components[1].needs", expect.stringMatching(/"basket" needs "orders-replica"/)],
    ]);
    expect(r.content.dependencies).toHaveLength(4);
  });

  it("a placeholder disappears when a source declares it; another source's components stay", () => {
    const first = mergeSources({ existing: EMPTY, source: "storefront-repo", incoming: storefront });
    const second = mergeSources({ existing: first.content, source: "platform-repo", incoming: platform });
    expect(second.placeholdersCreated).toEqual([]);
    expect(second.placeholdersRemoved).toEqual(["orders-db", "session-store"]);
    expect(keys(second.content)).toEqual([
      "basket:service:storefront-repo",
      "orders-db:datastore:platform-repo",
      "orders-replica:undeclared:-",
      "session-store:cache:platform-repo",
      "web-frontend:service:storefront-repo",
    ]);
  });

  it("a push replaces exactly what its source declared before", () => {
    const base = mergeSources({
      existing: mergeSources({ existing: EMPTY, source: "storefront-repo", incoming: storefront }).content,
      source: "platform-repo",
      incoming: platform,
    }).content;
    const smaller = inventory(`pinchpoint: 1
source: storefront-repo
components:
  - key: web-frontend
    kind: gateway
    needs: [session-store]
`);
    const r = mergeSources({ existing: base, source: "storefront-repo", incoming: smaller });
    // basket is gone with its dependencies; orders-replica, needed only by basket, is no longer needed.
    expect(keys(r.content)).toEqual(["orders-db:datastore:platform-repo", "session-store:cache:platform-repo", "web-frontend:gateway:storefront-repo"]);
    expect(r.placeholdersRemoved).toEqual(["orders-replica"]);
    expect(r.content.dependencies.map((d) => `${d.from}>${d.to}`)).toEqual(["web-frontend>session-store"]);
    const diff = diffSnapshots(base, r.content);
    expect(diff.componentsRemoved.map((c) => c.key)).toEqual(["basket", "orders-replica"]);
    expect(diff.componentsChanged).toEqual([{ key: "web-frontend", changes: { kind: { before: "service", after: "gateway" } } }]);
  });

  it("a component its source drops, but others still need, turns back into a placeholder", () => {
    const base = mergeSources({
      existing: mergeSources({ existing: EMPTY, source: "platform-repo", incoming: platform }).content,
      source: "storefront-repo",
      incoming: storefront,
    }).content;
    const r = mergeSources({ existing: base, source: "platform-repo", incoming: { ...platform, components: [] } });
    expect(r.placeholdersCreated).toEqual(["orders-db", "session-store"]);
  });

  it("a key declared by two sources is a conflict naming both, and nothing is merged", () => {
    const base = mergeSources({ existing: EMPTY, source: "platform-repo", incoming: platform }).content;
    const rival = inventory("pinchpoint: 1\nsource: cache-team-repo\ncomponents:\n  - key: session-store\n    kind: cache\n");
    const r = mergeSources({ existing: base, source: "cache-team-repo", incoming: rival });
    expect(r.conflicts).toEqual([
      { key: "session-store", sources: ["platform-repo", "cache-team-repo"], message: '"session-store" is already declared by source "platform-repo"; a key belongs to one source' },
    ]);
    expect(snapshotHash(r.content)).toBe(snapshotHash(base));
  });

  it("is idempotent: the same inventory pushed twice gives the same content and hash", () => {
    const once = mergeSources({ existing: EMPTY, source: "storefront-repo", incoming: storefront });
    const twice = mergeSources({ existing: once.content, source: "storefront-repo", incoming: storefront });
    expect(twice.content).toEqual(once.content);
    expect(snapshotHash(twice.content)).toBe(snapshotHash(once.content));
    expect(twice.placeholdersCreated).toEqual([]);
    expect(twice.placeholdersRemoved).toEqual([]);
    // Pushes from two sources commute.
    const ab = mergeSources({ existing: once.content, source: "platform-repo", incoming: platform }).content;
    const ba = mergeSources({
      existing: mergeSources({ existing: EMPTY, source: "platform-repo", incoming: platform }).content,
      source: "storefront-repo",
      incoming: storefront,
    }).content;
    expect(snapshotHash(ab)).toBe(snapshotHash(ba));
  });
});

describe("aliases (DESIGN §10: keys and aliases are one namespace; a need on an alias is a need on the component)", () => {
  const cart = inventory(`pinchpoint: 1
source: cart-repo
components:
  - key: cart
    kind: service
    aliases: [cartservice]
`);
  const front = inventory(`pinchpoint: 1
source: front-repo
components:
  - key: web
    kind: service
    needs: [cartservice, { key: cart, strength: soft }]
`);

  it("resolves a need written as an alias onto the component, kept apart from a need written as the key", () => {
    const first = mergeSources({ existing: EMPTY, source: "cart-repo", incoming: cart }).content;
    const r = mergeSources({ existing: first, source: "front-repo", incoming: front });
    expect(r.conflicts).toEqual([]);
    expect(r.content.dependencies).toEqual([
      { from: "web", to: "cart", strength: "soft", group: null, via: null, source: "front-repo" },
      { from: "web", to: "cart", strength: "hard", group: null, via: null, source: "front-repo", written: "cartservice" },
    ]);
    expect(r.content.components.map((c) => c.key)).toEqual(["cart", "web"]);
  });

  it("needs pushed before the alias existed resolve when it arrives, and fall back when it goes", () => {
    const early = mergeSources({ existing: EMPTY, source: "front-repo", incoming: inventory(`pinchpoint: 1
source: front-repo
components:
  - key: web
    kind: service
    needs: [cartservice]
`) }).content;
    expect(early.components.find((c) => c.key === "cartservice")?.kind).toBe("undeclared");
    const withAlias = mergeSources({ existing: early, source: "cart-repo", incoming: cart });
    expect(withAlias.aliasesChanged).toBe(true);
    expect(withAlias.content.dependencies).toEqual([
      { from: "web", to: "cart", strength: "hard", group: null, via: null, source: "front-repo", written: "cartservice" },
    ]);
    expect(withAlias.placeholdersRemoved).toEqual(["cartservice"]);
    const gone = mergeSources({ existing: withAlias.content, source: "cart-repo", incoming: inventory(`pinchpoint: 1
source: cart-repo
components:
  - key: cart
    kind: service
`) });
    expect(gone.content.dependencies.map((d) => `${d.from}->${d.to}`)).toEqual(["web->cartservice"]);
    expect(gone.placeholdersCreated).toEqual(["cartservice"]);
  });

  it("an alias that is another component's key or alias is a conflict naming both sources, and nothing merges", () => {
    const first = mergeSources({ existing: EMPTY, source: "cart-repo", incoming: cart }).content;
    const clash = mergeSources({ existing: first, source: "other-repo", incoming: inventory(`pinchpoint: 1
source: other-repo
components:
  - key: basket
    kind: service
    aliases: [cart]
  - key: cartservice-v2
    kind: service
    aliases: [cartservice]
`) });
    expect(clash.conflicts.map((c) => [c.key, c.sources])).toEqual([
      ["cart", ["cart-repo", "other-repo"]],
      ["cartservice", ["cart-repo", "other-repo"]],
    ]);
    expect(clash.conflicts[0]!.message).toMatch(/"cart" is a component key \(source "cart-repo"\) and an alias of "basket"/);
    expect(clash.content).toEqual(first);
  });

  it("a need on one's own alias is left out with a warning", () => {
    const r = mergeSources({ existing: EMPTY, source: "cart-repo", incoming: inventory(`pinchpoint: 1
source: cart-repo
components:
  - key: cart
    kind: service
    aliases: [cartservice]
    needs: [cartservice]
`) });
    expect(r.content.dependencies).toEqual([]);
    expect(r.warnings.map((w) => w.message)).toContain('"cart" needs "cartservice", which is one of its own aliases; the need is left out');
  });

  it("content without aliases or provenance hashes as it did before those fields existed", () => {
    // The canonical JSON of a one-component, one-need graph written out by hand in the form older
    // snapshots stored: no `aliases`, no `provenance`, no `written`.
    const older = {
      components: [{ key: "a", name: "a", kind: "service", team: null, tier: 3, replicas: 1, zones: [], tags: [], links: {}, source: "s" }],
      dependencies: [{ from: "a", to: "b", strength: "hard", group: null, via: null, source: "s" }],
    };
    const same: SnapshotContent = {
      components: [{ ...(older.components[0] as SnapshotContent["components"][number]), aliases: [] }],
      dependencies: [{ ...(older.dependencies[0] as SnapshotContent["dependencies"][number]), provenance: ["declared"] }],
    };
    expect(snapshotHash(same)).toBe(createHash("sha256").update(JSON.stringify(older)).digest("hex"));
    expect(diffSnapshots(older as SnapshotContent, same).dependenciesChanged).toEqual([]);
  });
});
