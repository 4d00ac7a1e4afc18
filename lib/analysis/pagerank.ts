// PageRank (Brin & Page, "The anatomy of a large-scale hypertextual Web search engine", 1998):
// x = α·Pᵀx + α·(dangling mass)/n + (1−α)/n, α = 0.85, dangling nodes' mass spread uniformly,
// power iteration from 1/n as NetworkX `pagerank(G, alpha=0.85)` does; the result sums to 1.
import type { CompactGraph } from "./graph";

export interface PagerankOptions {
  alpha?: number;
  /** Stop when Σ|x_new − x| < n·tol (NetworkX's criterion; its default tol is 1e-6, ours tighter). */
  tol?: number;
  maxIter?: number;
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
    const base = (alpha * dangling + (1 - alpha)) / n;
    let err = 0;
    for (let v = 0; v < n; v++) {
      let sum = 0;
      const end = inOff[v + 1]!;
      for (let e = inOff[v]!; e < end; e++) sum += share[inT[e]!]!;
      const value = alpha * sum + base;
      next[v] = value;
      err += Math.abs(value - x[v]!);
    }
    [x, next] = [next, x];
    if (err < n * tol) return { values: x, iterations: it, converged: true };
  }
  return { values: x, iterations: maxIter, converged: false };
}
