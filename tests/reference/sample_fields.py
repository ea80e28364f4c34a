#!/usr/bin/python3
"""The committed sample files (sample-fields/) as VTK 9.1 (Debian python3-vtk9) reads them.

Writes tests/reference/expected/samples/sample-fields.json: per file, points, cells, cellTypes
(VTK type number -> count), the volume of the 3D cells and the area of the 2D cells (vtkCellSizeFilter,
summed; the 2D area also per value of a cell array `group` when present), and per array
(point and cell data): components, range (magnitude for several components, vtkDataArray.GetRange(-1))
and the sum of each component.
tests/samples/vtkReference.test.ts compares these with the datasets the generator builds.
Run: /usr/bin/python3 tests/reference/sample_fields.py [--check]   (from the repository root)
With --check it compares with the committed JSON instead of writing, and exits 1 on a difference.
"""
import json
import os
import sys

import vtk

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SAMPLES = os.path.join(ROOT, 'sample-fields')
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'samples', 'sample-fields.json')


def read(path):
    if path.endswith('.vtk'):
        r = vtk.vtkUnstructuredGridReader()
        r.ReadAllScalarsOn(); r.ReadAllVectorsOn(); r.ReadAllFieldsOn()
    else:
        r = vtk.vtkXMLUnstructuredGridReader()
    r.SetFileName(path)
    r.Update()
    return r.GetOutput()


def arrays(data):
    out = []
    for i in range(data.GetNumberOfArrays()):
        a = data.GetArray(i)
        nc, nt = a.GetNumberOfComponents(), a.GetNumberOfTuples()
        sums = [0.0] * nc
        for t in range(nt):
            for c in range(nc):
                sums[c] += a.GetComponent(t, c)
        out.append({'name': a.GetName(), 'components': nc, 'type': a.GetDataTypeAsString(),
                    'range': list(a.GetRange(-1 if nc > 1 else 0)), 'sums': sums})
    return out


def report(name):
    ds = read(os.path.join(SAMPLES, name))
    types = {}
    for c in range(ds.GetNumberOfCells()):
        t = str(ds.GetCellType(c))
        types[t] = types.get(t, 0) + 1
    sizes = vtk.vtkCellSizeFilter()
    sizes.SetInputData(ds)
    sizes.Update()
    cd = sizes.GetOutput().GetCellData()
    vol, area = cd.GetArray('Volume'), cd.GetArray('Area')
    group = ds.GetCellData().GetArray('group')
    volume = 0.0
    area_total = 0.0
    area_by_group = {}
    for c in range(ds.GetNumberOfCells()):
        volume += vol.GetValue(c)
        a = area.GetValue(c)
        area_total += a
        if group is not None and a != 0.0:
            g = str(int(group.GetValue(c)))
            area_by_group[g] = area_by_group.get(g, 0.0) + a
    rep = {
        'file': name, 'vtkVersion': vtk.vtkVersion.GetVTKVersion(),
        'points': ds.GetNumberOfPoints(), 'cells': ds.GetNumberOfCells(),
        'cellTypes': dict(sorted(types.items(), key=lambda kv: int(kv[0]))),
        'volume': volume, 'area': area_total, 'pointData': arrays(ds.GetPointData()), 'cellData': arrays(ds.GetCellData()),
    }
    if group is not None:
        rep['areaByGroup'] = area_by_group
    return rep


def main():
    names = sorted(n for n in os.listdir(SAMPLES) if n.endswith('.vtu') or n.endswith('.vtk'))
    result = {n: report(n) for n in names}
    text = json.dumps(result, indent=1) + '\n'
    if '--check' in sys.argv:
        with open(OUT) as fh:
            old = json.load(fh)
        bad = [n for n in names if old.get(n) != json.loads(text)[n]] + [n for n in old if n not in result]
        for n in bad:
            print('differs:', n)
        sys.exit(1 if bad else 0)
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, 'w') as fh:
        fh.write(text)
    print('wrote', os.path.relpath(OUT, ROOT), 'for', len(names), 'files')


if __name__ == '__main__':
    main()
