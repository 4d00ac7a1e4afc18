// The span-id sets that make a repeated span count once (lib/traces/seen.ts).
import { randomBytes } from "node:crypto";
import { describe, expect, it } from "vitest";
import { RecentSpanIds, SpanIdSet } from "@/lib/traces/seen";

describe("span id sets", () => {
  it("remember every id of a large file and nothing else", () => {
    const set = new SpanIdSet();
    const ids = Array.from({ length: 20_000 }, () => [randomBytes(16).toString("hex"), randomBytes(8).toString("hex")] as const);
    expect(ids.filter(([t, s]) => set.add(t, s)).length).toBe(ids.length);
    expect(set.size).toBe(ids.length);
    expect(ids.filter(([t, s]) => set.add(t, s)).length).toBe(0);
    expect(set.has(ids[0]![0], "ffffffffffffffff")).toBe(false);
  });

  it("keep at least the last generation of a receiver's ids and forget older ones", () => {
    const recent = new RecentSpanIds(1_000);
    const id = (i: number) => [i.toString(16).padStart(32, "0"), "0000000000000001"] as const;
    for (let i = 0; i < 2_500; i++) recent.add(...id(i));
    for (let i = 1_500; i < 2_500; i++) expect(recent.has(...id(i))).toBe(true);
    expect(recent.has(...id(0))).toBe(false);
  });
});
