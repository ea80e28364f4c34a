#!/usr/bin/python3
"""Reference numbers for the legacy .vtk reader, as VTK 9.1 (Debian python3-vtk9) reads the files.

1. The external legacy files in tests/fixtures/external (listed in EXTERNAL_FILES).
2. Small fixtures written by VTK's own legacy writers (vtkUnstructuredGridWriter, vtkPolyDataWriter) in
   file versions 4.2 and 5.1, ASCII and BINARY, covering every attribute kind the writers emit
   (SCALARS with components and an inline LOOKUP_TABLE, COLOR_SCALARS, VECTORS, NORMALS, TENSORS,
   TEXTURE_COORDINATES, GLOBAL_IDS, FIELD arrays of many types incl. strings, METADATA, %20 names,
   polyhedra, higher-order cells, all four polydata sections). The fixture files are written to
   tests/reference/expected/legacy/fixtures/ and read back with VTK.

For each file, tests/reference/expected/legacy/<name>.json holds: points, cells, cellTypes (type -> count
as VTK reports them), pointSum (sum of all coordinates), bounds, the point ids of the first and last cell,
cornerIdSum (sum over cells of their corner point ids: all ids for linear cells, the first corners of
higher-order cells, the sorted unique points of polyhedra), polyhedronFaces (total faces of type-42
cells), and for each point/cell/field array: name, components, tuples, VTK class, per-component
ranges, magnitude range and the sum of all values. String arrays are listed with their class only.

Run from the repository root: /usr/bin/python3 tests/reference/legacy_probe.py [--check]
With --check nothing is written: the committed fixtures and the external files are read again and the
reports compared with the committed JSON; prints "N files checked, M difference(s)" and exits 1 on a
difference.
"""
import json
import math
import os
import sys

import vtk

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
EXTERNAL = os.path.normpath(os.path.join(ROOT, 'tests', 'fixtures', 'external'))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'legacy')
FIXTURES = os.path.join(OUT, 'fixtures')

EXTERNAL_FILES = [
    'vtk-data/VTKCellTypes.vtk', 'vtk-data/AngularSector.vtk', 'vtk-data/Quadratic/CylinderLinear.vtk',
    'vtk-data/Quadratic/CylinderQuadratic.vtk', 'vtk-data/post.vtk', 'vtk-data/opal_mound_fault.vtk',
    'vtkio/triangle_vtkidtype.vtk', 'vtkio/pygmsh/ascii.vtk',
]

# Corner counts of the higher-order types used here (VTK orders corners first).
CORNERS = {21: 2, 22: 3, 23: 4, 24: 4, 25: 8, 26: 6, 27: 5, 28: 4, 29: 8}


def read(path):
    r = vtk.vtkGenericDataObjectReader()
    r.ReadAllScalarsOn(); r.ReadAllVectorsOn(); r.ReadAllNormalsOn(); r.ReadAllFieldsOn()
    r.ReadAllTensorsOn(); r.ReadAllColorScalarsOn(); r.ReadAllTCoordsOn()
    r.SetFileName(path)
    r.Update()
    return r.GetOutput()


def arrays(data):
    out = []
    for i in range(data.GetNumberOfArrays()):
        a = data.GetAbstractArray(i)
        entry = {'name': a.GetName(), 'components': a.GetNumberOfComponents(), 'tuples': a.GetNumberOfTuples(),
                 'class': a.GetClassName()}
        if a.IsA('vtkDataArray') and a.GetNumberOfTuples() > 0:
            nc = a.GetNumberOfComponents()
            entry['componentRanges'] = [list(a.GetRange(c)) for c in range(nc)]
            entry['range'] = list(a.GetRange(-1 if nc > 1 else 0))
            s = 0.0
            for t in range(a.GetNumberOfTuples()):
                for c in range(nc):
                    s += a.GetComponent(t, c)
            entry['sum'] = s
        out.append(entry)
    return out


def cell_ids(ds, c):
    ids = vtk.vtkIdList()
    ds.GetCellPoints(c, ids)
    return [ids.GetId(i) for i in range(ids.GetNumberOfIds())]


def report(path, label):
    ds = read(path)
    n_pts, n_cells = ds.GetNumberOfPoints(), ds.GetNumberOfCells()
    types, corner_sum, faces = {}, 0, 0
    for c in range(n_cells):
        t = ds.GetCellType(c)
        types[str(t)] = types.get(str(t), 0) + 1
        ids = cell_ids(ds, c)
        if t == 42:
            faces += ds.GetCell(c).GetNumberOfFaces()
            ids = sorted(set(ids))
        corner_sum += sum(ids[:CORNERS.get(t, len(ids))])
    point_sum = 0.0
    for p in range(n_pts):
        point_sum += sum(ds.GetPoint(p))
    return {
        'file': label, 'vtkVersion': vtk.vtkVersion.GetVTKVersion(), 'dataset': ds.GetClassName(),
        'points': n_pts, 'cells': n_cells, 'cellTypes': dict(sorted(types.items(), key=lambda kv: int(kv[0]))),
        'pointSum': point_sum, 'bounds': list(ds.GetBounds()) if n_pts else None,
        'firstCell': cell_ids(ds, 0) if n_cells else None, 'lastCell': cell_ids(ds, n_cells - 1) if n_cells else None,
        'cornerIdSum': corner_sum, 'polyhedronFaces': faces,
        'pointData': arrays(ds.GetPointData()), 'cellData': arrays(ds.GetCellData()),
        'fieldData': arrays(ds.GetFieldData()),
    }


def typed(cls, name, comps, values):
    a = cls()
    a.SetName(name)
    a.SetNumberOfComponents(comps)
    for v in values:
        a.InsertNextValue(v)
    return a


def strings(name, values):
    a = vtk.vtkStringArray()
    a.SetName(name)
    for v in values:
        a.InsertNextValue(v)
    return a


def make_grid():
    """A small mixed grid: hexahedron, tetra, wedge, pyramid, quadratic tetra, polyhedron, triangle, polygon."""
    ug = vtk.vtkUnstructuredGrid()
    pts = vtk.vtkPoints()
    pts.SetDataTypeToDouble()
    coords = [(0, 0, 0), (1, 0, 0), (1, 1, 0), (0, 1, 0), (0, 0, 1), (1, 0, 1), (1, 1, 1), (0, 1, 1),
              (2, 0, 0), (2, 1, 0), (2, 0, 1), (2, 1, 1), (0.5, 0.5, 2), (3, 0, 0), (3, 1, 0), (3, 0.5, 1),
              (2.5, 0, 0), (3, 0.5, 0), (2.5, 0.5, 0), (2.75, 0.25, 0.5), (2.75, 0.5, 0.5), (3, 0.25, 0.5)]
    for p in coords:
        pts.InsertNextPoint(p)
    ug.SetPoints(pts)

    def add(t, ids):
        l = vtk.vtkIdList()
        for i in ids:
            l.InsertNextId(i)
        ug.InsertNextCell(t, l)

    add(12, [0, 1, 2, 3, 4, 5, 6, 7])
    add(13, [1, 8, 5, 2, 9, 6])
    add(14, [4, 5, 6, 7, 12])
    add(10, [8, 13, 14, 10])
    add(24, [8, 13, 14, 15, 16, 17, 18, 19, 20, 21])
    # polyhedron: the unit tetra 1, 8, 9, 10 given as a face stream
    add(42, [4, 3, 1, 9, 8, 3, 1, 8, 10, 3, 1, 10, 9, 3, 8, 9, 10])
    add(5, [0, 1, 5])
    add(7, [3, 2, 6, 7, 12])
    n_pts, n_cells = pts.GetNumberOfPoints(), ug.GetNumberOfCells()

    pd, cd, fd = ug.GetPointData(), ug.GetCellData(), ug.GetFieldData()
    pressure = typed(vtk.vtkFloatArray, 'pressure', 1, [100.5 - 3.25 * i for i in range(n_pts)])
    lut = vtk.vtkLookupTable()
    lut.SetNumberOfTableValues(3)
    lut.Build()
    pressure.SetLookupTable(lut)
    pd.SetScalars(pressure)
    vel = typed(vtk.vtkDoubleArray, 'velocity', 3, [math.sin(0.3 * k) for k in range(3 * n_pts)])
    vel.SetComponentName(0, 'u x')
    vel.SetComponentName(1, 'u y')
    vel.SetComponentName(2, 'u z')
    pd.SetVectors(vel)
    pd.SetNormals(typed(vtk.vtkFloatArray, 'wall normal', 3, [((k % 3) == 2) * 1.0 for k in range(3 * n_pts)]))
    pd.SetTensors(typed(vtk.vtkDoubleArray, 'stress', 9, [0.5 * k - 7 for k in range(9 * n_pts)]))
    pd.SetTCoords(typed(vtk.vtkFloatArray, 'uv', 2, [0.125 * k for k in range(2 * n_pts)]))
    gid = vtk.vtkIdTypeArray()
    gid.SetName('node id')
    for i in range(n_pts):
        gid.InsertNextValue(1000 + i)
    pd.SetGlobalIds(gid)
    pd.AddArray(typed(vtk.vtkShortArray, 'zone', 1, [(-1) ** i * i for i in range(n_pts)]))
    pd.AddArray(typed(vtk.vtkUnsignedShortArray, 'flags', 2, [i * 7 % 65535 for i in range(2 * n_pts)]))
    pd.AddArray(typed(vtk.vtkTypeInt64Array, 'big ids', 1, [2 ** 40 + i for i in range(n_pts)]))
    pd.AddArray(typed(vtk.vtkLongArray, 'long values', 1, [-(2 ** 33) + 5 * i for i in range(n_pts)]))
    pd.AddArray(typed(vtk.vtkUnsignedIntArray, 'counts', 1, [4000000000 - i for i in range(n_pts)]))
    pd.AddArray(typed(vtk.vtkSignedCharArray, 'signs', 1, [(-1) ** i for i in range(n_pts)]))
    pd.AddArray(strings('labels', ['p%d' % i if i % 4 else 'has space %d' % i for i in range(n_pts)]))

    density = typed(vtk.vtkDoubleArray, 'density', 2, [1.2 + 0.01 * k for k in range(2 * n_cells)])
    cd.SetScalars(density)
    cd.AddArray(typed(vtk.vtkIntArray, 'material', 1, [3 * c - 4 for c in range(n_cells)]))
    cd.AddArray(typed(vtk.vtkUnsignedCharArray, 'quality', 1, [200 + c for c in range(n_cells)]))

    fd.AddArray(typed(vtk.vtkDoubleArray, 'TimeValue', 1, [0.25]))
    fd.AddArray(typed(vtk.vtkFloatArray, 'reference values', 3, [1.5, 2.5, 101325.0]))
    fd.AddArray(strings('solver notes', ['made by legacy_probe.py', 'second line']))
    return ug


def make_colors_grid():
    """Two triangles with RGBA colour scalars (written as COLOR_SCALARS)."""
    ug = vtk.vtkUnstructuredGrid()
    pts = vtk.vtkPoints()
    for p in [(0, 0, 0), (1, 0, 0), (0, 1, 0), (1, 1, 0)]:
        pts.InsertNextPoint(p)
    ug.SetPoints(pts)
    for ids in ([0, 1, 2], [1, 3, 2]):
        l = vtk.vtkIdList()
        for i in ids:
            l.InsertNextId(i)
        ug.InsertNextCell(5, l)
    rgba = typed(vtk.vtkUnsignedCharArray, 'colour', 4, [10, 20, 30, 255, 255, 0, 128, 64, 1, 2, 3, 4, 0, 0, 0, 0])
    ug.GetPointData().SetScalars(rgba)
    return ug


def make_polydata():
    """All four polydata sections, given out of VTK's order, with point and cell data."""
    pd = vtk.vtkPolyData()
    pts = vtk.vtkPoints()
    for i in range(12):
        pts.InsertNextPoint(i % 4, i // 4, 0.1 * i)
    pd.SetPoints(pts)

    def cells(lists):
        ca = vtk.vtkCellArray()
        for ids in lists:
            l = vtk.vtkIdList()
            for i in ids:
                l.InsertNextId(i)
            ca.InsertNextCell(l)
        return ca

    pd.SetVerts(cells([[0], [1, 2]]))
    pd.SetLines(cells([[3, 7], [4, 5, 6]]))
    pd.SetPolys(cells([[0, 1, 5], [1, 2, 6, 5], [2, 3, 7, 11, 6]]))
    pd.SetStrips(cells([[8, 4, 9, 5, 10]]))
    n_cells = pd.GetNumberOfCells()
    pd.GetCellData().SetScalars(typed(vtk.vtkFloatArray, 'cell order', 1, list(range(n_cells))))
    pd.GetPointData().SetVectors(typed(vtk.vtkFloatArray, 'shift', 3, [0.5 * k for k in range(36)]))
    return pd


def write_fixtures():
    os.makedirs(FIXTURES, exist_ok=True)
    written = []
    makers = [('grid', make_grid, vtk.vtkUnstructuredGridWriter), ('colors', make_colors_grid, vtk.vtkUnstructuredGridWriter),
              ('poly', make_polydata, vtk.vtkPolyDataWriter)]
    for stem, make, writer_class in makers:
        for version in (42, 51):
            for binary in (False, True):
                name = '%s_v%d_%s.vtk' % (stem, version, 'binary' if binary else 'ascii')
                w = writer_class()
                w.SetInputData(make())
                w.SetFileVersion(version)
                if binary:
                    w.SetFileTypeToBinary()
                else:
                    w.SetFileTypeToASCII()
                w.SetFileName(os.path.join(FIXTURES, name))
                w.Write()
                written.append(name)
    return written


def main():
    check = '--check' in sys.argv
    os.makedirs(OUT, exist_ok=True)
    reports = {}
    for rel in EXTERNAL_FILES:
        reports[rel] = report(os.path.join(EXTERNAL, rel), rel)
    names = sorted(f for f in os.listdir(FIXTURES) if f.endswith('.vtk')) if check else write_fixtures()
    for name in names:
        reports['fixtures/' + name] = report(os.path.join(FIXTURES, name), 'fixtures/' + name)
    bad = 0
    for label, rep in reports.items():
        target = os.path.join(OUT, label.replace('/', '__') + '.json')
        text = json.dumps(rep, indent=1) + '\n'
        if check:
            with open(target) as fh:
                if json.load(fh) != json.loads(text):
                    print('differs:', label)
                    bad += 1
        else:
            with open(target, 'w') as fh:
                fh.write(text)
            print('wrote', os.path.relpath(target, ROOT))
    if check:
        print('%d files checked, %d difference(s)' % (len(reports), bad))
    sys.exit(1 if bad else 0)


if __name__ == '__main__':
    main()
