// PageRank (Brin & Page, "The anatomy of a large-scale hypertextual Web search engine", 1998):
// x = α·Pᵀx + α·(dangling mass)/n + (1−α)/n, α = 0.85, dangling nodes' mass spread uniformly,
// power iteration from 1/n as NetworkX `pagerank(G, alpha=0.85)` does; the result sums to 1.
// Personalised PageRank (Haveliwala, "Topic-sensitive PageRank", WWW 2002; Jeh & Widom 2003):
// the teleport and the dangling mass go to a given distribution p instead of 1/n, as NetworkX's
// `pagerank(G, personalization=p)` (whose `dangling` defaults to p) does, starting from 1/n as it does.
import type { CompactGraph } from "./graph";

export interface PagerankOptions {
  alpha?: number;
  /** Stop when Σ|x_new − x| < n·tol (NetworkX's criterion; its default tol is 1e-6, ours tighter). */
  tol?: number;
  maxIter?: number;
  /** Teleport distribution (non-negative, normalised here); absent means uniform. */
  personalization?: Float64Array;
}

export interface PagerankResult {
  values: Float64Array;
  iterations: number;
  converged: boolean;
}

export function pagerank(graph: CompactGraph, options: PagerankOptions = {}): PagerankResult {
  const { n } = graph;
  const alpha = options.alpha ?? 0.85;
  const tol = options.tol ?? 1e-10;
  const maxIter = options.maxIter ?? 1000;
  let x = new Float64Array(n);
  let next = new Float64Array(n);
  if (n === 0) return { values: x, iterations: 0, converged: true };
  const p = normalised(options.personalization, n);
  const { offsets: outOff } = graph.out;
  const { offsets: inOff, targets: inT } = graph.in;
  const outDeg = new Float64Array(n);
  for (let v = 0; v < n; v++) outDeg[v] = outOff[v + 1]! - outOff[v]!;
  x.fill(1 / n);
  // share[u] = x[u]/outdeg(u), so each edge costs one load and one add in the pull loop.
  const share = new Float64Array(n);
  for (let it = 1; it <= maxIter; it++) {
    let dangling = 0;
    for (let u = 0; u < n; u++) {
      const d = outDeg[u]!;
      if (d === 0) {
        dangling += x[u]!;
        share[u] = 0;
      } else share[u] = x[u]! / d;
    }
    const weight = alpha * dangling + (1 - alpha);
    let err = 0;
    for (let v = 0; v < n; v++) {
      let sum = 0;
      const end = inOff[v + 1]!;
      for (let e = inOff[v]!; e < end; e++) sum += share[inT[e]!]!;
      const value = alpha * sum + weight * (p === null ? 1 / n : p[v]!);
      next[v] = value;
      err += Math.abs(value - x[v]!);
    }
    [x, next] = [next, x];
    if (err < n * tol) return { values: x, iterations: it, converged: true };
  }
  return { values: x, iterations: maxIter, converged: false };
}

function normalised(p: Float64Array | undefined, n: number): Float64Array | null {
  if (p === undefined) return null;
  if (p.length !== n) throw new Error(`personalization has ${p.length} entries for ${n} components`);
  let total = 0;
  for (let v = 0; v < n; v++) {
    if (!(p[v]! >= 0)) throw new Error("personalization must be non-negative");
    total += p[v]!;
  }
  if (total === 0) throw new Error("personalization must not be all zero");
  const out = new Float64Array(n);
  for (let v = 0; v < n; v++) out[v] = p[v]! / total;
  return out;
}
