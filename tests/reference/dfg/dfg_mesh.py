"""Graded block-structured mesh of quadratic (6-node) triangles for the channel-with-cylinder case of
Schäfer & Turek (1996), "Benchmark computations of laminar flow around a cylinder", Notes on Numerical
Fluid Mechanics 52, test case 2D-1: channel [0, 2.2] × [0, 0.41], cylinder of diameter 0.1 centred at
(0.2, 0.2).

Two blocks of quadrilaterals, each split into two triangles:
  * an O-grid between the cylinder and the box [0, 0.4] × [0, 0.41] (whose left side is the inflow and
    whose bottom and top sides are the channel walls): rays from the cylinder centre, points along each ray
    graded geometrically towards the cylinder;
  * a downstream block [0.4, 2.2] × [0, 0.41] sharing the box's right side, its columns stretched
    geometrically from the O-grid's outer spacing.

The mesh is generated at twice the resolution of the quadratic triangles ("fine" grid): each coarse
quadrilateral covers 2 × 2 fine cells, and the six nodes of each quadratic triangle are fine-grid points.
So the mid-edge nodes on the cylinder lie on the circle (isoparametric elements), and splitting each
quadratic triangle into four linear ones gives exactly the fine grid's triangles.
"""
import math

import numpy as np

CENTRE = (0.2, 0.2)
RADIUS = 0.05
LENGTH = 2.2
HEIGHT = 0.41
BOX_RIGHT = 0.4


def _geometric(n, first, total):
    """n steps of geometrically growing size summing to `total`, the first of size `first`; returns the
    n + 1 cumulative positions from 0 to total."""
    if abs(first * n - total) < 1e-14 * total:
        return np.linspace(0.0, total, n + 1)
    lo, hi = 1.0 + 1e-12, 2.0
    if first * n > total:
        lo, hi = 0.5, 1.0 - 1e-12
    for _ in range(200):
        q = 0.5 * (lo + hi)
        s = first * (q ** n - 1.0) / (q - 1.0)
        if (s > total) == (first * n < total):
            hi = q
        else:
            lo = q
    q = 0.5 * (lo + hi)
    steps = first * q ** np.arange(n)
    pos = np.concatenate([[0.0], np.cumsum(steps)])
    pos *= total / pos[-1]
    return pos


def _ring_angles(n_quarter):
    """Angles (radians, fine resolution, one ring without the repeated end) of the rays: each side of the box
    gets 2·n_quarter coarse cells uniform in angle between its corners; the right and left sides are split at
    0 and π so that the front and rear stagnation points are mesh vertices."""
    cx, cy = CENTRE
    c_br = math.atan2(0.0 - cy, BOX_RIGHT - cx)          # bottom-right corner
    c_tr = math.atan2(HEIGHT - cy, BOX_RIGHT - cx)       # top-right
    c_tl = math.atan2(HEIGHT - cy, 0.0 - cx)             # top-left
    c_bl = math.atan2(0.0 - cy, 0.0 - cx) + 2 * math.pi  # bottom-left, unwrapped
    c_br2 = c_br + 2 * math.pi
    m = 2 * n_quarter  # fine steps per half side
    pieces = [
        np.linspace(0.0, c_tr, m + 1)[:-1],
        np.linspace(c_tr, c_tl, 2 * m + 1)[:-1],
        np.linspace(c_tl, math.pi, m + 1)[:-1],
        np.linspace(math.pi, c_bl, m + 1)[:-1],
        np.linspace(c_bl, c_br2, 2 * m + 1)[:-1],
        np.linspace(c_br2, 2 * math.pi, m + 1)[:-1],
    ]
    return np.concatenate(pieces)


def _box_radius(theta):
    """Distance from the cylinder centre to the box boundary along the ray at angle theta."""
    cx, cy = CENTRE
    c, s = np.cos(theta), np.sin(theta)
    big = 1e30
    tx = np.where(c > 1e-14, (BOX_RIGHT - cx) / np.where(c > 1e-14, c, 1), np.where(c < -1e-14, (0.0 - cx) / np.where(c < -1e-14, c, 1), big))
    ty = np.where(s > 1e-14, (HEIGHT - cy) / np.where(s > 1e-14, s, 1), np.where(s < -1e-14, (0.0 - cy) / np.where(s < -1e-14, s, 1), big))
    return np.minimum(tx, ty)


def build_mesh(n_quarter, n_radial, first_layer, n_down):
    """Mesh with 8·n_quarter coarse cells around the cylinder, n_radial coarse layers in the O-grid (first
    coarse layer `first_layer` thick), n_down coarse columns downstream.

    Returns dict: points (N, 2) float64, tri6 (E, 6) int (vertices v0 v1 v2, mid-edge nodes m01 m12 m20,
    counter-clockwise), cylinder (node ids on the circle), ring (fine-grid ring size)."""
    theta = _ring_angles(n_quarter)
    nt = theta.size  # fine points around
    rb = _box_radius(theta)
    # radial fine positions: geometric in s, first fine step half the first coarse layer
    nj = 2 * n_radial
    s = _geometric(nj, 0.5 * first_layer / (0.2 - RADIUS), 1.0)
    rr = RADIUS + s[None, :] * (rb[:, None] - RADIUS)  # (nt, nj+1)
    ox = CENTRE[0] + rr * np.cos(theta)[:, None]
    oy = CENTRE[1] + rr * np.sin(theta)[:, None]
    ox[:, 0] = CENTRE[0] + RADIUS * np.cos(theta)
    oy[:, 0] = CENTRE[1] + RADIUS * np.sin(theta)
    # snap the box sides exactly
    outer_x, outer_y = ox[:, -1], oy[:, -1]
    outer_x[np.abs(outer_x - BOX_RIGHT) < 1e-12] = BOX_RIGHT
    outer_x[np.abs(outer_x) < 1e-12] = 0.0
    outer_y[np.abs(outer_y - HEIGHT) < 1e-12] = HEIGHT
    outer_y[np.abs(outer_y) < 1e-12] = 0.0
    o_id = np.arange(nt * (nj + 1)).reshape(nt, nj + 1)
    pts = [np.stack([ox.ravel(), oy.ravel()], axis=1)]

    # downstream block: rows = the ring's right-side points from bottom-right corner to top-right corner
    right = [i for i in range(nt) if abs(outer_x[i] - BOX_RIGHT) < 1e-12]
    # order by y (the right side spans the ring's wrap-around)
    right = sorted(right, key=lambda i: outer_y[i])
    ys = outer_y[right]
    assert ys[0] == 0.0 and ys[-1] == HEIGHT, 'box corners must be ring points'
    last_step = rr[0, -1] - rr[0, -2]  # fine radial step at the box's right side, theta = 0
    xs = BOX_RIGHT + _geometric(2 * n_down, last_step, LENGTH - BOX_RIGHT)
    nx, ny = xs.size, ys.size
    d_id = np.full((nx, ny), -1, dtype=np.int64)
    d_id[0, :] = o_id[right, -1]
    base = nt * (nj + 1)
    d_id[1:, :] = base + np.arange((nx - 1) * ny).reshape(nx - 1, ny)
    dx, dy = np.meshgrid(xs[1:], ys, indexing='ij')
    pts.append(np.stack([dx.ravel(), dy.ravel()], axis=1))
    points = np.concatenate(pts)

    tris = []

    def quads(ids, wrap_first):
        """Triangles of a fine-index grid ids[a, b] (coarse quads of 2 × 2 fine cells)."""
        na = ids.shape[0]
        nb = ids.shape[1]
        ca = (na if wrap_first else na - 1) // 2
        cb = (nb - 1) // 2
        for I in range(ca):
            for J in range(cb):
                a = [(2 * I + k) % na for k in range(3)]
                b = [2 * J + k for k in range(3)]
                P = [[ids[a[i], b[j]] for j in range(3)] for i in range(3)]
                # alternate the diagonal in a chequerboard, so the mesh has no preferred direction
                if (I + J) % 2 == 0:
                    tris.append([P[0][0], P[2][0], P[2][2], P[1][0], P[2][1], P[1][1]])
                    tris.append([P[0][0], P[2][2], P[0][2], P[1][1], P[1][2], P[0][1]])
                else:
                    tris.append([P[2][0], P[2][2], P[0][2], P[2][1], P[1][2], P[1][1]])
                    tris.append([P[2][0], P[0][2], P[0][0], P[1][1], P[0][1], P[1][0]])

    quads(o_id, True)
    quads(d_id, False)
    tri6 = np.array(tris, dtype=np.int64)
    # orient counter-clockwise
    p = points
    a = (p[tri6[:, 1], 0] - p[tri6[:, 0], 0]) * (p[tri6[:, 2], 1] - p[tri6[:, 0], 1]) - \
        (p[tri6[:, 2], 0] - p[tri6[:, 0], 0]) * (p[tri6[:, 1], 1] - p[tri6[:, 0], 1])
    flip = a < 0
    tri6[flip] = tri6[flip][:, [0, 2, 1, 5, 4, 3]]
    return {'points': points, 'tri6': tri6, 'cylinder': o_id[:, 0].copy(), 'ring': nt}
