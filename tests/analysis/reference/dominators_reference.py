"""Reference dominators for tests/analysis/dominators.test.ts, by Debian's python3-networkx.

For each graph of the batch (nodes 0..n-1, directed edges dependent -> need, self-loops dropped as
the product does) and its entry points: networkx.immediate_dominators from every entry, and from a
virtual root added with an edge to each entry; then, from those trees, what the product reports per
node: entries reaching it, entries from which it strictly dominates something, the most it
dominates from one entry, and what it dominates from the virtual root.
"""
import json
import sys

import networkx as nx


def subtree_sizes(idom, root):
    children = {}
    for v, d in idom.items():
        if v != root:
            children.setdefault(d, []).append(v)
    size = {}
    stack = [(root, False)]
    while stack:
        v, done = stack.pop()
        if done:
            size[v] = 1 + sum(size[c] for c in children.get(v, []))
        else:
            stack.append((v, True))
            stack.extend((c, False) for c in children.get(v, []))
    return size


def one(case):
    n = case["n"]
    G = nx.DiGraph()
    G.add_nodes_from(range(n))
    G.add_edges_from((u, v) for u, v in case["edges"] if u != v)
    entries = case["entries"]
    reached = [0] * n
    dominates = [0] * n
    most = [0] * n
    per_entry = {}
    for r in entries:
        idom = nx.immediate_dominators(G, r)
        per_entry[str(r)] = {str(k): v for k, v in idom.items()}
        size = subtree_sizes(idom, r)
        for v in idom:
            if v == r:
                continue
            reached[v] += 1
            if size[v] > 1:
                dominates[v] += 1
                most[v] = max(most[v], size[v] - 1)
    H = G.copy()
    root = n  # the virtual root
    H.add_edges_from((root, r) for r in entries)
    idom_all = nx.immediate_dominators(H, root) if entries else {}
    size_all = subtree_sizes(idom_all, root) if entries else {}
    return {
        "id": case["id"],
        "perEntry": per_entry,
        "reachedFrom": reached,
        "dominatesFrom": dominates,
        "maxDominated": most,
        "allIdom": [(-1 if idom_all.get(v, root) == root else idom_all[v]) if v in idom_all else -1 for v in range(n)],
        "allDominated": [size_all.get(v, 1) - 1 if v in idom_all else 0 for v in range(n)],
    }


def main():
    with open(sys.argv[1], encoding="utf-8") as f:
        batch = json.load(f)
    json.dump({"networkx": nx.__version__, "results": [one(c) for c in batch["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
