// Needs an importer inferred from configuration (DESIGN §10), listed with their reasons for the
// dry-run preview: a person checks each before trusting the graph they add to.
import type { FilePosition, NormalisedInventory, Strength } from "./types";

/** A preview lists this many; `total` tells the rest. */
const MAX_LISTED_INFERRED = 1_000;

export interface InferredNeed {
  from: string;
  /** One key, or the members of an any_of group. */
  to: string[];
  strength: Strength;
  via: string | null;
  reason: string | null;
  at: FilePosition | null;
}

export function inferredNeedsOf(inventory: NormalisedInventory): { inferred?: { total: number; needs: InferredNeed[] } } {
  const needs: InferredNeed[] = [];
  let total = 0;
  for (const c of inventory.components) {
    for (const n of c.needs) {
      if (!n.provenance?.includes("inferred")) continue;
      total++;
      if (needs.length >= MAX_LISTED_INFERRED) continue;
      needs.push({ from: c.key, to: n.type === "single" ? [n.key] : n.keys, strength: n.strength, via: n.via, reason: n.reason ?? null, at: n.at ?? null });
    }
  }
  return total === 0 ? {} : { inferred: { total, needs } };
}
