// Call durations as an exponential histogram with the bucket boundaries of the OpenTelemetry
// metrics data model ("ExponentialHistogram"): with scale s, base = 2^(2^-s) and bucket i holds the
// values in (base^i, base^(i+1)]. Mergeable by adding counts bucket by bucket, so hourly buckets of
// an edge add up to its rolling window without keeping a single duration. Scale 3 (base ≈ 1.0905)
// bounds the relative error of a quantile read from the buckets by √base − 1 ≈ 4.4 %.
// Stored sparse, as { "<index>": count }, in microseconds (index 0 = (1, 1.09] µs).

const SCALE = 3;
export const BASE = 2 ** (2 ** -SCALE);
/** The worst relative error of quantile() against the exact nearest-rank value. */
export const RELATIVE_ERROR = Math.sqrt(BASE) - 1;
/** Durations at or below 1 µs (and zero-length spans) share the lowest bucket. */
const MIN_INDEX = -1;

export type Histogram = Map<number, number>;

/** The bucket of a duration in microseconds: ceil(log_base(v)) − 1. */
export function bucketIndex(micros: number): number {
  if (!(micros > 1)) return MIN_INDEX;
  return Math.ceil(Math.log2(micros) * 2 ** SCALE) - 1;
}

export function record(h: Histogram, durationNs: number): void {
  const i = bucketIndex(durationNs / 1000);
  h.set(i, (h.get(i) ?? 0) + 1);
}

export function merge(into: Histogram, from: Histogram): void {
  for (const [i, n] of from) into.set(i, (into.get(i) ?? 0) + n);
}

export function toJson(h: Histogram): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [i, n] of h) out[String(i)] = n;
  return out;
}

export function fromJson(json: Record<string, number | string> | null | undefined): Histogram {
  const h: Histogram = new Map();
  for (const [k, v] of Object.entries(json ?? {})) h.set(Number(k), Number(v));
  return h;
}

/**
 * The q-quantile in milliseconds, nearest-rank (the value at rank ⌈q·N⌉ of the sorted durations),
 * estimated by the geometric middle of its bucket; null for an empty histogram.
 */
export function quantile(h: Histogram, q: number): number | null {
  let total = 0;
  for (const n of h.values()) total += n;
  if (total === 0) return null;
  const rank = Math.max(1, Math.ceil(q * total));
  let seen = 0;
  for (const i of [...h.keys()].sort((a, b) => a - b)) {
    seen += h.get(i) ?? 0;
    if (seen >= rank) return i === MIN_INDEX ? 0.001 : BASE ** (i + 0.5) / 1000;
  }
  return null;
}
