#!/usr/bin/python3
"""Iso-surfaces of sample fields as VTK 9 computes them (Debian python3-vtk9): vtkContourFilter on the 3D cells
(vtkExtractCellsByType), then vtkIntegrateAttributes for the area and the surface integral of the velocity.

Like with like: on tetrahedra both VTK and fieldtally cut each cell by the plane where its linear interpolant
takes the value, so the areas agree to rounding. On hexahedra VTK triangulates each cell by its own case
table; the two agree exactly only where the field is linear, so the hexahedral case here is the duct's
pressure (linear along the duct). VTK 9.1's output vertices differ from the double-precision edge
interpolation by a few parts in 10^9 (its edge parameter seems to pass through single precision), so the
script also records `tetraArea`: the same marching-tetrahedra construction written out here in double
precision (plain Python over VTK's reader output), for the tetrahedral cases. The 2D cells of the sphere files are taken out first, as in
cut_reference.py.
Run: /usr/bin/python3 tests/reference/iso_reference.py [--check]   (from anywhere)
With --check it recomputes and compares with the committed JSON instead of writing (relative 1e-12),
prints one line per difference ("differs") and exits 1 if there is any.
"""
import math
import os
import sys

import vtk

from committed_values import write_or_check

vtk.vtkSMPTools.Initialize(1)

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'iso', 'iso_reference.json')
TYPES_3D = [10, 11, 12, 13, 14, 15, 16, 42]

# (name, file relative to the repository root, point array, iso values, record tetraArea)
CASES = [
    ('sphere-potential', 'sample-fields/sphere-potential.vtu', 'p', [-40.0, -5.0, 10.0, 50.0], True),
    ('sphere-stokes', 'sample-fields/sphere-stokes.vtu', 'p', [-2.0, 0.5, 3.0], False),
    ('duct', 'sample-fields/duct.vtu', 'p', [0.1, 0.7125, 1.3], False),
]


def tri_area(P):
    u = [P[1][k] - P[0][k] for k in range(3)]
    v = [P[2][k] - P[0][k] for k in range(3)]
    return 0.5 * math.sqrt((u[1] * v[2] - u[2] * v[1]) ** 2 + (u[2] * v[0] - u[0] * v[2]) ** 2 + (u[0] * v[1] - u[1] * v[0]) ** 2)


def tetra_area(grid, array, value):
    """Area of the iso-surface of the linear interpolant on each tetrahedron, in double precision."""
    p = grid.GetPointData().GetArray(array)
    total = 0.0
    for c in range(grid.GetNumberOfCells()):
        if grid.GetCellType(c) != 10:
            continue
        cell = grid.GetCell(c)
        ids = [cell.GetPointId(k) for k in range(4)]
        d = [p.GetValue(i) - value for i in ids]
        below = [k for k in range(4) if d[k] < 0]
        above = [k for k in range(4) if d[k] >= 0]
        if not below or not above:
            continue

        def cross(a, b):
            xa, xb = grid.GetPoint(ids[a]), grid.GetPoint(ids[b])
            return [(d[b] * xa[k] - d[a] * xb[k]) / (d[b] - d[a]) for k in range(3)]
        if len(below) == 1:
            total += tri_area([cross(below[0], a) for a in above])
        elif len(below) == 3:
            total += tri_area([cross(b, above[0]) for b in below])
        else:
            (b0, b1), (a0, a1) = below, above
            total += tri_area([cross(b0, a0), cross(b0, a1), cross(b1, a1)]) + tri_area([cross(b0, a0), cross(b1, a1), cross(b1, a0)])
    return total


def run_case(name, rel, array, values, tetra):
    reader = vtk.vtkXMLUnstructuredGridReader()
    reader.SetFileName(os.path.join(ROOT, rel))
    reader.Update()
    grid = reader.GetOutput()
    only3d = reader
    # VTK 9.1 contours nothing from vtkExtractCellsByType's output on the hexahedral duct: extract only when needed.
    if any(grid.GetCellType(c) not in TYPES_3D for c in range(grid.GetNumberOfCells())):
        only3d = vtk.vtkExtractCellsByType()
        only3d.SetInputConnection(reader.GetOutputPort())
        for t in TYPES_3D:
            only3d.AddCellType(t)
        only3d.Update()
    out = []
    for v in values:
        contour = vtk.vtkContourFilter()
        contour.SetInputConnection(only3d.GetOutputPort())
        contour.SetInputArrayToProcess(0, 0, 0, vtk.vtkDataObject.FIELD_ASSOCIATION_POINTS, array)
        contour.SetValue(0, v)
        contour.SetOutputPointsPrecision(vtk.vtkAlgorithm.DOUBLE_PRECISION)
        contour.Update()
        surf = contour.GetOutput()
        integ = vtk.vtkIntegrateAttributes()
        integ.SetInputData(surf)
        integ.Update()
        res = integ.GetOutput()
        area = res.GetCellData().GetArray('Area') if res.GetNumberOfCells() > 0 else None
        vel = res.GetPointData().GetArray('velocity') if res.GetNumberOfPoints() > 0 else None
        out.append({
            'value': v,
            'triangles': surf.GetNumberOfCells(),
            'area': area.GetValue(0) if area is not None else 0.0,
            'velocityIntegral': [vel.GetComponent(0, k) for k in range(3)] if vel is not None else [0.0, 0.0, 0.0],
        })
        if tetra:
            out[-1]['tetraArea'] = tetra_area(reader.GetOutput(), array, v)
    return {'name': name, 'file': rel, 'array': array, 'surfaces': out}


def flatten(doc):
    for c in doc['cases']:
        for s in c['surfaces']:
            key = '%s %s=%r' % (c['name'], c['array'], s['value'])
            yield key + ' triangles', s['triangles']
            yield key + ' area', s['area']
            if 'tetraArea' in s:
                yield key + ' tetraArea', s['tetraArea']
            for k, v in enumerate(s['velocityIntegral']):
                yield '%s velocityIntegral[%d]' % (key, k), v


def main():
    doc = {'vtk': vtk.vtkVersion.GetVTKVersion(), 'filter': 'vtkContourFilter + vtkIntegrateAttributes', 'cases': [run_case(*c) for c in CASES]}
    write_or_check(doc, OUT, flatten)


main()
