"""Reference measures for tests/impact/compare.test.ts, computed by Debian's python3-networkx.

Reads one JSON batch (path in argv[1]): cases, each with a `before` and an `after` graph on nodes
0..n-1 (edges [u, v, hard] meaning u needs v; no self-loops, no repeated pairs; no any_of groups,
so that "down when v fails" is exactly the set of ancestors of v along hard needs). Prints, per
case and side, the measures the impact comparison reads.
"""
import json
import sys

import networkx as nx


def side(n, graph):
    edges = graph["edges"]
    tier = graph["tier"]
    G = nx.DiGraph()
    G.add_nodes_from(range(n))
    G.add_edges_from((u, v) for u, v, _ in edges)
    H = nx.DiGraph()
    H.add_nodes_from(range(n))
    H.add_edges_from((u, v) for u, v, hard in edges if hard)
    U = G.to_undirected()
    bc = nx.betweenness_centrality(G, normalized=True)
    entries = [v for v in range(n) if tier[v] == 1 and G.in_degree(v) == 0]
    idom = {}
    for e in entries:
        d = nx.immediate_dominators(G, e)
        idom[str(e)] = {str(k): p for k, p in d.items() if k != e}
    return {
        "betweenness": [bc[v] for v in range(n)],
        "articulation": sorted(nx.articulation_points(U)),
        "bridges": sorted(sorted(e) for e in nx.bridges(U)),
        # Cycles of hard needs: strongly connected components of two or more along hard needs.
        "hardCycles": sorted(sorted(c) for c in nx.strongly_connected_components(H) if len(c) > 1),
        "hardEdges": sorted([u, v] for u, v in H.edges()),
        "down": [sorted(nx.ancestors(H, v)) for v in range(n)],
        "entries": entries,
        "idom": idom,
    }


def main():
    with open(sys.argv[1]) as f:
        batch = json.load(f)
    out = []
    for case in batch["cases"]:
        n = case["n"]
        out.append({"id": case["id"], "before": side(n, case["before"]), "after": side(n, case["after"])})
    json.dump({"networkx": nx.__version__, "results": out}, sys.stdout)


main()
