// Eigenvector centrality (Bonacich, "Factoring and weighting approaches to status scores and clique
// identification", J. Math. Sociol. 2, 1972): the principal (Perron–Frobenius) eigenvector of the
// undirected projection's adjacency matrix, Euclidean norm 1, as NetworkX `eigenvector_centrality`.
//
// NetworkX iterates x ← (A + I)x from the all-ones vector. That converges at the rate
// (1+λ₂)/(1+λ₁), which on a long chain is 1 − 10⁻⁸: a capped power iteration stops far from the
// answer (16–66 % off on a 200-component chain). We compute the same limit directly, per connected
// component of the projection (lib/analysis/symmetric.ts has the methods and their sources):
//   • a regular component (every degree d, e.g. a cycle): λ₁ = d and the uniform vector, exactly;
//   • otherwise Lanczos with full reorthogonalisation, accepted when the residual is at the
//     rounding level and small against the gap to the next Ritz value (Davis & Kahan 1970: the
//     angle to the true eigenvector is at most residual ÷ gap);
//   • failing that (a tiny spectral gap: chains, long thin estates) shift-and-invert: bisection on
//     λ₁ by Sylvester's law of inertia with a sparse LDLᵀ of σI − A, then inverse iteration.
// The power iteration's limit from the all-ones vector gives the components with the largest λ₁
// weights proportional to their projection on the all-ones vector and every other component 0
// (on a connected graph simply the Perron vector); an edgeless graph gives 1/√n everywhere.
// When no method reaches the tolerance, `converged` is false with a reason and the values must
// not be shown as measures.
import type { CompactGraph, Csr } from "./graph";
import { lanczosLargest, shiftInvertLargest, symbolicLdl, type Eigenpair } from "./symmetric";

export interface EigenvectorOptions {
  /** Accept a Lanczos pair when residual ÷ gap (a bound on the vector's angle) is below this. */
  tol?: number;
  /** Lanczos vectors per restart cycle, and cycles. */
  lanczosSteps?: number;
  lanczosCycles?: number;
  /** Most fill-in entries the LDLᵀ may create (per connected component) before giving up; default n + m. */
  fillLimit?: number;
}

type EigenvectorMethod = "exact" | "lanczos" | "shift-invert";

export interface EigenvectorResult {
  values: Float64Array;
  converged: boolean;
  /** Why the values are not trustworthy; null when converged. */
  reason: string | null;
  /** λ₁ of the projection (the largest over its connected components). */
  eigenvalue: number;
  /** The strongest method any deciding component needed. */
  method: EigenvectorMethod;
  /** Matrix–vector products and factorisations spent, for the benchmark. */
  iterations: number;
}

interface Component {
  nodes: Int32Array;
  edges: number;
  maxDegree: number;
  regular: boolean;
}

function connectedComponents(g: Csr, n: number): Component[] {
  const seen = new Uint8Array(n);
  const queue = new Int32Array(n);
  const out: Component[] = [];
  for (let s = 0; s < n; s++) {
    if (seen[s]) continue;
    seen[s] = 1;
    queue[0] = s;
    let tail = 1;
    let ends = 0;
    let maxDegree = 0;
    let minDegree = Infinity;
    for (let head = 0; head < tail; head++) {
      const v = queue[head]!;
      const d = g.offsets[v + 1]! - g.offsets[v]!;
      ends += d;
      if (d > maxDegree) maxDegree = d;
      if (d < minDegree) minDegree = d;
      for (let e = g.offsets[v]!; e < g.offsets[v + 1]!; e++) {
        const w = g.targets[e]!;
        if (!seen[w]) {
          seen[w] = 1;
          queue[tail++] = w;
        }
      }
    }
    out.push({ nodes: queue.slice(0, tail).sort(), edges: ends / 2, maxDegree, regular: minDegree === maxDegree });
  }
  return out;
}

/** The component's own CSR over local indices 0..k-1. */
function localCsr(g: Csr, nodes: Int32Array, local: Int32Array): Csr {
  const k = nodes.length;
  const offsets = new Int32Array(k + 1);
  for (let i = 0; i < k; i++) offsets[i + 1] = offsets[i]! + g.offsets[nodes[i]! + 1]! - g.offsets[nodes[i]!]!;
  const targets = new Int32Array(offsets[k]!);
  for (let i = 0; i < k; i++) {
    const v = nodes[i]!;
    let w = offsets[i]!;
    for (let e = g.offsets[v]!; e < g.offsets[v + 1]!; e++) targets[w++] = local[g.targets[e]!]!;
  }
  return { offsets, targets };
}

/** Hong (1988): λ₁ ≤ √(2m − n + 1) on a connected graph; and λ₁ ≤ the largest degree. */
const upperBound = (c: Component): number => Math.min(c.maxDegree, Math.sqrt(Math.max(0, 2 * c.edges - c.nodes.length + 1)));

interface Solved {
  pair: Eigenpair;
  method: EigenvectorMethod;
  converged: boolean;
  reason: string | null;
  iterations: number;
}

function solveComponent(g: Csr, c: Component, local: Int32Array, options: Required<EigenvectorOptions>): Solved {
  const k = c.nodes.length;
  if (k === 1 || c.regular) {
    // Perron–Frobenius: on a connected d-regular graph the all-ones vector is the principal one.
    const vector = new Float64Array(k).fill(1 / Math.sqrt(k));
    return { pair: { value: k === 1 ? 0 : c.maxDegree, vector, residual: 0, next: -Infinity }, method: "exact", converged: true, reason: null, iterations: 0 };
  }
  c.nodes.forEach((v, i) => (local[v] = i));
  const sub = localCsr(g, c.nodes, local);
  const scale = Math.max(1, c.maxDegree);
  const rounding = 1e-12 * scale;
  const accept = (p: Eigenpair): boolean => {
    if (p.residual > rounding) return false;
    const gap = p.value - p.next;
    return gap > 0 && p.residual / gap <= options.tol;
  };
  const steps = Math.min(k, options.lanczosSteps);
  // A few Lanczos cycles first: on estates with hubs the gap is wide and this is the answer.
  const first = Math.min(1, options.lanczosCycles);
  let lanczos = lanczosLargest(sub, new Float64Array(k).fill(1), { steps, cycles: first, done: accept });
  let iterations = lanczos.products ?? 0;
  if (accept(lanczos)) return { pair: lanczos, method: "lanczos", converged: true, reason: null, iterations };
  // A narrow gap (chains, long thin estates): factor σI − A if that stays sparse (always on a tree),
  // else keep restarting Lanczos.
  const f = symbolicLdl(sub, options.fillLimit);
  if (!f) {
    lanczos = lanczosLargest(sub, lanczos.vector, { steps, cycles: options.lanczosCycles - first, done: accept });
    iterations += lanczos.products ?? 0;
    if (accept(lanczos)) return { pair: lanczos, method: "lanczos", converged: true, reason: null, iterations };
    return {
      pair: lanczos,
      method: "lanczos",
      converged: false,
      reason:
        `did not converge: the largest eigenvalues of a ${k}-component part of the graph lie too close together for ` +
        `Lanczos (residual ${lanczos.residual.toExponential(1)}), and the part is too densely linked to factor within the limit`,
      iterations,
    };
  }
  // The Ritz value is a lower bound (Courant–Fischer); the largest degree is an upper bound, made
  // strict by a margin because σI − A is only semidefinite at σ = λ₁.
  const hi = upperBound(c) * (1 + 1e-9) + 1e-9;
  const refined = shiftInvertLargest(sub, f, Math.max(0, Math.min(lanczos.value, hi)), hi, lanczos.vector);
  iterations += refined.steps + 64;
  const converged = refined.change <= 1e-12 && refined.pair.residual <= 1e-9 * scale;
  return {
    pair: refined.pair,
    method: "shift-invert",
    converged,
    reason: converged
      ? null
      : `did not converge: inverse iteration on a ${k}-component part of the graph still moved by ${refined.change.toExponential(1)} after ${refined.steps} steps`,
    iterations,
  };
}

export function eigenvector(graph: CompactGraph, options: EigenvectorOptions = {}): EigenvectorResult {
  const { n } = graph;
  const g = graph.undirected;
  const opts: Required<EigenvectorOptions> = {
    tol: options.tol ?? 1e-10,
    lanczosSteps: options.lanczosSteps ?? 32,
    lanczosCycles: options.lanczosCycles ?? 16,
    fillLimit: options.fillLimit ?? n + g.targets.length / 2 + 10_000,
  };
  const values = new Float64Array(n);
  if (n === 0) return { values, converged: true, reason: null, eigenvalue: 0, method: "exact", iterations: 0 };
  // Largest possible λ₁ first: once one component's λ₁ is known, any component whose upper bound
  // is below it contributes 0 and needs no work at all (most small islands of an estate).
  const comps = connectedComponents(g, n).sort((a, b) => upperBound(b) - upperBound(a));
  const tie = (x: number, top: number): boolean => x >= top - 1e-12 * Math.max(1, top);
  let best = -Infinity;
  const solved: Array<{ c: Component; s: Solved }> = [];
  const local = new Int32Array(n);
  for (const c of comps) {
    if (best > -Infinity && !tie(upperBound(c), best)) break;
    const s = solveComponent(g, c, local, opts);
    solved.push({ c, s });
    if (s.pair.value > best) best = s.pair.value;
  }
  const top = solved.filter(({ s }) => tie(s.pair.value, best));
  let method: EigenvectorMethod = "exact";
  let reason: string | null = null;
  let iterations = 0;
  for (const { s } of solved) {
    iterations += s.iterations;
    if (s.method === "shift-invert" || (s.method === "lanczos" && method === "exact")) method = s.method;
    // A component whose λ₁ is not known reliably may be the one that decides, so any failure counts.
    if (!s.converged && reason === null) reason = s.reason;
  }
  let norm2 = 0;
  for (const { c, s } of top) {
    // Weight of this component in the limit: the all-ones vector's projection on its Perron vector.
    let weight = 0;
    for (let i = 0; i < c.nodes.length; i++) weight += s.pair.vector[i]!;
    for (let i = 0; i < c.nodes.length; i++) {
      const x = Math.abs(s.pair.vector[i]! * weight);
      values[c.nodes[i]!] = x;
      norm2 += x * x;
    }
  }
  const inv = norm2 > 0 ? 1 / Math.sqrt(norm2) : 0;
  for (let v = 0; v < n; v++) values[v] = values[v]! * inv;
  return { values, converged: reason === null, reason, eigenvalue: Math.max(0, best), method, iterations };
}
