#!/usr/bin/env python3
"""Where the second-order wall gradient's error on the 2D-1 fields comes from (a diagnosis, not run in CI).

Solves the field again (solve_dfg.py, same mesh options), then fits the wall velocity gradient at each node on
the cylinder in the plane alone — a weighted least-squares quadratic through the node's two rings of neighbours
in the written linear triangles, inverse-square distance weights, as fieldtally's kernel does in 3D — and
integrates the viscous drag on the written wall as fieldtally does (traction −μ(∇u + ∇uᵀ)·n̂ at the corners,
trapezoid rule). If this 2D number equals fieldtally's, the one-layer wedges (the other layer, the depth) play
no part and the error is the fit's own. A few variants of the fit are printed beside it for comparison, with the
field's own P2 nodal gradient (the limit of a perfect reconstruction).

Run: python3 tests/reference/dfg/fit_emulation.py [--quarter 8 --radial 16 --down 24]
Measured: coarse 1.93943487 (fieldtally 1.9394344), fine 1.94578479 (fieldtally 1.9457847).
"""
import argparse
import math
import os
import sys

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import solve_dfg as S  # noqa: E402
from dfg_mesh import RADIUS, build_mesh  # noqa: E402
from write_vtu import linear_triangles  # noqa: E402


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument('--quarter', type=int, default=8)
    ap.add_argument('--radial', type=int, default=16)
    ap.add_argument('--down', type=int, default=24)
    a = ap.parse_args()
    mesh = build_mesh(a.quarter, a.radial, 2 * math.pi * RADIUS / (8 * a.quarter) * 0.5, a.down)
    disc, X, _ = S.solve(mesh, log=lambda *_: None)
    pts, nv = mesh['points'], disc.nv
    U, V = X[:nv], X[nv:2 * nv]
    neighbours = [set() for _ in range(nv)]
    for t in linear_triangles(mesh['tri6']):
        for i in t:
            neighbours[i].update(int(j) for j in t if j != i)

    def stencil(i, rings):
        s = set(neighbours[i])
        if rings == 2:
            for j in neighbours[i]:
                s |= neighbours[j]
        s.discard(i)
        return np.array(sorted(s))

    def gradient(i, ids, cubic, power):
        d = pts[ids] - pts[i]
        h = math.sqrt((d ** 2).sum(1).mean())
        x, y = d[:, 0] / h, d[:, 1] / h
        cols = [x, y, 0.5 * x * x, 0.5 * y * y, x * y] + ([x ** 3, x * x * y, x * y * y, y ** 3] if cubic else [])
        A = np.stack(cols, 1)
        w = np.sqrt(1.0 / (x * x + y * y) ** (power / 2))
        return np.array([np.linalg.lstsq(A * w[:, None], (f[ids] - f[i]) * w, rcond=None)[0][:2] / h for f in (U, V)])

    ring = mesh['cylinder']
    scale = 2.0 / (S.RHO * S.UMEAN ** 2 * S.DIAMETER)

    def drag(G):
        F = np.zeros(2)
        for k in range(ring.size):
            p, q = ring[k], ring[(k + 1) % ring.size]
            d = pts[q] - pts[p]
            n = np.array([-d[1], d[0]]) / math.hypot(*d)
            F += 0.5 * math.hypot(*d) * sum(-S.NU * ((G[m] + G[m].T) @ n) for m in (p, q))
        return scale * F

    for label, rings, cubic, power in (('quadratic, two rings, 1/r² (the kernel)', 2, False, 2),
                                       ('quadratic, one ring, 1/r²', 1, False, 2),
                                       ('quadratic, two rings, 1/r⁴', 2, False, 4),
                                       ('cubic, two rings, 1/r²', 2, True, 2)):
        G = {int(i): gradient(int(i), stencil(int(i), rings), cubic, power) for i in ring}
        cd, cl = drag(G)
        print(f'{label:45s} viscous c_D {cd:.8f}  c_L {cl:.8f}')
    fvn = S.viscous_force_nodal(disc, X)
    own = "the field's own P2 nodal gradient"
    print(f'{own:45s} viscous c_D {scale * fvn[0]:.8f}  c_L {scale * fvn[1]:.8f}')


if __name__ == '__main__':
    main()
