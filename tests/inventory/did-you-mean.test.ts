// An undeclared need one edit away from a known key names it. Edit distance is Levenshtein's
// (V. I. Levenshtein, "Binary codes capable of correcting deletions, insertions and reversals",
// 1966): one insertion, deletion or substitution; "kitten" → "sitting" is 3, the textbook example.
import { readFileSync } from "node:fs";
import path from "node:path";
import { distance } from "fastest-levenshtein";
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { didYouMean, mergeSources } from "@/lib/inventory/merge";
import type { SnapshotContent } from "@/lib/inventory/snapshot";

const EMPTY: SnapshotContent = { components: [], dependencies: [] };

describe("did you mean", () => {
  it("uses Levenshtein distance: kitten → sitting is 3 (the textbook example)", () => {
    expect(distance("kitten", "sitting")).toBe(3);
    expect(distance("payment-orchestrater", "payment-orchestrator")).toBe(1);
  });

  it("names the one known key one edit away, and nothing when none or several are", () => {
    expect(didYouMean("payment-orchestrater", ["payment-orchestrator", "payments-db"])).toBe(' (did you mean "payment-orchestrator"?)');
    expect(didYouMean("cache-c", ["cache-a", "cache-b"])).toBe("");
    expect(didYouMean("totally-new", ["payments-db"])).toBe("");
  });

  it("says it in the push's warning for an undeclared need", () => {
    const r = importInventory({
      format: "pinchpoint",
      body: `pinchpoint: 1
source: payments-repo
components:
  - key: payment-orchestrator
    kind: service
  - key: checkout-api
    kind: service
    needs: [payment-orchestrater]
`,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    const merged = mergeSources({ existing: EMPTY, source: "payments-repo", incoming: r.inventory });
    expect(merged.warnings.map((w) => w.message)).toContain('"checkout-api" needs "payment-orchestrater", which no source declares: it is shown as an undeclared placeholder (did you mean "payment-orchestrator"?)');
  });
});

describe("the sample file offered on the upload panel", () => {
  it("is a valid format 1 file with no undeclared need", () => {
    const body = readFileSync(path.resolve(__dirname, "../../public/samples/pinchpoint-sample.yaml"), "utf8");
    const r = importInventory({ format: "pinchpoint", body });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.inventory.components.length).toBe(7);
    const merged = mergeSources({ existing: EMPTY, source: "sample-repo", incoming: r.inventory });
    expect(merged.warnings).toEqual([]);
  });
});
