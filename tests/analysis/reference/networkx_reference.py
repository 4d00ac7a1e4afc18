"""Reference values for tests/analysis/property.test.ts, computed by Debian's python3-networkx.

Reads one JSON batch of graphs (path in argv[1]) and prints one JSON object with, per graph,
the measures of DESIGN section 3 as NetworkX defines them. One process for the whole batch keeps
the suite fast. Node ids are 0..n-1; edges may contain self-loops and repeats, which are
handled here exactly as the product's rules say (simple graph; a self-loop marks a cycle).
"""
import json
import sys

import networkx as nx
from networkx.algorithms.centrality.betweenness import (
    _accumulate_basic,
    _single_source_shortest_path_basic,
)


def sampled_betweenness(G, sources):
    # Brandes & Pich (2007) estimator over the given sources, with NetworkX's own single-source
    # routines and its rescaling for k sources (normalised, directed: n / (k (n-1)(n-2))).
    bc = dict.fromkeys(G, 0.0)
    for s in sources:
        S, P, sigma, _ = _single_source_shortest_path_basic(G, s)
        bc, _ = _accumulate_basic(bc, S, P, sigma, s)
    n = G.number_of_nodes()
    scale = n / (len(sources) * (n - 1) * (n - 2)) if n > 2 else 0.0
    return [bc[v] * scale for v in range(n)]


def one(case):
    n = case["n"]
    G = nx.DiGraph()
    G.add_nodes_from(range(n))
    G.add_edges_from(tuple(e) for e in case["edges"])
    self_loops = sorted(u for u, v in nx.selfloop_edges(G))
    S = G.copy()
    S.remove_edges_from(list(nx.selfloop_edges(S)))
    U = S.to_undirected()
    bc = nx.betweenness_centrality(S, normalized=True)
    pr = nx.pagerank(S, alpha=0.85, tol=1e-13, max_iter=100000)
    cl = nx.clustering(U)
    out = {
        "id": case["id"],
        "selfLoops": self_loops,
        "betweenness": [bc[v] for v in range(n)],
        "pagerank": [pr[v] for v in range(n)],
        "clustering": [cl[v] for v in range(n)],
        "articulation": sorted(nx.articulation_points(U)),
        "bridges": sorted(sorted(e) for e in nx.bridges(U)),
        "scc": sorted(sorted(c) for c in nx.strongly_connected_components(G)),
        "idom": {str(r): {str(k): v for k, v in nx.immediate_dominators(S, r).items()} for r in case["roots"]},
        "eigenvector": None,
        "sampled": None,
    }
    if n > 1 and nx.is_connected(U):
        ev = nx.eigenvector_centrality(U, tol=1e-13, max_iter=100000)
        out["eigenvector"] = [ev[v] for v in range(n)]
    if case.get("sources"):
        out["sampled"] = sampled_betweenness(S, case["sources"])
    return out


def main():
    with open(sys.argv[1], encoding="utf-8") as f:
        batch = json.load(f)
    json.dump({"networkx": nx.__version__, "results": [one(c) for c in batch["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
