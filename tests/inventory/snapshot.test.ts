import { describe, expect, it } from "vitest";
import {
  anyOfGroupId,
  canonicaliseSnapshot,
  diffSnapshots,
  inventoryToSnapshotParts,
  type SnapshotComponent,
  type SnapshotContent,
  snapshotHash,
} from "@/lib/inventory/snapshot";
import type { InventoryComponent } from "@/lib/inventory/types";

const comp = (key: string, over: Partial<SnapshotComponent> = {}): SnapshotComponent => ({
  key,
  name: key,
  kind: "service",
  team: null,
  tier: 3,
  replicas: 1,
  zones: [],
  tags: [],
  links: {},
  source: "storefront-repo",
  ...over,
});

const web: InventoryComponent = {
  key: "web-frontend",
  name: "Web frontend",
  kind: "service",
  team: "storefront",
  tier: 1,
  replicas: 3,
  zones: ["zone-b", "zone-a"],
  tags: [],
  links: { runbook: "https://wiki.harbor-pantry.example/r", repo: "https://git.harbor-pantry.example/s" },
  aliases: [],
  needs: [
    { type: "single", key: "api-gateway", strength: "hard", via: null },
    { type: "any_of", keys: ["search-primary", "search-fallback"], strength: "soft", via: "http" },
  ],
};

describe("inventoryToSnapshotParts", () => {
  it("one dependency per single need; an any_of group one per member with a stable group id", () => {
    const parts = inventoryToSnapshotParts({ components: [web], source: "storefront-repo" });
    expect(parts.components).toEqual([
      comp("web-frontend", { name: "Web frontend", team: "storefront", tier: 1, replicas: 3, zones: ["zone-a", "zone-b"], links: { repo: "https://git.harbor-pantry.example/s", runbook: "https://wiki.harbor-pantry.example/r" } }),
    ]);
    const group = "web-frontend#any:search-fallback,search-primary";
    expect(anyOfGroupId("web-frontend", ["search-primary", "search-fallback"])).toBe(group);
    expect(parts.dependencies).toEqual([
      { from: "web-frontend", to: "api-gateway", strength: "hard", group: null, via: null, source: "storefront-repo" },
      { from: "web-frontend", to: "search-primary", strength: "soft", group, via: "http", source: "storefront-repo" },
      { from: "web-frontend", to: "search-fallback", strength: "soft", group, via: "http", source: "storefront-repo" },
    ]);
  });
});

describe("canonical form and hash", () => {
  const a: SnapshotContent = {
    components: [comp("b", { tags: ["y", "x", "x"] }), comp("a")],
    dependencies: [
      { from: "b", to: "a", strength: "hard", group: null, via: null, source: "s" },
      { from: "a", to: "c", strength: "soft", group: "a#any:c,d", via: null, source: "s" },
      { from: "a", to: "c", strength: "hard", group: null, via: null, source: "s" },
    ],
  };
  const shuffled: SnapshotContent = {
    components: [...a.components].reverse().map((c) => ({ ...c, tags: [...c.tags].reverse() })),
    dependencies: [...a.dependencies].reverse(),
  };

  it("sorts components, dependencies (null group first) and arrays", () => {
    const c = canonicaliseSnapshot(a);
    expect(c.components.map((x) => x.key)).toEqual(["a", "b"]);
    expect(c.components[1]?.tags).toEqual(["x", "y"]);
    expect(c.dependencies.map((d) => `${d.from}>${d.to}:${d.group}`)).toEqual(["a>c:null", "a>c:a#any:c,d", "b>a:null"]);
  });

  it("equal content in any order hashes the same; any change changes it", () => {
    expect(snapshotHash(shuffled)).toBe(snapshotHash(a));
    expect(snapshotHash({ ...a, components: [comp("b", { tags: ["x", "y"], tier: 2 }), comp("a")] })).not.toBe(snapshotHash(a));
    // The canonical JSON written out by hand from the rules (components by key, null group first,
    // fields in their fixed order), and its sha256 computed outside the project with GNU coreutils:
    // printf %s '<that text>' | sha256sum
    const canonical =
      '{"components":[{"key":"a","name":"a","kind":"service","team":null,"tier":3,"replicas":1,"zones":[],"tags":[],"links":{},"source":"storefront-repo"},' +
      '{"key":"b","name":"b","kind":"service","team":null,"tier":3,"replicas":1,"zones":[],"tags":["x","y"],"links":{},"source":"storefront-repo"}],' +
      '"dependencies":[{"from":"a","to":"c","strength":"hard","group":null,"via":null,"source":"s"},' +
      '{"from":"a","to":"c","strength":"soft","group":"a#any:c,d","via":null,"source":"s"},' +
      '{"from":"b","to":"a","strength":"hard","group":null,"via":null,"source":"s"}]}';
    expect(JSON.stringify(canonicaliseSnapshot(a))).toBe(canonical);
    expect(snapshotHash(a)).toBe("b2a4fc1ec2a68bc5909b4ed0a4208754abad10c24713d0b83d8d1d93fd576918");
  });
});

describe("diffSnapshots", () => {
  const before: SnapshotContent = {
    components: [comp("basket"), comp("session-store", { kind: "cache" }), comp("old-search")],
    dependencies: [
      { from: "basket", to: "session-store", strength: "soft", group: null, via: null, source: "storefront-repo" },
      { from: "basket", to: "old-search", strength: "hard", group: null, via: null, source: "storefront-repo" },
    ],
  };
  const after: SnapshotContent = {
    components: [comp("basket", { tier: 1, zones: ["zone-a"] }), comp("session-store", { kind: "cache" }), comp("new-search")],
    dependencies: [
      { from: "basket", to: "session-store", strength: "hard", group: null, via: "redis", source: "storefront-repo" },
      { from: "basket", to: "new-search", strength: "hard", group: null, via: null, source: "storefront-repo" },
    ],
  };

  it("reports added, removed and field-level changes; strength/via changes are 'changed', not remove+add", () => {
    const d = diffSnapshots(before, after);
    expect(d.componentsAdded.map((c) => c.key)).toEqual(["new-search"]);
    expect(d.componentsRemoved.map((c) => c.key)).toEqual(["old-search"]);
    expect(d.componentsChanged).toEqual([{ key: "basket", changes: { tier: { before: 3, after: 1 }, zones: { before: [], after: ["zone-a"] } } }]);
    expect(d.dependenciesAdded.map((x) => x.to)).toEqual(["new-search"]);
    expect(d.dependenciesRemoved.map((x) => x.to)).toEqual(["old-search"]);
    expect(d.dependenciesChanged).toEqual([
      { from: "basket", to: "session-store", group: null, changes: { strength: { before: "soft", after: "hard" }, via: { before: null, after: "redis" } } },
    ]);
  });

  it("a snapshot diffed with itself is empty; swapping sides swaps added and removed", () => {
    const none = diffSnapshots(after, after);
    expect([none.componentsAdded, none.componentsRemoved, none.componentsChanged, none.dependenciesAdded, none.dependenciesRemoved, none.dependenciesChanged].every((l) => l.length === 0)).toBe(true);
    const back = diffSnapshots(after, before);
    expect(back.componentsAdded.map((c) => c.key)).toEqual(["old-search"]);
    expect(back.componentsChanged[0]?.changes.tier).toEqual({ before: 1, after: 3 });
  });
});
