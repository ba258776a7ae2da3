#!/usr/bin/python3
"""Independent operating point of tests/networks/pump_lift.gln with python3-scipy.

The pump curve H = a - b Q^c is fitted here through the same three points (0, 60 m),
(40 L/s, 50 m), (70 L/s, 35 m); the system curve is the static lift plus the rising main's
Darcy-Weisbach loss with fluids' Colebrook friction factor and the minor loss. brentq finds the
flow where they meet, at full speed and at 90% speed (affinity laws H ~ s^2, Q ~ s).
Writes tests/reference/pump_lift.json.  Run:  /usr/bin/python3 tools/reference_pump.py
"""
import json
import math

import scipy
from fluids.friction import Colebrook
from scipy.optimize import brentq

G = 9.80665
NU = 1.0e-6
a, (q2, h2), (q3, h3) = 60.0, (0.040, 50.0), (0.070, 35.0)
c = math.log((a - h2) / (a - h3)) / math.log(q2 / q3)
b = (a - h2) / q2 ** c
lift = 55.0 + 4.0 - 20.0
L, D, e, K = 1200.0, 0.25, 0.1e-3, 4.0
A = math.pi * D * D / 4


def system(q):
    v = q / A
    re = v * D / NU
    f = Colebrook(re, e / D, tol=0)
    return lift + (f * L / D + K) * v * v / (2 * G)


def pump(q, s=1.0):
    return a * s * s - b * s ** (2 - c) * q ** c


out = {"source": "scipy %s brentq on pump and system curves, fluids Colebrook" % scipy.__version__}
for s in (1.0, 0.9):
    q = brentq(lambda x: pump(x, s) - system(x), 1e-3, 0.2, xtol=1e-15, rtol=1e-14)
    out["speed_%g" % s] = {"flow_m3s": q, "head_m": pump(q, s)}
json.dump(out, open("tests/reference/pump_lift.json", "w"), indent=1)
print(out)
