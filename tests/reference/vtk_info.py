#!/usr/bin/python3
"""Reference load reports of the external VTK files, as VTK 9.1 (Debian python3-vtk9) reads them.

Writes tests/reference/expected/info/<file path with / replaced by __>.json with: points, cells,
cellTypes (VTK type number -> count), pointData / cellData / fieldData ([{name, components, range}],
range of the magnitude for several components, as vtkDataArray.GetRange(-1)), and bounds.
Multi-piece sets (.pvtu, .vtm) are summed over their leaves, arrays merged by name.
Run: /usr/bin/python3 tests/reference/vtk_info.py [--check]   (from the repository root)
With --check it compares with the committed JSON instead of writing, and exits 1 on a difference.
"""
import json
import math
import os
import sys

import vtk

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
EXTERNAL = os.path.normpath(os.path.join(ROOT, 'tests', 'fixtures', 'external'))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'info')


def reader_for(path):
    ext = os.path.splitext(path)[1].lower()
    if ext == '.vtk':
        r = vtk.vtkGenericDataObjectReader()
        r.ReadAllScalarsOn(); r.ReadAllVectorsOn(); r.ReadAllNormalsOn(); r.ReadAllFieldsOn(); r.ReadAllTensorsOn()
    elif ext == '.vtu':
        r = vtk.vtkXMLUnstructuredGridReader()
    elif ext == '.vtp':
        r = vtk.vtkXMLPolyDataReader()
    elif ext == '.pvtu':
        r = vtk.vtkXMLPUnstructuredGridReader()
    elif ext == '.vtm':
        r = vtk.vtkXMLMultiBlockDataReader()
    else:
        return None
    r.SetFileName(path)
    r.Update()
    return r.GetOutputDataObject(0)


def leaves(obj):
    if obj is None:
        return []
    if obj.IsA('vtkCompositeDataSet'):
        it = obj.NewIterator()
        it.InitTraversal()
        out = []
        while not it.IsDoneWithTraversal():
            out.append(it.GetCurrentDataObject())
            it.GoToNextItem()
        return out
    return [obj]


def merge_arrays(target, data):
    for i in range(data.GetNumberOfArrays()):
        a = data.GetAbstractArray(i)
        if a is None or not a.IsA('vtkDataArray'):
            continue
        name = a.GetName() or ''
        nc = a.GetNumberOfComponents()
        rng = list(a.GetRange(-1 if nc > 1 else 0)) if a.GetNumberOfTuples() > 0 else None
        prev = target.get(name)
        if prev is None:
            target[name] = {'name': name, 'components': nc, 'range': rng}
        elif rng is not None:
            prev['range'] = rng if prev['range'] is None else [min(prev['range'][0], rng[0]), max(prev['range'][1], rng[1])]


def report(path):
    obj = reader_for(path)
    parts = leaves(obj)
    points = cells = 0
    types = {}
    pd, cd, fd = {}, {}, {}
    bounds = [math.inf, -math.inf] * 3
    for ds in parts:
        points += ds.GetNumberOfPoints()
        cells += ds.GetNumberOfCells()
        for c in range(ds.GetNumberOfCells()):
            t = ds.GetCellType(c)
            types[str(t)] = types.get(str(t), 0) + 1
        merge_arrays(pd, ds.GetPointData())
        merge_arrays(cd, ds.GetCellData())
        merge_arrays(fd, ds.GetFieldData())
        if ds.GetNumberOfPoints() > 0:
            b = ds.GetBounds()
            for k in range(3):
                bounds[2 * k] = min(bounds[2 * k], b[2 * k])
                bounds[2 * k + 1] = max(bounds[2 * k + 1], b[2 * k + 1])
    return {
        'file': os.path.relpath(path, EXTERNAL),
        'vtkVersion': vtk.vtkVersion.GetVTKVersion(),
        'points': points, 'cells': cells, 'cellTypes': dict(sorted(types.items(), key=lambda kv: int(kv[0]))),
        'pointData': list(pd.values()), 'cellData': list(cd.values()), 'fieldData': list(fd.values()),
        'bounds': bounds if points > 0 else None,
    }


def main():
    check = '--check' in sys.argv
    os.makedirs(OUT, exist_ok=True)
    bad = 0
    # Every file, pieces of sets included (each piece is also a valid file on its own).
    for folder, _dirs, files in sorted(os.walk(EXTERNAL)):
        for f in sorted(files):
            path = os.path.join(folder, f)
            if os.path.splitext(f)[1].lower() not in ('.vtk', '.vtu', '.vtp', '.pvtu', '.vtm'):
                continue
            rep = report(path)
            name = rep['file'].replace('/', '__') + '.json'
            text = json.dumps(rep, indent=1) + '\n'
            target = os.path.join(OUT, name)
            if check:
                with open(target) as fh:
                    if json.load(fh) != json.loads(text):
                        print('differs:', name)
                        bad += 1
            else:
                with open(target, 'w') as fh:
                    fh.write(text)
                print('wrote', name)
    sys.exit(1 if bad else 0)


if __name__ == '__main__':
    main()
