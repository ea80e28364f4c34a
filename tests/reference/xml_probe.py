#!/usr/bin/python3
"""Reference contents of the external VTK XML files (.vtu, .vtp, .pvtu, .vtm), as VTK 9.1 (Debian
python3-vtk9) reads them, for tests/io/vtkXml.test.ts and tests/io/vtkSets.test.ts.

For each file, tests/reference/expected/xml/<path with / replaced by __>.json holds one entry per leaf
dataset (a .vtu/.vtp is one leaf with all its pieces appended, as VTK's reader returns it; a .pvtu is one
leaf; a .vtm lists its leaf files in order) with: points, cells, cellTypes (type -> count), bounds,
pointSum (sum of all coordinates), connSum (sum of the point ids of all cells), and for every point, cell
and field array: name, components, tuples, VTK class, per-component ranges, magnitude range
(vtkDataArray.GetRange(-1)) and the sum of all values. Leaves with at most 100 points also carry every
value: coords (flat xyz), cellPoints (point ids per cell), types, polyhedron faces per cell (null for other
cells) and each array's values. Arrays are taken by index from GetPointData()/GetCellData() so a point
array is never shadowed by a cell array of the same name.

Run from the repository root: /usr/bin/python3 tests/reference/xml_probe.py [--check]
With --check it compares with the committed JSON instead of writing, prints "N files checked, M
difference(s)" and exits 1 on a difference.
"""
import json
import math
import os
import sys

import vtk

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
EXTERNAL = os.path.normpath(os.path.join(ROOT, 'tests', 'fixtures', 'external'))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'xml')

FILES = [
    'vtk-data/Wedge.vtu', 'vtk-data/polyhedron2pieces.vtu', 'vtk-data/cow.vtp', 'vtk-data/ex-blow_5.vtm',
    'vtkio/box.vtu', 'vtkio/hexahedron_ascii.vtu', 'vtkio/hexahedron_inline_binary.vtu',
    'vtu11/pyramids_3D/ascii.vtu', 'vtu11/pyramids_3D/base64.vtu', 'vtu11/pyramids_3D/base64appended.vtu',
    'vtu11/pyramids_3D/raw.vtu', 'vtu11/pyramids_3D/raw_compressed.vtu',
    'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test.pvtu',
    'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_0.vtu',
    'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_1.vtu',
    'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_2.vtu',
]
SMALL = 100


def num(v):
    v = float(v)
    return v if math.isfinite(v) else str(v)


def array_info(a, full):
    nc, nt = a.GetNumberOfComponents(), a.GetNumberOfTuples()
    info = {'name': a.GetName(), 'components': nc, 'tuples': nt, 'class': a.GetClassName()}
    if not a.IsA('vtkDataArray'):
        return info
    info['componentRanges'] = [[num(x) for x in a.GetRange(c)] for c in range(nc)] if nt else []
    info['range'] = [num(x) for x in a.GetRange(-1 if nc > 1 else 0)] if nt else None
    info['sum'] = sum(a.GetComponent(t, c) for t in range(nt) for c in range(nc))
    if full:
        info['values'] = [num(a.GetComponent(t, c)) for t in range(nt) for c in range(nc)]
    return info


def leaf_info(ds):
    n, m = ds.GetNumberOfPoints(), ds.GetNumberOfCells()
    full = n <= SMALL
    types = {}
    conn_sum = 0
    cell_points, cell_types, faces = [], [], []
    ug = ds.IsA('vtkUnstructuredGrid')
    face_stream = ds.GetFaces() if ug else None
    face_locs = ds.GetFaceLocations() if ug else None
    for c in range(m):
        t = ds.GetCellType(c)
        types[str(t)] = types.get(str(t), 0) + 1
        ids = vtk.vtkIdList()
        ds.GetCellPoints(c, ids)
        pts = [ids.GetId(i) for i in range(ids.GetNumberOfIds())]
        conn_sum += sum(pts)
        if full:
            cell_points.append(pts)
            cell_types.append(t)
            f = None
            if face_locs is not None and face_locs.GetValue(c) >= 0:
                p = face_locs.GetValue(c)
                nf = face_stream.GetValue(p)
                p += 1
                f = []
                for _ in range(nf):
                    k = face_stream.GetValue(p)
                    f.append([face_stream.GetValue(p + 1 + j) for j in range(k)])
                    p += 1 + k
            faces.append(f)
    pts = ds.GetPoints()
    coords = [num(pts.GetPoint(i)[k]) for i in range(n) for k in range(3)] if pts else []
    out = {
        'points': n, 'cells': m, 'cellTypes': types,
        'bounds': [num(x) for x in ds.GetBounds()] if n else None,
        'pointSum': sum(float(x) for x in coords) if coords else 0.0,
        'connSum': conn_sum,
        'pointData': [array_info(ds.GetPointData().GetAbstractArray(i), full) for i in range(ds.GetPointData().GetNumberOfArrays())],
        'cellData': [array_info(ds.GetCellData().GetAbstractArray(i), full) for i in range(ds.GetCellData().GetNumberOfArrays())],
        'fieldData': [array_info(ds.GetFieldData().GetAbstractArray(i), full) for i in range(ds.GetFieldData().GetNumberOfArrays())],
    }
    if full:
        out.update({'coords': coords, 'cellPoints': cell_points, 'types': cell_types, 'faces': faces})
    return out


def read(path):
    ext = os.path.splitext(path)[1].lower()
    r = {'.vtu': vtk.vtkXMLUnstructuredGridReader, '.vtp': vtk.vtkXMLPolyDataReader,
         '.pvtu': vtk.vtkXMLPUnstructuredGridReader, '.vtm': vtk.vtkXMLMultiBlockDataReader}[ext]()
    r.SetFileName(path)
    r.Update()
    out = r.GetOutputDataObject(0)
    if ext != '.vtm':
        return [leaf_info(out)]
    it = out.NewIterator()
    it.InitTraversal()
    leaves = []
    while not it.IsDoneWithTraversal():
        leaves.append(leaf_info(it.GetCurrentDataObject()))
        it.GoToNextItem()
    return leaves


def main():
    check = '--check' in sys.argv[1:]
    if not check:
        os.makedirs(OUT, exist_ok=True)
    differences = 0
    for rel in FILES:
        doc = {'file': rel, 'vtkVersion': vtk.vtkVersion.GetVTKVersion(), 'leaves': read(os.path.join(EXTERNAL, rel))}
        path = os.path.join(OUT, rel.replace('/', '__') + '.json')
        text = json.dumps(doc, indent=1) + '\n'
        if check:
            with open(path) as f:
                if json.load(f) != json.loads(text):
                    differences += 1
                    print('differs:', rel)
        else:
            with open(path, 'w') as f:
                f.write(text)
            print('wrote', rel)
    if check:
        print(f'{len(FILES)} files checked, {differences} difference(s)')
        sys.exit(1 if differences else 0)


if __name__ == '__main__':
    main()
