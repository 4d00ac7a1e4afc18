// Duration percentiles from exponential-histogram buckets (lib/traces/histogram.ts). Bucket
// boundaries: OpenTelemetry metrics data model, ExponentialHistogram — base = 2^(2^-scale), bucket
// i holds (base^i, base^(i+1)]. The exact percentiles come from NumPy, run in the test:
// numpy.percentile(values, q, method="inverted_cdf") is the nearest-rank definition (Hyndman &
// Fan 1996, definition 1) that quantile() estimates; a bucket's geometric middle is within √base − 1
// of any value in it.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { BASE, bucketIndex, fromJson, merge, quantile, RELATIVE_ERROR, record, toJson, type Histogram } from "@/lib/traces/histogram";

/** A seeded log-normal sample of durations in ns (mulberry32 and Box–Muller). */
function sample(n: number, seed: number): number[] {
  let a = seed >>> 0;
  const rnd = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return Array.from({ length: n }, () => {
    const z = Math.sqrt(-2 * Math.log(rnd() || 1e-12)) * Math.cos(2 * Math.PI * rnd());
    return Math.round(Math.exp(Math.log(20e6) + 1.1 * z));
  });
}

function numpyPercentiles(valuesMs: number[], qs: number[]): number[] {
  const script = "import json,sys,numpy as np; d=json.load(sys.stdin); print(json.dumps([float(np.percentile(d['v'], q, method='inverted_cdf')) for q in d['q']]))";
  return JSON.parse(execFileSync("/usr/bin/python3", ["-c", script], { input: JSON.stringify({ v: valuesMs, q: qs.map((q) => q * 100) }), encoding: "utf8" })) as number[];
}

describe("exponential histogram of durations", () => {
  it("puts a value in (base^i, base^(i+1)] microseconds", () => {
    expect(BASE).toBeCloseTo(2 ** (1 / 8), 12);
    for (const us of [1.5, 10, 999.9, 1000, 123456]) {
      const i = bucketIndex(us);
      expect(BASE ** i).toBeLessThan(us);
      expect(us).toBeLessThanOrEqual(BASE ** (i + 1) * (1 + 1e-12));
    }
  });

  it("p50 and p95 are within √base − 1 of numpy.percentile(method='inverted_cdf'), also after merging hourly buckets", () => {
    const values = sample(20_000, 7);
    const whole: Histogram = new Map();
    const hours = [new Map(), new Map(), new Map()] as Histogram[];
    values.forEach((v, i) => {
      record(whole, v);
      record(hours[i % 3]!, v);
    });
    const merged: Histogram = new Map();
    // Stored as JSON and summed bucket by bucket, as PostgreSQL's pinchpoint_histogram_sum does.
    for (const h of hours) merge(merged, fromJson(JSON.parse(JSON.stringify(toJson(h))) as Record<string, number>));
    expect(merged).toEqual(whole);
    const exact = numpyPercentiles(values.map((v) => v / 1e6), [0.5, 0.95]);
    [0.5, 0.95].forEach((q, k) => {
      const estimate = quantile(merged, q)!;
      expect(Math.abs(estimate / exact[k]! - 1)).toBeLessThanOrEqual(RELATIVE_ERROR + 1e-9);
    });
  });

  it("is empty without calls", () => {
    expect(quantile(new Map(), 0.5)).toBeNull();
  });
});
