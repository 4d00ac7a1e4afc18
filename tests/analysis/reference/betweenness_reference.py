"""Reference betweenness for tests/analysis/betweenness.test.ts, by Debian's python3-networkx.

Reads one JSON batch (path in argv[1]) of directed graphs over nodes 0..n-1 and prints, for each,
networkx.betweenness_centrality(G, normalized=True) exactly, and, when the case asks for a sample,
networkx.betweenness_centrality(G, k=k, seed=seed, normalized=True) together with the k sources
networkx drew for it: its py_random_state decorator turns the integer seed into random.Random(seed)
and the function draws seed.sample(list(G.nodes()), k), which is what is repeated here.
"""
import json
import random
import sys

import networkx as nx


def one(case):
    G = nx.DiGraph()
    G.add_nodes_from(range(case["n"]))
    G.add_edges_from(tuple(e) for e in case["edges"])
    out = {"id": case["id"], "exact": None, "sampled": None, "sources": None}
    if case.get("exact", True):
        bc = nx.betweenness_centrality(G, normalized=True)
        out["exact"] = [bc[v] for v in range(case["n"])]
    if case.get("k"):
        k, seed = case["k"], case["seed"]
        bc = nx.betweenness_centrality(G, k=k, seed=seed, normalized=True)
        out["sampled"] = [bc[v] for v in range(case["n"])]
        out["sources"] = random.Random(seed).sample(list(G.nodes()), k)
    return out


def main():
    with open(sys.argv[1], encoding="utf-8") as f:
        batch = json.load(f)
    json.dump({"networkx": nx.__version__, "results": [one(c) for c in batch["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
