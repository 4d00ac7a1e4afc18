// Where in the pushed file a component or a need was written, so that a finding (and its SARIF
// result) points at the exact line. Positions come from the importer (ImportRequest.positions);
// a need written as an alias is found under the key it resolved to.
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import type { FilePosition, NormalisedInventory } from "@/lib/inventory/types";

export interface Locator {
  component(key: string): FilePosition | undefined;
  need(from: string, to: string): FilePosition | undefined;
}

export const NO_POSITIONS: Locator = { component: () => undefined, need: () => undefined };

export function locatorFor({ inventory, content }: { inventory: NormalisedInventory; content: SnapshotContent }): Locator {
  const keyOf = new Map<string, string>();
  for (const c of content.components) for (const a of c.aliases ?? []) keyOf.set(a, c.key);
  const resolve = (name: string): string => keyOf.get(name) ?? name;
  const components = new Map<string, FilePosition>();
  const needs = new Map<string, FilePosition>();
  for (const c of inventory.components) {
    if (c.at) components.set(c.key, c.at);
    for (const need of c.needs) {
      if (!need.at) continue;
      for (const k of need.type === "single" ? [need.key] : need.keys) {
        const id = `${c.key}\u0000${resolve(k)}`;
        if (!needs.has(id)) needs.set(id, need.at);
      }
    }
  }
  return {
    component: (key) => components.get(key),
    need: (from, to) => needs.get(`${from}\u0000${to}`),
  };
}
