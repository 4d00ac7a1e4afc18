"""Times Debian python3-igraph's exact directed betweenness on a whitespace `from to` edge list.

Only the Graph.betweenness call is timed, not the load. Prints one JSON line.
"""
import json
import sys
import time

import igraph

g = igraph.Graph.Read_Ncol(sys.argv[1], names=True, directed=True)
g.simplify(multiple=True, loops=True)
runs = int(sys.argv[2]) if len(sys.argv) > 2 else 3
times = []
for _ in range(runs):
    t0 = time.perf_counter()
    g.betweenness(directed=True)
    times.append((time.perf_counter() - t0) * 1000)
print(json.dumps({"igraph": igraph.__version__, "nodes": g.vcount(), "edges": g.ecount(), "ms": times}))
