// Mulberry32, a 32-bit seeded generator: ten lines, so not worth a dependency. Used only where the
// analysis must be reproducible (sampled betweenness sources) and in seeded fixtures, never for anything security-related.
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** k distinct integers from 0..n-1, by a partial Fisher–Yates shuffle driven by `seed`. */
export function sampleWithoutReplacement(n: number, k: number, seed: number): Int32Array {
  const m = Math.min(n, Math.max(0, k));
  const pool = new Int32Array(n);
  for (let i = 0; i < n; i++) pool[i] = i;
  const next = mulberry32(seed);
  for (let i = 0; i < m; i++) {
    const j = i + Math.floor(next() * (n - i));
    const t = pool[i]!;
    pool[i] = pool[j]!;
    pool[j] = t;
  }
  return pool.slice(0, m).sort();
}
