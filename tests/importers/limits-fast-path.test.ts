// A plain YAML file over the component limit is refused by the fast reader itself (413 at the
// `components` line), instead of being handed on to the slow, located parser first: a 20 MB file of
// too many components took tens of seconds that way. The limit is MAX_COMPONENTS (DESIGN §2: limits
// are enforced and reported).
import { describe, expect, it } from "vitest";
import { importInventory } from "@/importers";
import { MAX_COMPONENTS } from "@/lib/inventory/limits";

describe("component limit on the YAML fast path", () => {
  it(`refuses ${MAX_COMPONENTS + 1} plain YAML components with 413 located at the components line`, () => {
    const rows = Array.from({ length: MAX_COMPONENTS + 1 }, (_, i) => `  - {key: c${i}, kind: service}`).join("\n");
    const result = importInventory({ format: "pinchpoint", body: `pinchpoint: 1\nsource: s\ncomponents:\n${rows}\n` });
    expect(result).toEqual({
      ok: false,
      status: 413,
      issues: [{ path: "components", line: 3, column: 1, message: expect.stringMatching(/^50001 components in one file; at most 50000/) }],
    });
  });
});
