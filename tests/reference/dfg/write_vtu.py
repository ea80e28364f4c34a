"""Writes the solved field as one layer of wedges in a VTK XML unstructured-grid file (appended raw data,
zlib blocks, UInt64 headers), following the open VTK file-format description ("VTK File Formats", VTK
User's Guide, XML section).

Each quadratic triangle becomes four linear triangles whose vertices are its six nodes, so every velocity
node of the quadratic field is a point of the file; the pressure at mid-edge nodes is the mean of the edge's
vertex values (given). The triangles are extruded from z = 0 to z = depth; both layers carry the same
values (velocity with w = 0).
"""
import struct
import zlib

import numpy as np

BLOCK = 1 << 15
VTK_WEDGE = 13


def _compressed(raw):
    blocks = [raw[i:i + BLOCK] for i in range(0, len(raw), BLOCK)] or [b'']
    comp = [zlib.compress(b, 9) for b in blocks]
    last = len(blocks[-1])
    header = struct.pack(f'<{3 + len(comp)}Q', len(blocks), BLOCK, last, *[len(c) for c in comp])
    return header + b''.join(comp)


def linear_triangles(tri6):
    """(4E, 3) counter-clockwise linear triangles from (E, 6) quadratic ones (v0 v1 v2 m01 m12 m20)."""
    v0, v1, v2, m01, m12, m20 = (tri6[:, k] for k in range(6))
    t = np.stack([
        np.stack([v0, m01, m20], 1), np.stack([m01, v1, m12], 1),
        np.stack([m20, m12, v2], 1), np.stack([m01, m12, m20], 1),
    ], 1)
    return t.reshape(-1, 3)


def write_field(path, mesh, u, v, p, depth):
    pts2 = mesh['points']
    n = pts2.shape[0]
    tri = linear_triangles(mesh['tri6'])
    pts = np.zeros((2 * n, 3))
    pts[:n, :2] = pts2
    pts[n:, :2] = pts2
    pts[n:, 2] = depth
    # VTK wedge: the triangle (0, 1, 2) has its right-hand normal pointing away from (3, 4, 5); the
    # triangles are counter-clockwise seen from +z, so the bottom one is listed clockwise
    a, b, c = tri[:, 0], tri[:, 2], tri[:, 1]
    conn = np.stack([a, b, c, a + n, b + n, c + n], 1).astype('<i4')
    ncell = conn.shape[0]
    offsets = (6 * np.arange(1, ncell + 1)).astype('<i4')
    types = np.full(ncell, VTK_WEDGE, dtype=np.uint8)
    vel = np.zeros((2 * n, 3))
    vel[:n, 0] = u
    vel[:n, 1] = v
    vel[n:] = vel[:n]
    pres = np.concatenate([p, p])

    arrays = [
        ('PointData', 'velocity', 'Float64', 3, vel.astype('<f8')),
        ('PointData', 'pressure', 'Float64', 1, pres.astype('<f8')),
        ('Points', None, 'Float64', 3, pts.astype('<f8')),
        ('Cells', 'connectivity', 'Int32', 1, conn),
        ('Cells', 'offsets', 'Int32', 1, offsets),
        ('Cells', 'types', 'UInt8', 1, types),
    ]
    blobs, offs, pos = [], [], 0
    for arr in arrays:
        blob = _compressed(np.ascontiguousarray(arr[4]).tobytes())
        blobs.append(blob)
        offs.append(pos)
        pos += len(blob)

    def tag(k):
        _, name, typ, comps, _ = arrays[k]
        nm = f' Name="{name}"' if name else ''
        nc = f' NumberOfComponents="{comps}"' if comps > 1 or name is None else ''
        return f'        <DataArray type="{typ}"{nm}{nc} format="appended" offset="{offs[k]}"/>\n'

    xml = (
        '<?xml version="1.0"?>\n'
        '<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt64" '
        'compressor="vtkZLibDataCompressor">\n'
        '  <UnstructuredGrid>\n'
        f'    <Piece NumberOfPoints="{2 * n}" NumberOfCells="{ncell}">\n'
        '      <PointData Scalars="pressure" Vectors="velocity">\n' + tag(0) + tag(1) +
        '      </PointData>\n'
        '      <Points>\n' + tag(2) + '      </Points>\n'
        '      <Cells>\n' + tag(3) + tag(4) + tag(5) + '      </Cells>\n'
        '    </Piece>\n'
        '  </UnstructuredGrid>\n'
        '  <AppendedData encoding="raw">\n_'
    ).encode()
    with open(path, 'wb') as f:
        f.write(xml)
        for b in blobs:
            f.write(b)
        f.write(b'\n  </AppendedData>\n</VTKFile>\n')
    return {'points': int(2 * n), 'wedges': int(ncell), 'depth': depth}
