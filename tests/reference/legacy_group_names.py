#!/usr/bin/python3
"""Writes, with VTK 9.1's own legacy writer (vtkUnstructuredGridWriter, Debian python3-vtk9), the legacy
.vtk fixtures of surface-group names in tests/fixtures/group-names/, and records what VTK's legacy reader
reads back from them in tests/reference/expected/legacy_group_names.json, for
tests/surface/legacyGroupNames.test.ts.

The scene (our own, the same small tank as tests/reference/group_names.py): a unit cube of 2 x 2 x 2
hexahedra whose x = 0 side is covered by four quads of one group and its x = 1 side by four quads of another.
 - tank-names-{ascii,binary}.vtk: cell array "zone" (Int32) 1 on the x = 0 quads, 2 on the x = 1 quads
   (0 on the hexahedra); dataset-level FIELD string array "zone names" = ["filler neck", "drain"]
   (1-based: value 1 names "filler neck").
 - tank-ids-{ascii,binary}.vtk: "zone" 7 on the x = 0 quads, 3 on the x = 1 quads; string array
   "zone names" = ["drain", "Überlauf 50%"] with an Int32 array "zone ids" = [3, 7] saying which value each
   name has (a name with a space, a % sign and a non-ASCII letter: VTK %-escapes them in ASCII files).

Run from the repository root: /usr/bin/python3 tests/reference/legacy_group_names.py [--check]
With --check it reads the committed fixtures and compares with the JSON instead of writing.
"""
import json
import os
import sys

import vtk

from group_names import hexes, points, side_quads

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DIR = os.path.join(ROOT, 'tests', 'fixtures', 'group-names')
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'legacy_group_names.json')

# file stem -> (zone value of the x = 0 side, of the x = 1 side, names, ids or None)
SCENES = {
    'tank-names': (1, 2, ['filler neck', 'drain'], None),
    'tank-ids': (7, 3, ['drain', 'Überlauf 50%'], [3, 7]),
}


def grid(low, high, names, ids):
    ug = vtk.vtkUnstructuredGrid()
    ug.SetPoints(points())
    zone = vtk.vtkIntArray()
    zone.SetName('zone')
    for h in hexes():
        ug.InsertNextCell(vtk.VTK_HEXAHEDRON, 8, h)
        zone.InsertNextValue(0)
    for value, side in ((low, 0), (high, 2)):
        for q in side_quads(side):
            ug.InsertNextCell(vtk.VTK_QUAD, 4, q)
            zone.InsertNextValue(value)
    ug.GetCellData().AddArray(zone)
    table = vtk.vtkStringArray()
    table.SetName('zone names')
    for n in names:
        table.InsertNextValue(n)
    ug.GetFieldData().AddArray(table)
    if ids is not None:
        a = vtk.vtkIntArray()
        a.SetName('zone ids')
        for v in ids:
            a.InsertNextValue(v)
        ug.GetFieldData().AddArray(a)
    return ug


def files():
    for stem in SCENES:
        for mode in ('ascii', 'binary'):
            yield stem, mode, '%s-%s.vtk' % (stem, mode)


def write():
    os.makedirs(DIR, exist_ok=True)
    for stem, mode, name in files():
        w = vtk.vtkUnstructuredGridWriter()
        w.SetInputData(grid(*SCENES[stem]))
        w.SetFileName(os.path.join(DIR, name))
        if mode == 'binary':
            w.SetFileTypeToBinary()
        else:
            w.SetFileTypeToASCII()
        w.Write()


def read_back():
    out = {}
    for _, _, name in files():
        r = vtk.vtkUnstructuredGridReader()
        r.SetFileName(os.path.join(DIR, name))
        r.Update()
        g = r.GetOutput()
        fd = g.GetFieldData()
        entry = {'cells': g.GetNumberOfCells()}
        for i in range(fd.GetNumberOfArrays()):
            a = fd.GetAbstractArray(i)
            entry[a.GetName()] = [a.GetValue(k) for k in range(a.GetNumberOfValues())]
        zone = g.GetCellData().GetArray('zone')
        entry['zone'] = sorted(set(int(zone.GetValue(k)) for k in range(zone.GetNumberOfValues())))
        out[name] = entry
    return out


if __name__ == '__main__':
    if '--check' in sys.argv:
        want = json.load(open(OUT, encoding='utf-8'))
        got = read_back()
        print('legacy group names: %s' % ('same' if got == want else 'DIFFERENT'))
        sys.exit(0 if got == want else 1)
    write()
    with open(OUT, 'w', encoding='utf-8') as f:
        json.dump(read_back(), f, indent=1, ensure_ascii=False)
        f.write('\n')
