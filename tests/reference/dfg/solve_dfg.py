#!/usr/bin/env python3
"""Steady incompressible Navier–Stokes solve of test case 2D-1 of Schäfer & Turek (1996), "Benchmark
computations of laminar flow around a cylinder", Notes on Numerical Fluid Mechanics 52 (pages 547–566 from memory):
channel 2.2 × 0.41, cylinder D = 0.1 at (0.2, 0.2), ρ = 1, ν = 1e-3, inflow U(y) = 4·Umax·y(H − y)/H²
with Umax = 0.3 (mean 0.2, Re = 20), no-slip walls and cylinder, "do-nothing" outflow (ν∂u/∂n − p n = 0).

Discretisation: Taylor–Hood P2/P1 on isoparametric quadratic triangles (dfg_mesh.py), 7-point degree-5
quadrature, Newton's method from the Stokes solution, sparse direct solves (scipy SuperLU).
Forces by the volume-integral (test-function) method: with v_d = Σ of the velocity basis functions of the
cylinder's nodes in the drag direction, F_D = −[ν(∇u, ∇v_d) + ((u·∇)u, v_d) − (p, ∇·v_d)], likewise F_L.
c = 2F/(ρ Ū² D), Ū = 0.2. Δp = p(0.15, 0.2) − p(0.25, 0.2) (both are mesh vertices).

It also writes the field for fieldtally (write_vtu.py): each quadratic triangle split into four linear ones,
extruded into one layer of wedges of depth DEPTH, and the pressure part of the drag and lift integrated on
that written (polygonal) cylinder wall with the written (piecewise linear) pressure — exactly what a
surface integration of the file should give.

Needs numpy and scipy (not run in CI: the written field and JSON are committed).
Run: python3 tests/reference/dfg/solve_dfg.py [--quarter n] [--radial n] [--down n] [--first h] [--write]
"""
import argparse
import json
import math
import os
import sys
import time

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from dfg_mesh import CENTRE, HEIGHT, LENGTH, RADIUS, build_mesh  # noqa: E402

NU = 1e-3
RHO = 1.0
UMAX = 0.3
UMEAN = 2.0 * UMAX / 3.0
DIAMETER = 2 * RADIUS
DEPTH = 0.1

# High-accuracy values of the later literature as listed on the TU Dortmund benchmark page for the Re = 20 case
# (docs/references.md §8); inside the 1996 paper's intervals (c_D 5.57–5.59, c_L 0.0104–0.0110 from memory;
# Δp 0.1172–0.1176)
REFERENCE = {'cD': 5.57953523384, 'cL': 0.010618948146, 'dp': 0.11752016697}

# 7-point degree-5 rule on the reference triangle (Radon 1948; weights for area 1, scaled by ½ below)
_A = (6 - math.sqrt(15)) / 21
_B = (6 + math.sqrt(15)) / 21
_WA = (155 - math.sqrt(15)) / 1200
_WB = (155 + math.sqrt(15)) / 1200
QP = np.array([[1 / 3, 1 / 3], [_A, _A], [1 - 2 * _A, _A], [_A, 1 - 2 * _A], [_B, _B], [1 - 2 * _B, _B], [_B, 1 - 2 * _B]])
QW = 0.5 * np.array([9 / 40, _WA, _WA, _WA, _WB, _WB, _WB])


def p2_basis(xi, eta):
    """Values (6,) and reference derivatives (6, 2) of the P2 basis at (xi, eta)."""
    l0, l1, l2 = 1 - xi - eta, xi, eta
    N = np.array([l0 * (2 * l0 - 1), l1 * (2 * l1 - 1), l2 * (2 * l2 - 1), 4 * l0 * l1, 4 * l1 * l2, 4 * l2 * l0])
    dl = np.array([[-1.0, -1.0], [1.0, 0.0], [0.0, 1.0]])
    d = np.zeros((6, 2))
    d[0] = (4 * l0 - 1) * dl[0]
    d[1] = (4 * l1 - 1) * dl[1]
    d[2] = (4 * l2 - 1) * dl[2]
    d[3] = 4 * (l0 * dl[1] + l1 * dl[0])
    d[4] = 4 * (l1 * dl[2] + l2 * dl[1])
    d[5] = 4 * (l2 * dl[0] + l0 * dl[2])
    return N, d


def check_quadrature():
    """The rule integrates every monomial up to degree 5 exactly: ∫ x^a y^b = a! b! / (a + b + 2)!."""
    for a in range(6):
        for b in range(6 - a):
            exact = math.factorial(a) * math.factorial(b) / math.factorial(a + b + 2)
            got = float(np.sum(QW * QP[:, 0] ** a * QP[:, 1] ** b))
            assert abs(got - exact) < 1e-15, (a, b, got, exact)


class Discretisation:
    """Geometry factors at the quadrature points of every element (isoparametric P2 map)."""

    def __init__(self, mesh):
        self.mesh = mesh
        pts, t6 = mesh['points'], mesh['tri6']
        ne = t6.shape[0]
        self.ne = ne
        nq = QP.shape[0]
        Nq = np.zeros((nq, 6))
        dNq = np.zeros((nq, 6, 2))
        for q in range(nq):
            Nq[q], dNq[q] = p2_basis(*QP[q])
        self.N = Nq
        X = pts[t6]  # (ne, 6, 2)
        J = np.einsum('qkr,ekc->eqcr', dNq, X)  # J[e,q,c,r] = dx_c/dxi_r
        det = J[..., 0, 0] * J[..., 1, 1] - J[..., 0, 1] * J[..., 1, 0]
        if np.any(det <= 0):
            raise RuntimeError(f'{int(np.sum(det <= 0))} quadrature points with non-positive Jacobian')
        inv = np.empty_like(J)
        inv[..., 0, 0] = J[..., 1, 1] / det
        inv[..., 1, 1] = J[..., 0, 0] / det
        inv[..., 0, 1] = -J[..., 0, 1] / det
        inv[..., 1, 0] = -J[..., 1, 0] / det
        self.dN = np.einsum('qkr,eqrc->eqkc', dNq, inv)  # physical gradients (ne, nq, 6, 2)
        self.wdet = det * QW[None, :]  # (ne, nq)
        self.area = self.wdet.sum()
        # pressure: P1 in the reference coordinates (vertex functions)
        self.M = np.stack([1 - QP[:, 0] - QP[:, 1], QP[:, 0], QP[:, 1]], axis=1)  # (nq, 3)
        # numbering: velocity nodes = all points; pressure nodes = vertices
        self.nv = pts.shape[0]
        verts = np.unique(t6[:, :3])
        pmap = -np.ones(self.nv, dtype=np.int64)
        pmap[verts] = np.arange(verts.size)
        self.pvert = verts
        self.pmap = pmap
        self.np_ = verts.size
        self.pt3 = pmap[t6[:, :3]]
        self.ndof = 2 * self.nv + self.np_
        # sparsity indices of the 15 local dofs (u 6, v 6, p 3)
        loc = np.concatenate([t6, t6 + self.nv, self.pt3 + 2 * self.nv], axis=1)  # (ne, 15)
        self.rows = np.repeat(loc, 15, axis=1).ravel()
        self.cols = np.tile(loc, (1, 15)).ravel()
        self.loc = loc
        # constant parts: viscous (Laplace form) and divergence
        K = NU * np.einsum('eqic,eqjc,eq->eij', self.dN, self.dN, self.wdet)
        Bx = -np.einsum('qa,eqj,eq->eaj', self.M, self.dN[..., 0], self.wdet)  # −(q, ∂u/∂x)
        By = -np.einsum('qa,eqj,eq->eaj', self.M, self.dN[..., 1], self.wdet)
        A0 = np.zeros((ne, 15, 15))
        A0[:, 0:6, 0:6] = K
        A0[:, 6:12, 6:12] = K
        A0[:, 12:15, 0:6] = Bx
        A0[:, 12:15, 6:12] = By
        A0[:, 0:6, 12:15] = Bx.transpose(0, 2, 1)
        A0[:, 6:12, 12:15] = By.transpose(0, 2, 1)
        self.A0 = A0

    def local_matrices(self, U, newton):
        """Element matrices (ne, 15, 15): Stokes part plus convection at the velocity U (Picard part
        ((u·∇)δu, v) and, with newton, ((δu·∇)u, v))."""
        t6 = self.mesh['tri6']
        ue, ve = U[t6], U[t6 + self.nv]  # (ne, 6)
        uq = np.einsum('qk,ek->eq', self.N, ue)
        vq = np.einsum('qk,ek->eq', self.N, ve)
        adv = uq[..., None] * self.dN[..., 0] + vq[..., None] * self.dN[..., 1]  # (ne, nq, 6): u·∇φ_j
        C = np.einsum('qi,eqj,eq->eij', self.N, adv, self.wdet)
        A = self.A0.copy()
        A[:, 0:6, 0:6] += C
        A[:, 6:12, 6:12] += C
        if newton:
            gu = np.einsum('eqkc,ek->eqc', self.dN, ue)  # ∇u at quadrature points
            gv = np.einsum('eqkc,ek->eqc', self.dN, ve)
            mass = np.einsum('qi,qj->qij', self.N, self.N)  # (nq, 6, 6)
            for a, g in ((0, gu), (1, gv)):
                for b in range(2):
                    A[:, 6 * a:6 * a + 6, 6 * b:6 * b + 6] += np.einsum('qij,eq,eq->eij', mass, g[..., b], self.wdet)
        return A

    def assemble(self, A):
        return sp.coo_matrix((A.ravel(), (self.rows, self.cols)), shape=(self.ndof, self.ndof)).tocsr()

    def residual(self, X):
        """Residual vector of the discrete equations (no boundary conditions applied)."""
        A = self.local_matrices(X, newton=False)
        xe = X[self.loc]
        r = np.einsum('eij,ej->ei', A, xe)
        R = np.zeros(self.ndof)
        np.add.at(R, self.loc.ravel(), r.ravel())
        return R


def dirichlet(mesh, nv):
    """Dirichlet dofs and values: inflow profile at x = 0, zero on the walls and the cylinder."""
    p = mesh['points']
    x, y = p[:, 0], p[:, 1]
    r = np.hypot(x - CENTRE[0], y - CENTRE[1])
    inflow = np.abs(x) < 1e-12
    wall = (np.abs(y) < 1e-12) | (np.abs(y - HEIGHT) < 1e-12)
    cyl = np.zeros(nv, dtype=bool)
    cyl[mesh['cylinder']] = True
    assert np.all(np.abs(r[cyl] - RADIUS) < 1e-12)
    fixed = inflow | wall | cyl
    uval = np.where(inflow, 4 * UMAX * y * (HEIGHT - y) / HEIGHT ** 2, 0.0)
    uval[wall | cyl] = 0.0
    dofs = np.concatenate([np.nonzero(fixed)[0], np.nonzero(fixed)[0] + nv])
    vals = np.concatenate([uval[fixed], np.zeros(int(fixed.sum()))])
    return dofs, vals, cyl


def solve(mesh, log=print):
    """Stokes solution, then Newton steps until the free residual stops falling (below 1e-13). Returns the
    discretisation, the solution vector (u, v at every node, then p at the vertices) and the cylinder mask;
    `disc.newton` records the Newton steps taken and the final residual norm."""
    disc = Discretisation(mesh)
    dofs, vals, cyl = dirichlet(mesh, disc.nv)
    free = np.ones(disc.ndof, dtype=bool)
    free[dofs] = False
    X = np.zeros(disc.ndof)
    X[dofs] = vals
    t0 = time.time()
    A = disc.assemble(disc.A0)
    X[free] = spla.spsolve(A[free][:, free].tocsc(), -A[free][:, ~free] @ X[~free])
    steps = 0
    for steps in range(1, 31):
        R = disc.residual(X)
        log(f'  Newton step {steps}: residual before {np.linalg.norm(R[free]):.3e} ({time.time() - t0:.1f} s)')
        J = disc.assemble(disc.local_matrices(X, newton=True))
        dx = spla.spsolve(J[free][:, free].tocsc(), -R[free])
        X[free] += dx
        if np.linalg.norm(dx) < 1e-13 * max(1.0, np.linalg.norm(X)):
            break
    final = float(np.linalg.norm(disc.residual(X)[free]))
    log(f'  final residual {final:.3e} after {steps} Newton steps')
    if final > 1e-12:
        raise RuntimeError(f'Newton did not converge: residual {final:.3e}')
    disc.newton = {'steps': steps, 'residual': final}
    return disc, X, cyl


def forces(disc, X, cyl):
    """Drag and lift per unit depth (N/m with ρ = 1) by the volume-integral method."""
    R = disc.residual(X)
    nodes = np.nonzero(cyl)[0]
    fd = -R[nodes].sum()
    fl = -R[nodes + disc.nv].sum()
    return fd, fl


def pressure_at_vertex(disc, X, x, y):
    p = disc.mesh['points']
    k = int(np.argmin(np.hypot(p[:, 0] - x, p[:, 1] - y)))
    assert math.hypot(p[k, 0] - x, p[k, 1] - y) < 1e-12, f'({x}, {y}) is not a vertex'
    return X[2 * disc.nv + disc.pmap[k]]


def node_pressure(disc, X):
    """Pressure at every P2 node: vertex values, mid-edge nodes the mean of their edge's vertices (the P1
    function at the mid-edge point of the reference element)."""
    t6 = disc.mesh['tri6']
    pv = X[2 * disc.nv:]
    P = np.zeros(disc.nv)
    P[disc.pvert] = pv
    for m, (a, b) in zip((3, 4, 5), ((0, 1), (1, 2), (2, 0))):
        P[t6[:, m]] = 0.5 * (P[t6[:, a]] + P[t6[:, b]])
    return P


def pressure_force_curved(disc, X, P):
    """Pressure part −∮ p n_body ds on the curved (isoparametric) cylinder wall, 5-point Gauss per edge."""
    t6 = disc.mesh['tri6']
    pts = disc.mesh['points']
    cyl = np.zeros(disc.nv, dtype=bool)
    cyl[disc.mesh['cylinder']] = True
    g, w = np.polynomial.legendre.leggauss(5)
    g, w = 0.5 * (g + 1), 0.5 * w
    F = np.zeros(2)
    for a, b, m in ((0, 1, 3), (1, 2, 4), (2, 0, 5)):
        sel = cyl[t6[:, a]] & cyl[t6[:, b]] & cyl[t6[:, m]]
        for e in np.nonzero(sel)[0]:
            A, B, M = pts[t6[e, a]], pts[t6[e, b]], pts[t6[e, m]]
            pa, pb = P[t6[e, a]], P[t6[e, b]]
            for s, ws in zip(g, w):
                # quadratic edge x(s) = A(1−s)(1−2s) + B s(2s−1) + M 4s(1−s)
                dx = A * (4 * s - 3) + B * (4 * s - 1) + M * (4 - 8 * s)
                ps = pa * (1 - s) + pb * s
                # the element is counter-clockwise, so the fluid is on the left of the edge and the body
                # on its right: the normal out of the body (into the fluid) is the tangent turned left
                nb = np.array([-dx[1], dx[0]])
                F += -ps * nb * ws
    return F


def pressure_force_polygon(disc, P):
    """Pressure part on the written wall: the fine (linear) segments between consecutive nodes on the circle
    with the pressure linear along each; exact for the written file."""
    pts = disc.mesh['points']
    ring = disc.mesh['cylinder']
    F = np.zeros(2)
    n = ring.size
    for i in range(n):
        a, b = ring[i], ring[(i + 1) % n]
        d = pts[b] - pts[a]
        # ring runs counter-clockwise around the centre, so the outward normal of the body is d turned right
        nb = np.array([d[1], -d[0]])
        F += -0.5 * (P[a] + P[b]) * nb
    return F


def viscous_force_nodal(disc, X):
    """Viscous part on the written wall from the quadratic field's own gradient: at each node on the circle the
    P2 gradient averaged over the elements holding it, traction −ν(∇u + ∇uᵀ)·n̂ with n̂ the written face's
    normal (out of the fluid), trapezoid rule along each face. What a perfect wall-gradient reconstruction of
    the written field gives; the difference to the volume-integral value is the field's own wall error."""
    t6 = disc.mesh['tri6']
    pts = disc.mesh['points']
    nv = disc.nv
    ring = disc.mesh['cylinder']
    on = np.zeros(nv, dtype=bool)
    on[ring] = True
    corners = {0: (0.0, 0.0), 1: (1.0, 0.0), 2: (0.0, 1.0), 3: (0.5, 0.0), 4: (0.5, 0.5), 5: (0.0, 0.5)}
    G = np.zeros((nv, 2, 2))
    count = np.zeros(nv)
    for e in np.nonzero(on[t6].any(axis=1))[0]:
        Xe = pts[t6[e]]
        for k in range(6):
            node = t6[e, k]
            if not on[node]:
                continue
            _, dN = p2_basis(*corners[k])
            dNx = dN @ np.linalg.inv(Xe.T @ dN)
            G[node, 0] += X[t6[e]] @ dNx
            G[node, 1] += X[t6[e] + nv] @ dNx
            count[node] += 1
    G[ring] /= count[ring][:, None, None]
    F = np.zeros(2)
    for i in range(ring.size):
        a, b = ring[i], ring[(i + 1) % ring.size]
        d = pts[b] - pts[a]
        length = math.hypot(d[0], d[1])
        n_fluid = np.array([-d[1], d[0]]) / length  # into the body: out of the fluid
        ta = -NU * RHO * ((G[a] + G[a].T) @ n_fluid)
        tb = -NU * RHO * ((G[b] + G[b].T) @ n_fluid)
        F += 0.5 * (ta + tb) * length
    return F


def main():
    ap = argparse.ArgumentParser(description=__doc__.split('\n')[0])
    ap.add_argument('--quarter', type=int, default=8, help='coarse cells per eighth of the circle')
    ap.add_argument('--radial', type=int, default=16, help='coarse layers in the O-grid')
    ap.add_argument('--first', type=float, default=None, help='first coarse layer thickness (default: half the coarse spacing along the circle)')
    ap.add_argument('--down', type=int, default=24, help='coarse columns downstream')
    ap.add_argument('--write', action='store_true', help='write the field and JSON (to --out)')
    ap.add_argument('--depth', type=float, default=DEPTH, help=f'depth of the wedge layer (default {DEPTH})')
    ap.add_argument('--name', default='dfg-2d1', help='file name stem for --write')
    ap.add_argument('--out', default=None, help='folder for --write (default tests/fixtures/dfg)')
    a = ap.parse_args()
    check_quadrature()
    first = a.first if a.first is not None else 2 * math.pi * RADIUS / (8 * a.quarter) * 0.5
    mesh = build_mesh(a.quarter, a.radial, first, a.down)
    print(f'mesh: {mesh["tri6"].shape[0]} quadratic triangles, {mesh["points"].shape[0]} nodes, '
          f'{mesh["cylinder"].size} nodes on the cylinder')
    disc, X, cyl = solve(mesh)
    print(f'  domain area {disc.area:.12f} (exact {LENGTH * HEIGHT - math.pi * RADIUS ** 2:.12f})')
    fd, fl = forces(disc, X, cyl)
    scale = 2.0 / (RHO * UMEAN ** 2 * DIAMETER)
    cd, cl = scale * fd, scale * fl
    dp = pressure_at_vertex(disc, X, CENTRE[0] - RADIUS, CENTRE[1]) - pressure_at_vertex(disc, X, CENTRE[0] + RADIUS, CENTRE[1])
    P = node_pressure(disc, X)
    fpc = pressure_force_curved(disc, X, P)
    fpp = pressure_force_polygon(disc, P)
    fvn = viscous_force_nodal(disc, X)
    rel = lambda v, r: 100 * (v - r) / r
    print(f'c_D = {cd:.8f} ({rel(cd, REFERENCE["cD"]):+.4f} %)  c_L = {cl:.8f} ({rel(cl, REFERENCE["cL"]):+.3f} %)  '
          f'dp = {dp:.8f} ({rel(dp, REFERENCE["dp"]):+.4f} %)')
    print(f'pressure part c_D: curved wall {scale * fpc[0]:.8f}, written polygon {scale * fpp[0]:.8f}; '
          f'c_L: curved {scale * fpc[1]:.8f}, polygon {scale * fpp[1]:.8f}')
    print(f'viscous part c_D: volume method − curved pressure {cd - scale * fpc[0]:.8f}, '
          f'the nodal P2 gradient on the written wall {scale * fvn[0]:.8f}')
    if a.write:
        from write_vtu import write_field
        root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))))
        out = a.out or os.path.join(root, 'tests', 'fixtures', 'dfg')
        os.makedirs(out, exist_ok=True)
        vtu = os.path.join(out, f'{a.name}.vtu')
        info = write_field(vtu, mesh, X[:disc.nv], X[disc.nv:2 * disc.nv], P, a.depth)
        summary = {
            'source': 'tests/reference/dfg/solve_dfg.py (Taylor–Hood P2/P1, Newton)',
            'mesh': {'quarter': a.quarter, 'radial': a.radial, 'first': first, 'down': a.down,
                     'elements': int(mesh['tri6'].shape[0]), 'nodes': int(mesh['points'].shape[0]),
                     'cylinderNodes': int(mesh['cylinder'].size)},
            'newton': disc.newton,
            'depth': a.depth, 'rho': RHO, 'nu': NU, 'mu': RHO * NU, 'meanSpeed': UMEAN, 'diameter': DIAMETER,
            'volumeMethod': {'cD': cd, 'cL': cl, 'dragPerDepth': fd, 'liftPerDepth': fl},
            'deltaP': dp,
            'pressurePart': {'curvedWall': {'cD': scale * fpc[0], 'cL': scale * fpc[1]},
                             'writtenWall': {'cD': scale * fpp[0], 'cL': scale * fpp[1]}},
            'viscousPart': {'cD': cd - scale * fpc[0], 'cL': cl - scale * fpc[1]},
            'viscousPartFromNodalGradient': {'cD': scale * fvn[0], 'cL': scale * fvn[1]},
            'reference': REFERENCE,
            'file': info,
        }
        with open(os.path.join(out, f'{a.name}.json'), 'w') as f:
            json.dump(summary, f, indent=2)
            f.write('\n')
        print(f'wrote {vtu} ({os.path.getsize(vtu)} bytes)')


if __name__ == '__main__':
    main()
