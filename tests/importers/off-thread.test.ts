// Parsing pushes on worker threads (importers/off-thread.ts): the same answers as on the calling
// thread, the calling thread free while a large file is parsed, and a time budget that stops a
// file taking too long. Speed itself is measured in npm run bench, not here.
import { afterAll, describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { closeParsePool, importInventoryOffThread } from "@/importers/off-thread";
import { generateGraph } from "@/scripts/bench/generate";
import { inventoryYaml } from "@/scripts/bench/push";

const large = inventoryYaml(generateGraph({ n: 20_000, seed: 3 }), "big-repo");

afterAll(() => closeParsePool());

describe("importInventoryOffThread", () => {
  it("gives the same answer as the calling thread, for a good file and a bad one (issues located alike)", async () => {
    const good = "pinchpoint: 1\nsource: s\ncomponents:\n  - { key: a, kind: service, needs: [b] }\n";
    const bad = "pinchpoint: 1\nsource: s\ncomponents:\n  - key: a\n    kind: spaceship\n";
    for (const body of [good, bad, Buffer.from(bad)]) {
      expect(await importInventoryOffThread({ format: "pinchpoint", body })).toEqual(importInventory({ format: "pinchpoint", body }));
    }
  });

  it("leaves the calling thread free while a 20,000-component file is parsed", async () => {
    let settled = false;
    const parsed = importInventoryOffThread({ format: "pinchpoint", body: Buffer.from(large) }).then((r) => {
      settled = true;
      return r;
    });
    // Other work gets turns of the event loop until the answer comes back. On the calling thread
    // the parse would finish before the first turn.
    let turns = 0;
    while (!settled) {
      await new Promise((r) => setImmediate(r));
      turns++;
    }
    expect(turns).toBeGreaterThan(100);
    const result = await parsed;
    expect(result.ok && result.inventory.components.length).toBe(20_000);
  });

  it("stops a file that takes longer than the budget with 413 and says why", async () => {
    const result = await importInventoryOffThread({ format: "pinchpoint", body: large }, { budgetMs: 20 });
    expect(result).toEqual({ ok: false, status: 413, issues: [{ path: "", message: expect.stringMatching(/took longer than 0 s, so it was stopped/) }] });
    // The pool goes on working after a thread was ended.
    const after = await importInventoryOffThread({ format: "pinchpoint", body: "pinchpoint: 1\nsource: s\ncomponents: []\n" });
    expect(after.ok).toBe(true);
  });
});
