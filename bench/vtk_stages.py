#!/usr/bin/python3
"""The reference side of `npm run bench -- versus`: the same stages as fieldtally, done with VTK's Python bindings.

Run with /usr/bin/python3 (Debian python3-vtk9):
  vtk_stages.py stages <file.vtu> '<job json>'   time each stage, print JSON
  vtk_stages.py cut <file.vtu> '<job json>'      one-shot: read, cut with the first plane, integrate, print

The job (written by bench/versus.bench.ts) holds two planes {origin, normal}, two lines {a, b} and the sample
count. Stages, each timed in wall and process CPU milliseconds:
  load       vtkXMLUnstructuredGridReader
  firstCut   vtkCutter (vtkPlane) then vtkIntegrateAttributes: area and the integral of p
  laterCut   the same cutter with the second plane
  firstLine  vtkProbeFilter along a vtkLineSource (its cell locator is built here)
  laterLine  the same probe filter along the second line
  boundary   vtkDataSetSurfaceFilter and vtkGeometryFilter on the 3D cells (both timed; the faster is VTK's
             figure); 2D cells of the file are taken out first (vtkExtractCellsByType), before the clock starts
  force      pressure force over the whole boundary: p to faces (vtkPointDataToCellData), face normals
             (vtkPolyDataNormals, cell normals, no splitting or reorienting), p n per face (vtkArrayCalculator),
             integrated over the faces (vtkIntegrateAttributes)
The figures come back with check values (cut area, valid samples, boundary faces, force) so the two tools can
be compared number against number, not only in time.
"""
import json
import resource
import sys
import time

import vtk


def clock():
    r = resource.getrusage(resource.RUSAGE_SELF)
    return time.perf_counter(), r.ru_utime + r.ru_stime


def since(t):
    w, c = clock()
    return {'wallMs': round((w - t[0]) * 1000, 1), 'cpuMs': round((c - t[1]) * 1000, 1)}


def read(path):
    r = vtk.vtkXMLUnstructuredGridReader()
    r.SetFileName(path)
    r.Update()
    g = r.GetOutput()
    if g.GetNumberOfCells() == 0:
        sys.exit('vtk_stages.py: VTK read no cells from ' + path)
    return g


# Linear and higher-order 3D cell types (VTK numbering).
TYPES_3D = {10, 11, 12, 13, 14, 15, 16, 42, 24, 25, 26, 27, 29, 32, 33, 34, 36, 37, 71, 72, 73, 74, 78, 79, 80, 81}


def volume_cells(grid):
    """The grid's 3D cells only (fieldtally's boundary is made of faces of 3D cells; VTK passes 2D cells through)."""
    types = vtk.vtkCellTypes()
    grid.GetCellTypes(types)
    kinds = [types.GetCellType(i) for i in range(types.GetNumberOfTypes())]
    if all(t in TYPES_3D for t in kinds):
        return grid
    ex = vtk.vtkExtractCellsByType()
    ex.SetInputData(grid)
    for t in kinds:
        if t in TYPES_3D:
            ex.AddCellType(t)
    ex.Update()
    return ex.GetOutput()


def cut_and_integrate(cutter, plane, p):
    plane.SetOrigin(*p['origin'])
    plane.SetNormal(*p['normal'])
    cutter.Modified()
    cutter.Update()
    integ = vtk.vtkIntegrateAttributes()
    integ.SetInputData(cutter.GetOutput())
    integ.Update()
    out = integ.GetOutput()
    area = out.GetCellData().GetArray('Area')
    pint = out.GetPointData().GetArray('p')
    return {
        'area': area.GetValue(0) if area else 0.0,
        'pIntegral': pint.GetValue(0) if pint else 0.0,
        'triangles': cutter.GetOutput().GetNumberOfCells(),
    }


def make_cutter(grid):
    plane = vtk.vtkPlane()
    cutter = vtk.vtkCutter()
    cutter.SetCutFunction(plane)
    cutter.SetInputData(grid)
    return cutter, plane


def probe(probe_filter, line, job, l):
    line.SetPoint1(*l['a'])
    line.SetPoint2(*l['b'])
    line.SetResolution(job['samples'] - 1)
    probe_filter.Update()
    mask = probe_filter.GetOutput().GetPointData().GetArray('vtkValidPointMask')
    return sum(1 for i in range(mask.GetNumberOfTuples()) if mask.GetValue(i))


def surface_force(surface):
    c2 = vtk.vtkPointDataToCellData()
    c2.SetInputData(surface)
    c2.PassPointDataOff()
    c2.Update()
    normals = vtk.vtkPolyDataNormals()
    normals.SetInputData(c2.GetOutput())
    normals.ComputeCellNormalsOn()
    normals.ComputePointNormalsOff()
    normals.SplittingOff()
    normals.ConsistencyOff()
    normals.AutoOrientNormalsOff()
    normals.Update()
    calc = vtk.vtkArrayCalculator()
    calc.SetInputData(normals.GetOutput())
    calc.SetAttributeTypeToCellData()
    calc.AddScalarArrayName('p')
    calc.AddVectorArrayName('Normals')
    calc.SetFunction('p*Normals')
    calc.SetResultArrayName('pn')
    calc.Update()
    integ = vtk.vtkIntegrateAttributes()
    integ.SetInputData(calc.GetOutput())
    integ.Update()
    pn = integ.GetOutput().GetCellData().GetArray('pn')
    # the force of the fluid on the wall: p along the outward normal of the fluid region (the surface filter faces outward)
    f = [pn.GetComponent(0, k) for k in range(3)]
    return [float(v) for v in f]


def stages(path, job):
    out = {'vtkVersion': vtk.vtkVersion.GetVTKVersion()}
    t = clock()
    grid = read(path)
    out['load'] = since(t)
    out['cells'] = grid.GetNumberOfCells()
    cutter, plane = make_cutter(grid)
    t = clock()
    c1 = cut_and_integrate(cutter, plane, job['planes'][0])
    out['firstCut'] = since(t)
    t = clock()
    c2 = cut_and_integrate(cutter, plane, job['planes'][1])
    out['laterCut'] = since(t)
    line = vtk.vtkLineSource()
    pf = vtk.vtkProbeFilter()
    pf.SetInputConnection(line.GetOutputPort())
    pf.SetSourceData(grid)
    t = clock()
    v1 = probe(pf, line, job, job['lines'][0])
    out['firstLine'] = since(t)
    t = clock()
    v2 = probe(pf, line, job, job['lines'][1])
    out['laterLine'] = since(t)
    volume = volume_cells(grid)  # before the clock: like with like, not part of VTK's cost
    t = clock()
    sf = vtk.vtkDataSetSurfaceFilter()
    sf.SetInputData(volume)
    sf.Update()
    by_surface_filter = since(t)
    t = clock()
    gf = vtk.vtkGeometryFilter()
    gf.SetInputData(volume)
    gf.Update()
    by_geometry_filter = since(t)
    faster = min(by_surface_filter, by_geometry_filter, key=lambda x: x['wallMs'])
    out['boundary'] = dict(faster, surfaceFilter=by_surface_filter, geometryFilter=by_geometry_filter)
    surface = sf.GetOutput()
    t = clock()
    force = surface_force(surface)
    out['force'] = since(t)
    out['check'] = {
        'firstCutArea': c1['area'], 'firstCutPIntegral': c1['pIntegral'], 'laterCutArea': c2['area'],
        'firstLineValid': v1, 'laterLineValid': v2, 'boundaryFaces': surface.GetNumberOfCells(),
        'forceFromPressure': force,
    }
    out['peakRssBytes'] = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024
    return out


def one_shot_cut(path, job):
    grid = read(path)
    cutter, plane = make_cutter(grid)
    c = cut_and_integrate(cutter, plane, job['planes'][0])
    return {'area': c['area'], 'pIntegral': c['pIntegral']}


if __name__ == '__main__':
    if len(sys.argv) != 4 or sys.argv[1] not in ('stages', 'cut'):
        sys.exit('usage: vtk_stages.py stages|cut <file.vtu> <job json>')
    job = json.loads(sys.argv[3])
    result = stages(sys.argv[2], job) if sys.argv[1] == 'stages' else one_shot_cut(sys.argv[2], job)
    print(json.dumps(result))
