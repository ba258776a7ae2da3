#!/usr/bin/python3
"""Writes a synthetic network in the gradeline format, reproducibly from a seed, for timing.

    /usr/bin/python3 tools/gen_network.py grid 100000 --seed 1 > /tmp/grid100k.gln
    /usr/bin/python3 tools/gen_network.py distribution 1000000 --seed 1 > /tmp/dist1m.gln

grid:          a 2D street lattice with random elevations and demands, 100-200 mm pipes, a
               300-500 mm main on every tenth street, and a source at a crossing of mains for
               about every 4,000 nodes.
distribution:  a random spanning tree (degree 2-4, long branches), with about 15% extra links
               that close local loops, a few closed pipes on small branches, and one source for every 20,000
               nodes or so (two at least), each feeding the zone of the tree below it; mains
               are sized for about 0.6 m/s at the demand of their zone (a zone boundary is a
               150 mm interconnection), so that the heads are those of a plausible system.
The size is the number of pipes (approximately). The networks are invented and only for
benchmarks.
"""
import argparse
import math
import random
import sys

DIAMETERS_MM = [100, 150, 200, 250, 300, 400, 500, 600, 750, 900, 1050, 1200]


def write_header(out, title):
    out.write("# synthetic network from tools/gen_network.py (benchmark data only)\n")
    out.write("title %s\nunits SI\nheadloss darcy-weisbach\nfluid water temperature=15C\n" % title)
    out.write("defaults roughness=0.1mm\n")


def grid(pipes, rng, out):
    side = max(2, int(math.sqrt(pipes / 2.0)))
    write_header(out, "synthetic street grid %dx%d" % (side, side))
    lines = []
    for r in range(side):
        for c in range(side):
            z = 40 + 10 * math.sin(r / 37.0) + 8 * math.cos(c / 23.0) + rng.uniform(-1, 1)
            lines.append("node G%d_%d elevation=%.2f demand=%.3f at=%d,%d\n"
                         % (r, c, z, rng.uniform(0.02, 0.3), c * 100, r * 100))
    # Every tenth street holds a main; a source (a service reservoir on a trunk main) stands at
    # a crossing of mains for about every 4,000 nodes, or at two crossings in small grids.
    main_every = 10
    crossings = [(r, c) for r in range(main_every // 2, side, main_every)
                 for c in range(main_every // 2, side, main_every)] or [(0, 0), (side - 1, side - 1)]
    sources = max(2, side * side // 4000)
    step = max(1, len(crossings) // sources)
    feeds = crossings[step // 2::step][:sources]
    share = side * side * 0.16e-3 / len(feeds)  # mean demand 0.16 L/s a node
    for s, (r, c) in enumerate(feeds):
        need = math.sqrt(4 * share / (math.pi * 1.5)) * 1e3
        d = next((dd for dd in DIAMETERS_MM if dd >= need), DIAMETERS_MM[-1])
        lines.append("reservoir S%d head=%.1f at=%d,%d\n" % (s, 100.0, c * 100 + 50, r * 100 + 50))
        lines.append("pipe T%d S%d G%d_%d length=300 diameter=%d\n" % (s, s, r, c, d))
    k = 0
    for r in range(side):
        for c in range(side):
            for dr, dc in ((0, 1), (1, 0)):
                if r + dr < side and c + dc < side:
                    on_main = (r % main_every == main_every // 2) if dc else (c % main_every == main_every // 2)
                    d = rng.choice(DIAMETERS_MM[4:7] if on_main else DIAMETERS_MM[:3])
                    lines.append("pipe P%d G%d_%d G%d_%d length=%.0f diameter=%d\n"
                                 % (k, r, c, r + dr, c + dc, rng.uniform(80, 140), d))
                    k += 1
    out.writelines(lines)


def distribution(pipes, rng, out):
    nodes = max(10, int(pipes / 1.15))
    parent = [-1] * nodes
    degree = [0] * nodes
    children = [[] for _ in range(nodes)]
    x = [0.0] * nodes
    y = [0.0] * nodes
    open_tips = [0]
    for i in range(1, nodes):
        # Extend a recent tip most of the time: long branches; sometimes branch off anywhere.
        if rng.random() < 0.8 and open_tips:
            p = open_tips[-1 - min(len(open_tips) - 1, int(rng.expovariate(0.5)))]
        else:
            p = rng.randrange(i)
        while degree[p] >= 4:
            p = rng.randrange(i)
        parent[i] = p
        children[p].append(i)
        degree[p] += 1
        degree[i] += 1
        angle = rng.uniform(0, 2 * math.pi)
        x[i] = x[p] + 90 * math.cos(angle)
        y[i] = y[p] + 90 * math.sin(angle)
        open_tips.append(i)
        if len(open_tips) > 64:
            open_tips.pop(0)
    demand = [rng.uniform(0.01, 0.2) * 1e-3 for _ in range(nodes)]
    # Zones: children before parents (every parent was grown before its children), a node
    # whose zone has gathered the demand of about 20,000 nodes becomes a source's and stops
    # gathering; the root's zone takes what is left. At least two sources.
    target = sum(demand) / max(2, nodes // 20000)
    carried = demand[:]
    source_node = []
    for i in range(nodes - 1, 0, -1):
        if carried[i] >= target:
            source_node.append(i)
        else:
            carried[parent[i]] += carried[i]
    source_node.append(0)
    if len(source_node) < 2:
        source_node.append(nodes // 2)
    source_node.reverse()
    feeds = set(source_node) - {0}
    sources = len(source_node)
    write_header(out, "synthetic distribution network, %d nodes" % nodes)
    lines = []
    for i in range(nodes):
        z = 30 + 15 * math.sin(x[i] / 5000.0) * math.cos(y[i] / 7000.0)
        lines.append("node D%d elevation=%.2f demand=%.4fL/s at=%.0f,%.0f\n"
                     % (i, z, demand[i] * 1e3, x[i], y[i]))
    k = 0
    for i in range(1, nodes):
        # Size for about 0.6 m/s at the flow the branch carries, from the commercial list; the
        # pipe into another source's zone is an interconnection.
        need = math.sqrt(4 * carried[i] / (math.pi * 0.6)) * 1e3
        d = next((dd for dd in DIAMETERS_MM if dd >= need), DIAMETERS_MM[-1])
        if i in feeds:
            d = DIAMETERS_MM[1]
        # Shut valves on small branches only (under 1 L/s): a closed main would leave its
        # zone hanging on a 100 mm loop, heads a thousand metres below ground.
        status = " status=closed" if rng.random() < 0.002 and carried[i] < 1e-3 else ""
        lines.append("pipe P%d D%d D%d length=%.0f diameter=%d%s\n"
                     % (k, parent[i], i, rng.uniform(40, 160), d, status))
        k += 1
    extra = int(0.15 * (nodes - 1))
    seen = set()
    while extra > 0:
        a = rng.randrange(1, nodes)
        up = a
        for _ in range(rng.randint(2, 5)):
            if parent[up] >= 0:
                up = parent[up]
        b = up
        for _ in range(rng.randint(1, 4)):
            if children[b]:
                b = rng.choice(children[b])
        if b == a or (min(a, b), max(a, b)) in seen or b == parent[a] or a == parent[b]:
            continue
        seen.add((min(a, b), max(a, b)))
        lines.append("pipe L%d D%d D%d length=%.0f diameter=%d\n"
                     % (k, a, b, rng.uniform(60, 200), rng.choice(DIAMETERS_MM[:3])))
        k += 1
        extra -= 1
    for s, at in enumerate(source_node):
        need = math.sqrt(4 * carried[at] / (math.pi * 1.5)) * 1e3
        d = next((dd for dd in DIAMETERS_MM if dd >= need), DIAMETERS_MM[-1])
        lines.append("reservoir S%d head=%.1f\n" % (s, 95.0))
        lines.append("pipe T%d S%d D%d length=200 diameter=%d\n" % (s, s, at, d))
    out.writelines(lines)


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("kind", choices=["grid", "distribution"])
    ap.add_argument("pipes", type=int)
    ap.add_argument("--seed", type=int, default=1)
    a = ap.parse_args()
    rng = random.Random(a.seed)
    (grid if a.kind == "grid" else distribution)(a.pipes, rng, sys.stdout)


if __name__ == "__main__":
    main()
