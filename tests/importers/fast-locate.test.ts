// The indentation index (importers/shared/fast-locate.ts) must give exactly the positions the full
// YAML parser gives (the `yaml` package's node ranges, importers/shared/structured.ts), or none at all.
// Checked on every path of every YAML file in the fixtures and examples.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { fastLocator } from "@/importers/shared/fast-locate";
import { loadStructured } from "@/importers/shared/structured";
import type { PathSegment } from "@/importers/shared/text";

const root = new URL("../..", import.meta.url).pathname;
function yamlFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return yamlFiles(p);
    return /\.ya?ml$/.test(name) ? [p] : [];
  });
}

function paths(value: unknown, prefix: PathSegment[] = [], out: PathSegment[][] = []): PathSegment[][] {
  out.push(prefix);
  if (Array.isArray(value)) value.forEach((v, i) => paths(v, [...prefix, i], out));
  else if (typeof value === "object" && value !== null) for (const [k, v] of Object.entries(value)) paths(v, [...prefix, k], out);
  return out;
}

const SAMPLES: Record<string, string> = {
  compactSequences: "services:\n  a:\n    depends_on:\n    - b\n    - c\n    links:\n      - d\n  b:\n    environment:\n    - X=1\n",
  itemsWithMaps: "components:\n  - key: web\n    needs:\n      - api\n      - key: db\n        strength: soft\n  -\n    key: api\n",
  quotedKeysAndComments: 'services:\n  "web":   # the front\n    image: "x"   # pinned\n    command: |\n      run: this\n  \'api\':\n    environment: { A: 1 }\n',
};

describe("fast YAML locator", () => {
  const files = [...yamlFiles(join(root, "tests/fixtures")), ...yamlFiles(join(root, "examples"))];
  const cases: [string, string][] = [...files.map((f): [string, string] => [f.slice(root.length), readFileSync(f, "utf8")]), ...Object.entries(SAMPLES)];
  it.each(cases)("%s: same position as the full parser, or none", (_name, raw) => {
    const text = raw.replace(/^\uFEFF/, "");
    // Only text the fast path would read (no anchors, aliases, tags, merge keys).
    if (/[&*!]|<</.test(text)) return;
    // The `!` in the comment sends the text down the full parser's path (structured.ts).
    const full = loadStructured(`${text}\n# !`, { json: false });
    if (!full.ok) return;
    const fast = fastLocator(text);
    let answered = 0;
    for (const p of paths(full.source.value)) {
      for (const key of [false, true]) {
        const mine = fast(p, { key });
        if (mine === null) continue;
        answered++;
        expect({ p, key, at: mine }).toEqual({ p, key, at: full.source.locate(p, { key }) });
      }
    }
    if (paths(full.source.value).length > 1) expect(answered).toBeGreaterThan(0);
  });
});
