// Textbook closed forms for every centrality on small regular graphs.
import { describe, expect, it } from "vitest";
import { betweenness } from "@/lib/analysis/betweenness";
import { clustering } from "@/lib/analysis/clustering";
import { eigenvector } from "@/lib/analysis/eigenvector";
import { pagerank } from "@/lib/analysis/pagerank";
import { byKey, complete, cycle, graphOf, path, range, star } from "./helpers";

const close = (a: number, b: number, tol = 1e-12): void => expect(Math.abs(a - b)).toBeLessThan(tol);

describe("betweenness closed forms (Freeman 1977, 'A set of measures of centrality based on betweenness')", () => {
  it("star K1,k: centre 1, leaves 0 (normalised)", () => {
    const g = graphOf(star(6), true);
    const b = byKey(g, betweenness(g).values);
    close(b.hub!, 1);
    for (let i = 0; i < 6; i++) close(b[`leaf${i}`]!, 0);
  });

  it("path P_n: vertex i has i(n−1−i) pairs through it, normalised 2i(n−1−i)/((n−1)(n−2))", () => {
    const n = 9;
    const g = graphOf(path(n), true);
    const b = byKey(g, betweenness(g).values);
    for (const i of range(n)) close(b[`p${i}`]!, (2 * i * (n - 1 - i)) / ((n - 1) * (n - 2)));
  });

  it("undirected cycle C_{2k+1}: every vertex (k−1)/(2(2k−1))", () => {
    // Each pair at distance d has d−1 interior vertices; summing over the n·k pairs and sharing
    // equally by symmetry gives k(k−1)/2 per vertex, over the (n−1)(n−2)/2 normaliser.
    const k = 4;
    const g = graphOf(cycle(2 * k + 1), true);
    for (const v of betweenness(g).values) close(v, (k - 1) / (2 * (2 * k - 1)));
  });

  it("directed cycle: every vertex 1/2", () => {
    // Ordered pairs at distance d = 1..n−1 from each source have d−1 interior vertices:
    // n(n−1)(n−2)/2 in all, (n−1)(n−2)/2 per vertex, over (n−1)(n−2).
    const g = graphOf(cycle(10));
    for (const v of betweenness(g).values) close(v, 0.5);
  });

  it("complete graph K_n: 0 everywhere", () => {
    const g = graphOf(complete(7), true);
    for (const v of betweenness(g).values) close(v, 0);
  });

  it("a hub that everything needs and that needs nothing lies on no path: 0", () => {
    const g = graphOf(range(5).map((i) => [`leaf${i}`, "hub"] as const));
    close(byKey(g, betweenness(g).values).hub!, 0);
  });
});

describe("local clustering closed forms (Watts & Strogatz 1998)", () => {
  it("star centre 0 — common practice: a hub-and-spoke centre has clustering 0", () => {
    const g = graphOf(star(5), true);
    const c = byKey(g, clustering(g));
    expect(c.hub).toBe(0);
    expect(c.leaf0).toBe(0); // k = 1 < 2
  });

  it("complete graph: 1 everywhere", () => {
    const g = graphOf(complete(6), true);
    for (const v of clustering(g)) close(v, 1);
  });

  it("three neighbours with one link among them: 1/3", () => {
    const g = graphOf([["v", "a"], ["v", "b"], ["v", "c"], ["a", "b"]], true);
    close(byKey(g, clustering(g)).v!, 1 / 3);
  });

  it("direction and repetition do not matter: the undirected simple projection is used", () => {
    const g = graphOf([["v", "a"], ["b", "v"], ["v", "c"], ["a", "b"], ["b", "a"], ["v", "a"]]);
    close(byKey(g, clustering(g)).v!, 1 / 3);
  });
});

describe("eigenvector centrality on a star", () => {
  // K1,k: λ = √k; λ·x_c = k·x_l and λ·x_l = x_c give x_c = √k·x_l; with x_c² + k·x_l² = 1:
  // x_c = 1/√2, x_l = 1/√(2k). The star is bipartite, so this also checks the A+I shift.
  it.each([3, 8])("k = %i: centre 1/√2, leaves 1/√(2k)", (k) => {
    const g = graphOf(star(k), true);
    const r = eigenvector(g);
    expect(r.converged).toBe(true);
    const e = byKey(g, r.values);
    close(e.hub!, 1 / Math.SQRT2, 1e-9);
    close(e.leaf0!, 1 / Math.sqrt(2 * k), 1e-9);
  });
});

describe("PageRank on stars (α = 0.85)", () => {
  const alpha = 0.85;
  it("symmetric star, k leaves: centre (1+αk)/((k+1)(1+α))", () => {
    // c = α·k·l + (1−α)/n and l = α·c/k + (1−α)/n (each leaf's only link is the centre; no
    // dangling nodes); substituting l gives c(1−α²) = (1−α)(1+αk)/n with n = k+1.
    const k = 4;
    const g = graphOf(star(k), true);
    const p = byKey(g, pagerank(g).values);
    close(p.hub!, (1 + alpha * k) / ((k + 1) * (1 + alpha)), 1e-9);
    close(p.leaf0!, (1 - p.hub!) / k, 1e-9);
  });

  it("dependency star (every leaf needs the hub; the hub is dangling): centre (1+αk)/(1+k(1+α))", () => {
    // Leaves get only the teleport and the hub's spread dangling mass: l = (αc + 1 − α)/n, and
    // c = α·k·l + l, so c = (1+αk)·l; with c + k·l = 1, l = 1/(1 + k(1+α)).
    const k = 5;
    const g = graphOf(range(k).map((i) => [`leaf${i}`, "hub"] as const));
    const r = pagerank(g);
    const p = byKey(g, r.values);
    close(p.hub!, (1 + alpha * k) / (1 + k * (1 + alpha)), 1e-9);
    close(p.leaf0!, 1 / (1 + k * (1 + alpha)), 1e-9);
    close(r.values.reduce((a, b) => a + b, 0), 1, 1e-12);
  });
});
