#!/usr/bin/python3
"""Independent heads of tests/networks/fcv_line.gln: with the valve holding 15 L/s, each pipe
loses f L/D V^2/2g at that flow (fluids' Colebrook friction factor), so the heads either side of
the valve, and its head loss, follow directly. Writes tests/reference/fcv_line.json.
Run:  /usr/bin/python3 tools/reference_valves.py
"""
import json
import math

import fluids
from fluids.friction import Colebrook

G, NU, Q = 9.80665, 1.0e-6, 0.015


def loss(length, d, e):
    v = Q / (math.pi * d * d / 4)
    return Colebrook(v * d / NU, e / d, tol=0) * length / d * v * v / (2 * G)


h1 = 80.0 - loss(900.0, 0.2, 0.1e-3)
h2 = 40.0 + loss(600.0, 0.15, 0.1e-3)
out = {"source": "fluids %s Colebrook, head losses at the set flow" % fluids.__version__,
       "head_J1_m": h1, "head_J2_m": h2, "valve_headloss_m": h1 - h2}
json.dump(out, open("tests/reference/fcv_line.json", "w"), indent=1)
print(out)
