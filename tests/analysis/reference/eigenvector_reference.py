"""Reference eigenvector centralities for tests/analysis/eigenvector.test.ts, by Debian's python3-networkx.

Reads one JSON batch (path in argv[1]): graphs as undirected edge lists over nodes 0..n-1, each with
the NetworkX routine to use, and prints the Euclidean-normalised principal eigenvector of each.

- "power": networkx.eigenvector_centrality (power iteration on A + I from the all-ones vector),
  with a tight tolerance and a large iteration cap, where it converges in reasonable time.
- "numpy": networkx.eigenvector_centrality_numpy (ARPACK's implicitly restarted Arnoldi on
  networkx.to_scipy_sparse_array).
- "shift-invert": the same ARPACK routine on networkx's adjacency matrix in shift-invert mode at
  sigma = the largest degree (an upper bound of the largest eigenvalue that is not itself one on a
  connected non-regular graph), which resolves the eigenvalues packed near the top of long trees.
"""
import json
import sys

import networkx as nx
import numpy as np
import scipy.sparse.linalg as sla


def one(case):
    G = nx.Graph()
    G.add_nodes_from(range(case["n"]))
    G.add_edges_from(tuple(e) for e in case["edges"])
    method = case["method"]
    if method == "power":
        ev = nx.eigenvector_centrality(G, tol=1e-12, max_iter=10**6)
        values = [ev[v] for v in range(case["n"])]
    elif method == "numpy":
        ev = nx.eigenvector_centrality_numpy(G, tol=0, max_iter=100000)
        values = [abs(ev[v]) for v in range(case["n"])]
    else:
        A = nx.to_scipy_sparse_array(G, nodelist=list(range(case["n"])), dtype=float, format="csc")
        sigma = float(max(d for _, d in G.degree))
        _, vecs = sla.eigsh(A, k=1, sigma=sigma, which="LM", tol=0)
        v = vecs[:, 0]
        v = v * np.sign(v.sum()) / np.linalg.norm(v)
        values = v.tolist()
    return {"id": case["id"], "values": values}


def main():
    with open(sys.argv[1], encoding="utf-8") as f:
        batch = json.load(f)
    json.dump({"networkx": nx.__version__, "results": [one(c) for c in batch["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
