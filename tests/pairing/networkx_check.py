#!/usr/bin/env python3
"""Checks photolot's pairing against networkx's exact max_weight_matching.

Runs the pairing_reference program given as the first argument, which prints lots as the
graph of pairs within tolerance (found by trying all pairs) plus our pairing's number of pairs
and total error (and how many repair rounds ran warm). networkx (Debian's python3-networkx) computes the maximum-cardinality
matching of maximum weight with weight = C - error, C above every error, i.e. the most pairs
and among those the smallest total error. The number of pairs must be equal and the totals
equal within our stated rounding bound.
"""
import subprocess
import sys

try:
    import networkx as nx
except ImportError:
    print("networkx is not installed (Debian: python3-networkx); skipping")
    sys.exit(77)


def main():
    out = subprocess.run([sys.argv[1]], check=True, capture_output=True, text=True).stdout
    failures = 0
    cases = 0
    graph = None
    warm_total = 0
    for line in out.splitlines():
        parts = line.split()
        if parts[0] == "case":
            name = " ".join(parts[1:])
            graph = nx.Graph()
        elif parts[0] == "ours":
            ours_pairs, ours_total, bound = int(parts[1]), float(parts[2]), float(parts[3])
            proof = parts[4]
            warm, fallbacks = int(parts[5]), int(parts[6])
            warm_total += warm
        elif parts[0] == "e":
            graph.add_edge(int(parts[1]), int(parts[2]), error=float(parts[3]))
        elif parts[0] == "end":
            cases += 1
            ceiling = 1.0 + max((d["error"] for _, _, d in graph.edges(data=True)), default=0.0)
            for _, _, d in graph.edges(data=True):
                d["weight"] = ceiling - d["error"]
            matching = nx.max_weight_matching(graph, maxcardinality=True, weight="weight")
            total = sum(graph[u][v]["error"] for u, v in matching)
            ok = len(matching) == ours_pairs and abs(total - ours_total) <= bound + 1e-7
            ok = ok and proof == "proved" and fallbacks == 0
            print(f"case {name}: edges {graph.number_of_edges()}, networkx {len(matching)} "
                  f"pairs total {total:.9f}; ours {ours_pairs} pairs total {ours_total:.9f} "
                  f"(bound {bound:.2e}, {proof}, {warm} warm repair rounds) "
                  f"{'ok' if ok else 'MISMATCH'}")
            failures += 0 if ok else 1
    print(f"networkx {nx.__version__}: {cases} cases, {failures} mismatches, "
          f"{warm_total} warm repair rounds")
    # The small caps must have made the warm repair run, or its check here checked nothing.
    return 1 if failures or cases == 0 or warm_total == 0 else 0


if __name__ == "__main__":
    sys.exit(main())
