// Numerical pieces for the principal eigenpair of a sparse symmetric 0/1 matrix (an undirected
// graph's adjacency), used by eigenvector.ts. Written here rather than taken from npm: the
// registry's linear-algebra packages are dense (n² memory, useless at 100k components) or
// unmaintained, and these three classic routines are short.
//
// 1. Lanczos with full reorthogonalisation, restarted from the Ritz vector (Lanczos, J. Res. Natl.
//    Bur. Stand. 45, 1950; Golub & Van Loan, "Matrix Computations", 4th ed., §10.1–10.3).
// 2. The implicit QL algorithm for the small tridiagonal matrix it produces (Bowdler, Martin,
//    Reinsch & Wilkinson, "The QR and QL algorithms for symmetric matrices", Numer. Math. 11, 1968:
//    EISPACK tql2).
// 3. A sparse LDLᵀ factorisation of σI − A under a minimum-degree elimination order (Tinney &
//    Walker 1967; George & Liu, "Computer Solution of Large Sparse Positive Definite Systems", 1981).
//    σI − A is positive definite exactly when σ > λ₁ (Sylvester's law of inertia), so the
//    factorisation succeeding locates λ₁ by bisection, and the same factor then drives inverse
//    iteration (Wilkinson, "The Algebraic Eigenvalue Problem", 1965, ch. 9). On a tree the order
//    is leaves first and nothing fills in.
import type { Csr } from "./graph";

/**
 * Eigenvalues (ascending) and orthonormal eigenvectors of the symmetric tridiagonal matrix with
 * diagonal `diag` and off-diagonal `off` (off[i] couples i and i+1). Column j of the returned
 * row-major m×m matrix is the eigenvector of values[j].
 */
function tridiagonalEigen(diag: Float64Array, off: Float64Array): { values: Float64Array; vectors: Float64Array } {
  const m = diag.length;
  const d = Float64Array.from(diag);
  const e = new Float64Array(m);
  for (let i = 0; i + 1 < m; i++) e[i] = off[i]!;
  const z = new Float64Array(m * m);
  for (let i = 0; i < m; i++) z[i * m + i] = 1;
  for (let l = 0; l < m; l++) {
    let iter = 0;
    for (;;) {
      let k = l;
      for (; k < m - 1; k++) {
        const dd = Math.abs(d[k]!) + Math.abs(d[k + 1]!);
        if (Math.abs(e[k]!) <= Number.EPSILON * dd) break;
      }
      if (k === l) break;
      if (++iter > 200) throw new Error("tridiagonal QL did not converge");
      let g = (d[l + 1]! - d[l]!) / (2 * e[l]!);
      let r = Math.hypot(g, 1);
      g = d[k]! - d[l]! + e[l]! / (g + (g >= 0 ? r : -r));
      let s = 1;
      let c = 1;
      let p = 0;
      let i = k - 1;
      let underflow = false;
      for (; i >= l; i--) {
        const f = s * e[i]!;
        const b = c * e[i]!;
        r = Math.hypot(f, g);
        e[i + 1] = r;
        if (r === 0) {
          d[i + 1] = d[i + 1]! - p;
          e[k] = 0;
          underflow = true;
          break;
        }
        s = f / r;
        c = g / r;
        g = d[i + 1]! - p;
        r = (d[i]! - g) * s + 2 * c * b;
        p = s * r;
        d[i + 1] = g + p;
        g = c * r - b;
        for (let row = 0; row < m; row++) {
          const zi1 = z[row * m + i + 1]!;
          const zi = z[row * m + i]!;
          z[row * m + i + 1] = s * zi + c * zi1;
          z[row * m + i] = c * zi - s * zi1;
        }
      }
      if (underflow) continue;
      d[l] = d[l]! - p;
      e[l] = g;
      e[k] = 0;
    }
  }
  // Sort ascending, carrying the vectors along.
  const order = Array.from({ length: m }, (_, i) => i).sort((a, b) => d[a]! - d[b]!);
  const values = new Float64Array(m);
  const vectors = new Float64Array(m * m);
  order.forEach((src, dst) => {
    values[dst] = d[src]!;
    for (let row = 0; row < m; row++) vectors[row * m + dst] = z[row * m + src]!;
  });
  return { values, vectors };
}

/** y = A x for the 0/1 adjacency `g` (rows in CSR). */
function multiply(g: Csr, x: Float64Array, y: Float64Array): void {
  const { offsets, targets } = g;
  const n = offsets.length - 1;
  for (let v = 0; v < n; v++) {
    let s = 0;
    const end = offsets[v + 1]!;
    for (let e = offsets[v]!; e < end; e++) s += x[targets[e]!]!;
    y[v] = s;
  }
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

function normalise(x: Float64Array): number {
  const norm = Math.sqrt(dot(x, x));
  if (norm > 0) for (let i = 0; i < x.length; i++) x[i] = x[i]! / norm;
  return norm;
}

export interface Eigenpair {
  value: number;
  /** Unit vector, oriented so that its entries sum to a non-negative number. */
  vector: Float64Array;
  /** ‖A x − λ x‖₂ of the returned pair. */
  residual: number;
  /** Second-largest Ritz value seen (an estimate of λ₂, for the gap), or −∞ when unknown. */
  next: number;
  /** Matrix–vector products spent. */
  products?: number;
}

function residualOf(g: Csr, x: Float64Array, value: number): number {
  const ax = new Float64Array(x.length);
  multiply(g, x, ax);
  let s = 0;
  for (let i = 0; i < x.length; i++) {
    const r = ax[i]! - value * x[i]!;
    s += r * r;
  }
  return Math.sqrt(s);
}

function orient(x: Float64Array): void {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i]!;
  if (s < 0) for (let i = 0; i < x.length; i++) x[i] = -x[i]!;
}

/**
 * Largest eigenpair of the adjacency `g` by Lanczos with `steps` vectors per cycle, full
 * reorthogonalisation ("twice is enough", Parlett 1980 §6.9) and explicit restarts from the Ritz
 * vector, until `done(pair)` or `cycles` cycles.
 */
export function lanczosLargest(g: Csr, start: Float64Array, options: { steps: number; cycles: number; done: (p: Eigenpair) => boolean }): Eigenpair {
  const n = start.length;
  const steps = Math.max(1, Math.min(n, options.steps));
  const q = new Float64Array(steps * n);
  const w = new Float64Array(n);
  let x = Float64Array.from(start);
  normalise(x);
  let best: Eigenpair = { value: 0, vector: x, residual: Infinity, next: -Infinity };
  let products = 0;
  for (let cycle = 0; cycle < Math.max(1, options.cycles); cycle++) {
    const alpha = new Float64Array(steps);
    const beta = new Float64Array(steps);
    q.set(x, 0);
    let m = steps;
    const coef = new Float64Array(steps);
    for (let j = 0; j < steps; j++) {
      const qj = q.subarray(j * n, (j + 1) * n);
      multiply(g, qj, w);
      products++;
      alpha[j] = dot(qj, w);
      // Classical Gram–Schmidt against every Lanczos vector, twice: all coefficients in one sweep
      // over q, then one update sweep (memory-bound, so two sweeps beat j+1 dot/axpy pairs).
      for (let pass = 0; pass < 2; pass++) {
        coef.fill(0);
        for (let i = 0; i <= j; i++) {
          let c = 0;
          const base = i * n;
          for (let t = 0; t < n; t++) c += q[base + t]! * w[t]!;
          coef[i] = c;
        }
        for (let i = 0; i <= j; i++) {
          const c = coef[i]!;
          const base = i * n;
          for (let t = 0; t < n; t++) w[t] = w[t]! - c * q[base + t]!;
        }
      }
      if (j + 1 === steps) break;
      const b = Math.sqrt(dot(w, w));
      // An invariant subspace: the Krylov space holds the eigenvector exactly.
      if (b <= 1e-12 * Math.max(1, Math.abs(alpha[j]!))) {
        m = j + 1;
        break;
      }
      beta[j] = b;
      const next = q.subarray((j + 1) * n, (j + 2) * n);
      for (let t = 0; t < n; t++) next[t] = w[t]! / b;
    }
    const { values, vectors } = tridiagonalEigen(alpha.subarray(0, m), beta.subarray(0, Math.max(0, m - 1)));
    const top = m - 1;
    const y = new Float64Array(n);
    for (let i = 0; i < m; i++) {
      const s = vectors[i * m + top]!;
      if (s === 0) continue;
      const qi = q.subarray(i * n, (i + 1) * n);
      for (let t = 0; t < n; t++) y[t] = y[t]! + s * qi[t]!;
    }
    normalise(y);
    orient(y);
    const value = values[top]!;
    best = { value, vector: y, residual: residualOf(g, y, value), next: m > 1 ? values[top - 1]! : -Infinity, products };
    if (options.done(best) || m < steps) break;
    x = y;
  }
  return best;
}

/**
 * Symbolic part of LDLᵀ for σI − A: a minimum-degree elimination order and, for each eliminated
 * node, the later nodes it is joined to at that moment (its column of L). Returns null when the
 * fill would pass `fillLimit` entries (dense estates: the caller reports no convergence instead).
 */
export interface Factorisation {
  n: number;
  order: Int32Array;
  /** Column of L for the k-th eliminated node: colTargets[colOffsets[k] .. colOffsets[k+1]). */
  colOffsets: Int32Array;
  colTargets: Int32Array;
  /** Entry index (into the value store) of each column entry, and of each pair update. */
  colEntry: Int32Array;
  /** For column k, the updates of entries (a,b) for pairs in the column: triples (entry, ia, ib). */
  pairOffsets: Int32Array;
  pairs: Int32Array;
  /** Number of off-diagonal entries (original + fill); entries 0..edgeEntries-1 are the original edges. */
  entries: number;
  edgeEntries: number;
  /** Original edges: (u, v, entry). */
  edgeU: Int32Array;
  edgeV: Int32Array;
}

export function symbolicLdl(g: Csr, fillLimit: number): Factorisation | null {
  const n = g.offsets.length - 1;
  const adj: Array<Map<number, number>> = [];
  let entries = 0;
  const eu: number[] = [];
  const ev: number[] = [];
  for (let v = 0; v < n; v++) adj.push(new Map());
  for (let v = 0; v < n; v++) {
    for (let e = g.offsets[v]!; e < g.offsets[v + 1]!; e++) {
      const u = g.targets[e]!;
      if (u <= v || adj[v]!.has(u)) continue;
      adj[v]!.set(u, entries);
      adj[u]!.set(v, entries);
      eu.push(v);
      ev.push(u);
      entries++;
    }
  }
  const edgeEntries = entries;
  // Degree buckets (a doubly linked list per degree) for minimum-degree picks.
  const degree = new Int32Array(n);
  const head = new Int32Array(n + 1).fill(-1);
  const nextIn = new Int32Array(n).fill(-1);
  const prevIn = new Int32Array(n).fill(-1);
  const insert = (v: number): void => {
    const d = degree[v]!;
    nextIn[v] = head[d]!;
    prevIn[v] = -1;
    if (head[d]! >= 0) prevIn[head[d]!] = v;
    head[d] = v;
  };
  const remove = (v: number): void => {
    const d = degree[v]!;
    if (prevIn[v]! >= 0) nextIn[prevIn[v]!] = nextIn[v]!;
    else head[d] = nextIn[v]!;
    if (nextIn[v]! >= 0) prevIn[nextIn[v]!] = prevIn[v]!;
  };
  for (let v = 0; v < n; v++) {
    degree[v] = adj[v]!.size;
    insert(v);
  }
  const order = new Int32Array(n);
  const colOffsets = new Int32Array(n + 1);
  const colTargets: number[] = [];
  const colEntry: number[] = [];
  const pairOffsets = new Int32Array(n + 1);
  const pairs: number[] = [];
  let minDeg = 0;
  for (let k = 0; k < n; k++) {
    while (head[minDeg]! < 0) minDeg++;
    const v = head[minDeg]!;
    remove(v);
    order[k] = v;
    const nb = [...adj[v]!.entries()];
    colOffsets[k] = colTargets.length;
    pairOffsets[k] = pairs.length / 3;
    const base = colTargets.length;
    for (const [u, entry] of nb) {
      colTargets.push(u);
      colEntry.push(entry);
    }
    // Eliminating v joins its remaining neighbours pairwise (the fill), and updates each pair.
    for (let i = 0; i < nb.length; i++) {
      const a = nb[i]![0];
      remove(a);
      adj[a]!.delete(v);
      for (let j = i + 1; j < nb.length; j++) {
        const b = nb[j]![0];
        let entry = adj[a]!.get(b);
        if (entry === undefined) {
          entry = entries++;
          if (entries - edgeEntries > fillLimit) return null;
          adj[a]!.set(b, entry);
          adj[b]!.set(a, entry);
        }
        pairs.push(entry, base + i, base + j);
        if (pairs.length > 12 * fillLimit + 3 * n) return null;
      }
    }
    for (const [a] of nb) {
      degree[a] = adj[a]!.size;
      insert(a);
      if (degree[a]! < minDeg) minDeg = degree[a]!;
    }
    adj[v]!.clear();
  }
  colOffsets[n] = colTargets.length;
  pairOffsets[n] = pairs.length / 3;
  return {
    n,
    order,
    colOffsets,
    colTargets: Int32Array.from(colTargets),
    colEntry: Int32Array.from(colEntry),
    pairOffsets,
    pairs: Int32Array.from(pairs),
    entries,
    edgeEntries,
    edgeU: Int32Array.from(eu),
    edgeV: Int32Array.from(ev),
  };
}

/** Numeric LDLᵀ of σI − A; null when a pivot is not positive (σ ≤ λ₁). */
interface Ldl {
  /** Pivot of the k-th eliminated node. */
  d: Float64Array;
  /** L entries aligned with colTargets. */
  l: Float64Array;
}

function numericLdl(f: Factorisation, sigma: number, work?: { diag: Float64Array; val: Float64Array }): Ldl | null {
  const { n, order, colOffsets, colEntry, pairOffsets, pairs } = f;
  const diag = work?.diag ?? new Float64Array(n);
  const val = work?.val ?? new Float64Array(f.entries);
  diag.fill(sigma);
  val.fill(-1, 0, f.edgeEntries);
  val.fill(0, f.edgeEntries, f.entries);
  const d = new Float64Array(n);
  const l = new Float64Array(colEntry.length);
  for (let k = 0; k < n; k++) {
    const v = order[k]!;
    const pivot = diag[v]!;
    if (!(pivot > 0)) return null;
    d[k] = pivot;
    const start = colOffsets[k]!;
    const end = colOffsets[k + 1]!;
    for (let i = start; i < end; i++) {
      const a = val[colEntry[i]!]!;
      l[i] = a / pivot;
      const u = f.colTargets[i]!;
      diag[u] = diag[u]! - (a * a) / pivot;
    }
    for (let p = pairOffsets[k]!; p < pairOffsets[k + 1]!; p++) {
      const entry = pairs[3 * p]!;
      const ia = pairs[3 * p + 1]!;
      const ib = pairs[3 * p + 2]!;
      val[entry] = val[entry]! - l[ia]! * val[colEntry[ib]!]!;
    }
  }
  return { d, l };
}

/** Solves (σI − A) x = b in place with the factor. */
function solveLdl(f: Factorisation, ldl: Ldl, b: Float64Array): void {
  const { n, order, colOffsets, colTargets } = f;
  const { d, l } = ldl;
  for (let k = 0; k < n; k++) {
    const y = b[order[k]!]!;
    if (y === 0) continue;
    for (let i = colOffsets[k]!; i < colOffsets[k + 1]!; i++) {
      const u = colTargets[i]!;
      b[u] = b[u]! - l[i]! * y;
    }
  }
  for (let k = 0; k < n; k++) b[order[k]!] = b[order[k]!]! / d[k]!;
  for (let k = n - 1; k >= 0; k--) {
    const v = order[k]!;
    let s = b[v]!;
    for (let i = colOffsets[k]!; i < colOffsets[k + 1]!; i++) s -= l[i]! * b[colTargets[i]!]!;
    b[v] = s;
  }
}

/**
 * λ₁ and its eigenvector by bisection on the definiteness of σI − A between `lo` (≤ λ₁) and `hi`
 * (> λ₁), then inverse iteration with the factor at the smallest σ found above λ₁.
 */
export function shiftInvertLargest(
  g: Csr,
  f: Factorisation,
  lo: number,
  hi: number,
  start: Float64Array,
): { pair: Eigenpair; steps: number; change: number } {
  const n = start.length;
  const work = { diag: new Float64Array(n), val: new Float64Array(f.entries) };
  let upper = numericLdl(f, hi, work);
  if (!upper) throw new Error("the upper bound given for the largest eigenvalue is not one");
  let a = lo;
  let b = hi;
  // Until the interval stops shrinking in floating point (about 60 halvings from a degree bound).
  for (let i = 0; i < 200; i++) {
    const mid = a + (b - a) / 2;
    if (mid <= a || mid >= b) break;
    const ldl = numericLdl(f, mid, work);
    if (ldl) {
      b = mid;
      upper = ldl;
    } else a = mid;
  }
  const x = Float64Array.from(start);
  normalise(x);
  let change = Infinity;
  let steps = 0;
  const prev = new Float64Array(n);
  for (; steps < 12 && change > 1e-14; steps++) {
    prev.set(x);
    solveLdl(f, upper, x);
    normalise(x);
    orient(x);
    change = 0;
    for (let i = 0; i < n; i++) change = Math.max(change, Math.abs(x[i]! - prev[i]!));
  }
  const ax = new Float64Array(n);
  multiply(g, x, ax);
  const value = dot(x, ax);
  return { pair: { value, vector: x, residual: residualOf(g, x, value), next: -Infinity }, steps, change };
}
