// Eigenvector centrality (Bonacich, "Factoring and weighting approaches to status scores and clique
// identification", J. Math. Sociol. 2, 1972): the principal (Perron–Frobenius) eigenvector of the
// undirected projection's adjacency matrix, Euclidean norm 1, as NetworkX `eigenvector_centrality`.
//
// Like NetworkX we iterate on A + I from the all-ones vector. The shift changes no eigenvector but
// makes the dominant eigenvalue λ+1 strictly largest in modulus, so bipartite graphs (spectrum
// symmetric about 0, where plain power iteration oscillates) still converge. On a disconnected
// graph the iteration converges to the principal eigenvector of the component with the largest
// eigenvalue and the other components decay towards 0 (NetworkX's behaviour too); components
// tied for the largest eigenvalue share the weight. An edgeless graph gives 1/√n everywhere.
// We never throw on slow convergence: `converged` says whether the tolerance was reached.
import type { CompactGraph } from "./graph";

export interface EigenvectorOptions {
  /** Stop when Σ|x_new − x| < n·tol (NetworkX's criterion). */
  tol?: number;
  maxIter?: number;
}

export interface EigenvectorResult {
  values: Float64Array;
  iterations: number;
  converged: boolean;
}

export function eigenvector(graph: CompactGraph, options: EigenvectorOptions = {}): EigenvectorResult {
  const { n } = graph;
  const tol = options.tol ?? 1e-10;
  const maxIter = options.maxIter ?? 1000;
  const { offsets, targets } = graph.undirected;
  let x = new Float64Array(n).fill(n > 0 ? 1 / n : 0);
  let next = new Float64Array(n);
  if (n === 0) return { values: x, iterations: 0, converged: true };
  for (let it = 1; it <= maxIter; it++) {
    let norm2 = 0;
    for (let v = 0; v < n; v++) {
      let sum = x[v]!;
      const end = offsets[v + 1]!;
      for (let e = offsets[v]!; e < end; e++) sum += x[targets[e]!]!;
      next[v] = sum;
      norm2 += sum * sum;
    }
    const inv = norm2 > 0 ? 1 / Math.sqrt(norm2) : 1;
    let err = 0;
    for (let v = 0; v < n; v++) {
      const value = next[v]! * inv;
      next[v] = value;
      err += Math.abs(value - x[v]!);
    }
    [x, next] = [next, x];
    if (err < n * tol) return { values: x, iterations: it, converged: true };
  }
  return { values: x, iterations: maxIter, converged: false };
}
