#!/usr/bin/python3
"""Independent steady-state solve of gradeline test networks with python3-scipy.

This is written apart from the C++ code on purpose: its own reader for the subset of the
format used by tests/networks, friction factors from python3-fluids (Colebrook-White by its
exact Lambert-W solution, 64/Re when laminar), and scipy.optimize.root on the full system of
link energy and node continuity equations in flows and heads (no gradient-method algebra).
It writes tests/reference/NAME.json with the heads and flows, which the C++ tests compare
against. Networks whose solution has a pipe in the 2000 < Re < 4000 band are refused, since
there the equations are a modelling choice rather than a published law.

Run from the repository root:
    /usr/bin/python3 tools/reference_solve.py tests/networks/loop_two_sources.gln ...
"""
import json
import math
import re
import sys

import numpy as np
import scipy
from fluids.friction import Colebrook
from scipy.optimize import root

G = 9.80665
UNITS = {"m": 1.0, "mm": 1e-3, "in": 0.0254, "l/s": 1e-3, "m3/h": 1 / 3600.0, "m3/s": 1.0,
         "m2/s": 1.0, "kg/m3": 1.0}
DEFAULT = {"length": "m", "diameter": "mm", "roughness": "mm", "demand": "l/s", "head": "m",
           "elevation": "m", "viscosity": "m2/s", "density": "kg/m3"}
NUMBER = re.compile(r"^([+-]?[0-9.]+(?:[eE][+-]?[0-9]+)?)(.*)$")


def value(key, text):
    m = NUMBER.match(text)
    unit = (m.group(2) or DEFAULT.get(key, "")).lower()
    return float(m.group(1)) * UNITS.get(unit, 1.0) if unit else float(m.group(1))


def read(path):
    net = {"law": "dw", "hw": (10.67, 1.852, 4.87), "nu": 1e-6, "nodes": {}, "pipes": [],
           "defaults": {}}
    for raw in open(path):
        line = raw.split("#")[0].split()
        if not line:
            continue
        kw, pos = line[0], [w for w in line[1:] if "=" not in w]
        opt = dict(w.split("=", 1) for w in line[1:] if "=" in w)
        if kw == "headloss" and pos[0] == "hazen-williams":
            net["law"] = "hw"
            net["hw"] = (float(opt.get("coefficient", 10.67)), float(opt.get("flow_exponent", 1.852)),
                         float(opt.get("diameter_exponent", 4.87)))
        elif kw == "fluid":
            net["nu"] = value("viscosity", opt["viscosity"])
        elif kw == "defaults":
            net["defaults"].update(opt)
        elif kw == "reservoir":
            net["nodes"][pos[0]] = {"fixed": value("head", opt["head"]), "z": value("head", opt["head"])}
        elif kw == "node":
            demand, _, category = opt.get("demand", "0").partition(":")
            net["nodes"][pos[0]] = {"fixed": None, "z": value("elevation", opt["elevation"]),
                                    "q": value("demand", demand), "category": category}
        elif kw == "case":
            draws = [w.split("=", 1)[1] for w in line[1:] if w.startswith("draw=")]
            net.setdefault("cases", {})[pos[0]] = {
                "factor": float(opt.get("factor", 1.0)),
                "categories": {k[7:]: float(v) for k, v in opt.items() if k.startswith("factor.")},
                "draws": [(d.rsplit(":", 1)[0], value("demand", d.rsplit(":", 1)[1])) for d in draws]}
        elif kw == "pipe":
            o = dict(net["defaults"])
            o.update(opt)
            if o.get("status") == "closed":
                continue
            net["pipes"].append({"id": pos[0], "a": pos[1], "b": pos[2],
                                 "L": value("length", o["length"]),
                                 "D": value("diameter", o["diameter"]),
                                 "e": value("roughness", o.get("roughness", "0")),
                                 "C": float(o.get("cfactor", 0)), "K": float(o.get("minor", 0))})
    return net


def headloss(net, p, q):
    area = math.pi * p["D"] ** 2 / 4
    v = abs(q) / area
    minor = p["K"] * v * v / (2 * G)
    if net["law"] == "hw":
        k, n, m = net["hw"]
        h = k * p["L"] * abs(q) ** n / (p["C"] ** n * p["D"] ** m)
    else:
        re_ = v * p["D"] / net["nu"]
        if re_ == 0:
            h = 0.0
        elif re_ <= 2000:
            h = 64 / re_ * p["L"] / p["D"] * v * v / (2 * G)
        else:
            h = Colebrook(re_, p["e"] / p["D"], tol=0) * p["L"] / p["D"] * v * v / (2 * G)
    return math.copysign(h + minor, q)


def with_case(net, case):
    """The network with the demands of a case: factor (or the category's) times base, plus draws."""
    out = dict(net)
    out["nodes"] = {i: dict(n) for i, n in net["nodes"].items()}
    for n in out["nodes"].values():
        if n["fixed"] is None:
            n["q"] *= case["categories"].get(n["category"], case["factor"])
    for node, q in case["draws"]:
        out["nodes"][node]["q"] += q
    return out


def solve(net):
    free = [i for i, n in net["nodes"].items() if n["fixed"] is None]
    col = {i: k for k, i in enumerate(free)}
    pipes = net["pipes"]
    nq = len(pipes)

    def heads(x):
        return {i: (n["fixed"] if n["fixed"] is not None else x[nq + col[i]])
                for i, n in net["nodes"].items()}

    def equations(x):
        h = heads(x)
        out = [headloss(net, p, x[k]) - (h[p["a"]] - h[p["b"]]) for k, p in enumerate(pipes)]
        balance = {i: -net["nodes"][i]["q"] for i in free}
        for k, p in enumerate(pipes):
            if p["b"] in balance:
                balance[p["b"]] += x[k]
            if p["a"] in balance:
                balance[p["a"]] -= x[k]
        return np.array(out + [balance[i] * 1e3 for i in free])

    top = max(n["fixed"] for n in net["nodes"].values() if n["fixed"] is not None)
    x0 = np.array([0.01] * nq + [top - 5.0] * len(free))
    sol = root(equations, x0, method="hybr", options={"xtol": 1e-15, "maxfev": 200000})
    if not sol.success or np.max(np.abs(equations(sol.x))) > 1e-10:
        sol = root(equations, sol.x, method="lm", options={"xtol": 1e-15, "ftol": 1e-15})
    residual = float(np.max(np.abs(equations(sol.x))))
    if residual > 1e-9:
        raise SystemExit("scipy did not converge: residual %g" % residual)
    for k, p in enumerate(pipes):
        re_ = abs(sol.x[k]) / (math.pi * p["D"] ** 2 / 4) * p["D"] / net["nu"]
        if net["law"] == "dw" and 2000 < re_ < 4000:
            raise SystemExit("pipe %s is transitional (Re %.0f): choose other data" % (p["id"], re_))
    h = heads(sol.x)
    return {"source": "scipy %s root(hybr) on the full nonlinear system, fluids Colebrook"
                      % scipy.__version__,
            "max_residual": residual,
            "heads_m": {i: h[i] for i in free},
            "flows_m3s": {p["id"]: float(sol.x[k]) for k, p in enumerate(pipes)}}


def main():
    for path in sys.argv[1:]:
        name = path.rsplit("/", 1)[-1].rsplit(".", 1)[0]
        out = "tests/reference/%s.json" % name
        net = read(path)
        result = solve(net)
        if net.get("cases"):
            result["cases"] = {name: solve(with_case(net, c)) for name, c in net["cases"].items()}
        json.dump(result, open(out, "w"), indent=1, sort_keys=True)
        print("%s: max residual %.2e -> %s" % (path, result["max_residual"], out))


if __name__ == "__main__":
    main()
