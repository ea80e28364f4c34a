#!/usr/bin/python3
"""What VTK 9.1 (Debian python3-vtk9) reads from the 2D-1 fields in tests/fixtures/dfg/ — an independent reader of
the files write_vtu.py wrote: point and cell counts, cell types, total volume (vtkCellSizeFilter), boundary
faces (vtkDataSetSurfaceFilter on the wedges) and the pressure by vtkProbeFilter at the two points of the
benchmark's Δp = p(0.15, 0.2) − p(0.25, 0.2), at mid-depth.
tests/surface/dfgVtk.test.ts compares fieldtally's reading, boundary faces and point probes with these numbers.
Run: /usr/bin/python3 tests/reference/dfg/dfg_vtk.py [--check]   (from anywhere)
With --check it recomputes and compares with the committed JSON (relative 1e-12) instead of writing, prints one
line per difference ("differs") and exits 1 if there is any.
"""
import os
import sys

import vtk

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
from committed_values import write_or_check  # noqa: E402

vtk.vtkSMPTools.Initialize(1)

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'dfg', 'dfg_vtk.json')
FILES = ['tests/fixtures/dfg/dfg-2d1-coarse.vtu', 'tests/fixtures/dfg/dfg-2d1-fine.vtu']
DEPTH = 0.1
PROBES = [(0.15, 0.2, DEPTH / 2), (0.25, 0.2, DEPTH / 2)]


def run(rel):
    reader = vtk.vtkXMLUnstructuredGridReader()
    reader.SetFileName(os.path.join(ROOT, rel))
    reader.Update()
    g = reader.GetOutput()
    types = sorted({g.GetCellType(i) for i in range(g.GetNumberOfCells())})
    size = vtk.vtkCellSizeFilter()
    size.SetInputData(g)
    size.Update()
    vol = size.GetOutput().GetCellData().GetArray('Volume')
    volume = sum(vol.GetValue(i) for i in range(vol.GetNumberOfTuples()))
    surf = vtk.vtkDataSetSurfaceFilter()
    surf.SetInputData(g)
    surf.Update()
    pts = vtk.vtkPoints()
    for p in PROBES:
        pts.InsertNextPoint(*p)
    probe_in = vtk.vtkPolyData()
    probe_in.SetPoints(pts)
    probe = vtk.vtkProbeFilter()
    probe.SetInputData(probe_in)
    probe.SetSourceData(g)
    probe.Update()
    out = probe.GetOutput()
    pressure = out.GetPointData().GetArray('pressure')
    valid = out.GetPointData().GetArray(probe.GetValidPointMaskArrayName())
    return {
        'file': rel, 'points': g.GetNumberOfPoints(), 'cells': g.GetNumberOfCells(), 'cellTypes': types,
        'volume': volume, 'boundaryFaces': surf.GetOutput().GetNumberOfCells(),
        'probes': [{'at': list(p), 'valid': int(valid.GetTuple1(i)), 'pressure': pressure.GetValue(i)} for i, p in enumerate(PROBES)],
    }


def flatten(doc):
    for c in doc['cases']:
        for k in ('points', 'cells', 'volume', 'boundaryFaces'):
            yield '%s %s' % (c['file'], k), c[k]
        for i, p in enumerate(c['probes']):
            yield '%s probe %d pressure' % (c['file'], i), p['pressure']
            yield '%s probe %d valid' % (c['file'], i), p['valid']


def main():
    doc = {'vtk': vtk.vtkVersion.GetVTKVersion(), 'cases': [run(f) for f in FILES]}
    write_or_check(doc, OUT, flatten)


main()
