"""Times Debian python3-igraph's exact directed betweenness on a whitespace `from to` edge list.

Only the Graph.betweenness call is timed, not the load. With a run count, prints one JSON line of
that many timings. With `--serve`, answers one timing per line read from stdin ("run"), so that
the caller can interleave its own calls with igraph's and both sides see the same machine load.
"""
import json
import sys
import time

import igraph

g = igraph.Graph.Read_Ncol(sys.argv[1], names=True, directed=True)
g.simplify(multiple=True, loops=True)


def once():
    t0 = time.perf_counter()
    g.betweenness(directed=True)
    return (time.perf_counter() - t0) * 1000


if len(sys.argv) > 2 and sys.argv[2] == "--serve":
    print(json.dumps({"igraph": igraph.__version__, "nodes": g.vcount(), "edges": g.ecount()}), flush=True)
    for line in sys.stdin:
        if line.strip() != "run":
            break
        print(json.dumps({"ms": once()}), flush=True)
else:
    runs = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    times = [once() for _ in range(runs)]
    print(json.dumps({"igraph": igraph.__version__, "nodes": g.vcount(), "edges": g.ecount(), "ms": times}))
