// Ties share a rank (DESIGN §10): standard competition ranking, as the definition in
// Wikipedia "Ranking", section "Standard competition ranking ('1224' ranking)" spells it out,
// and as SciPy's scipy.stats.rankdata(method='min') on the negated values computes it (checked
// here in the run).
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { analyse } from "@/lib/analysis";
import { competitionRanks } from "@/lib/analysis/ranks";
import { directed } from "./helpers";
import { PYTHON } from "./python";

describe("competition ranks", () => {
  it("1, 2, 2, 4: equal values share a rank and the next one skips", () => {
    expect(competitionRanks([0.9, 0.5, 0.5, 0.1]).rank).toEqual([1, 2, 2, 4]);
    expect(Array.from(competitionRanks([0.9, 0.5, 0.5, 0.1]).tied)).toEqual([1, 2, 2, 1]);
  });

  it("all equal (every betweenness 0): everyone is rank 1, tied with all", () => {
    const r = competitionRanks([0, 0, 0, 0, 0]);
    expect(r.rank).toEqual([1, 1, 1, 1, 1]);
    expect(Array.from(r.tied)).toEqual([5, 5, 5, 5, 5]);
  });

  it("rounding noise in the last bits is a tie; null values get no rank", () => {
    expect(competitionRanks([1 / 3, 0.1 + 0.2 - 0.3 + 1 / 3, null, 0.2]).rank).toEqual([1, 1, null, 3]);
  });

  it("equals scipy.stats.rankdata(-x, method='min') on random values with many ties", () => {
    const values = Array.from({ length: 300 }, (_, i) => ((i * 7919) % 13) / 13);
    const out = execFileSync(PYTHON, ["-c", "import json,sys; from scipy.stats import rankdata; x=json.load(sys.stdin); print(json.dumps([int(r) for r in rankdata([-v for v in x], method='min')]))"], {
      input: JSON.stringify(values),
      encoding: "utf8",
    });
    expect(competitionRanks(values).rank).toEqual(JSON.parse(out) as number[]);
  });

  it("the analysis ranks a graph where every betweenness is 0 all first", async () => {
    // A star of needs: hub needs four leaves; no component lies between two others.
    const r = await analyse(directed([["hub", "a"], ["hub", "b"], ["hub", "c"], ["hub", "d"]]));
    expect(r.nodes.every((n) => n.betweenness === 0)).toBe(true);
    expect(r.nodes.map((n) => n.ranks.betweenness)).toEqual(Array(5).fill({ rank: 1, tied: 5 }));
    // The hub takes nothing down (nothing needs it); each leaf takes the hub down: 4 tied at rank 1.
    expect(r.nodes.map((n) => n.ranks.blastDown)).toEqual([{ rank: 5, tied: 1 }, ...Array(4).fill({ rank: 1, tied: 4 })]);
  });
});
