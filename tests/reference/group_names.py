#!/usr/bin/python3
"""Writes, with VTK 9.1's own XML writers (Debian python3-vtk9), the fixtures of surface-group names in
tests/fixtures/group-names/, and records what VTK reads back from them in
tests/reference/expected/group_names.json, for tests/surface/groupNames.test.ts.

The scene (our own): a unit cube of 2 x 2 x 2 hexahedra (a small tank), whose x = 0 side is covered by
four quads of group 1 and its x = 1 side by four quads of group 2.
 - tank-names-{ascii,binary,appended}.vtu: one file; cell array "zone" (Int32) on the quads, field-data
   String array "zone names" = ["filler neck", "drain"] (1-based: value 1 names "filler neck").
 - tank-blocks.vtm: the hexahedra in block "fluid", the quads in blocks "filler neck" and "drain" nested
   in a block "walls" (no group array).

Run from the repository root: /usr/bin/python3 tests/reference/group_names.py [--check]
With --check it reads the committed fixtures and compares with the JSON instead of writing.
"""
import json
import os
import sys

import vtk

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DIR = os.path.join(ROOT, 'tests', 'fixtures', 'group-names')
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'group_names.json')
NAMES = ['filler neck', 'drain']


def point_id(i, j, k):
    return i + 3 * (j + 3 * k)


def points():
    pts = vtk.vtkPoints()
    pts.SetDataTypeToDouble()
    for k in range(3):
        for j in range(3):
            for i in range(3):
                pts.InsertNextPoint(0.5 * i, 0.5 * j, 0.5 * k)
    return pts


def side_quads(i):
    """The four quads of the side x = i/2, as point id lists."""
    out = []
    for k in range(2):
        for j in range(2):
            out.append([point_id(i, j, k), point_id(i, j + 1, k), point_id(i, j + 1, k + 1), point_id(i, j, k + 1)])
    return out


def hexes():
    out = []
    for k in range(2):
        for j in range(2):
            for i in range(2):
                out.append([point_id(i, j, k), point_id(i + 1, j, k), point_id(i + 1, j + 1, k), point_id(i, j + 1, k),
                            point_id(i, j, k + 1), point_id(i + 1, j, k + 1), point_id(i + 1, j + 1, k + 1), point_id(i, j + 1, k + 1)])
    return out


def grid(with_quads):
    ug = vtk.vtkUnstructuredGrid()
    ug.SetPoints(points())
    for h in hexes():
        ug.InsertNextCell(vtk.VTK_HEXAHEDRON, 8, h)
    if with_quads:
        zone = vtk.vtkIntArray()
        zone.SetName('zone')
        for h in hexes():
            zone.InsertNextValue(0)
        for value, side in ((1, 0), (2, 2)):
            for q in side_quads(side):
                ug.InsertNextCell(vtk.VTK_QUAD, 4, q)
                zone.InsertNextValue(value)
        ug.GetCellData().AddArray(zone)
        names = vtk.vtkStringArray()
        names.SetName('zone names')
        for n in NAMES:
            names.InsertNextValue(n)
        ug.GetFieldData().AddArray(names)
    return ug


def side_polydata(side):
    pd = vtk.vtkPolyData()
    pd.SetPoints(points())
    polys = vtk.vtkCellArray()
    for q in side_quads(side):
        polys.InsertNextCell(4, q)
    pd.SetPolys(polys)
    return pd


def write():
    os.makedirs(DIR, exist_ok=True)
    for mode, name in ((0, 'ascii'), (1, 'binary'), (2, 'appended')):
        w = vtk.vtkXMLUnstructuredGridWriter()
        w.SetInputData(grid(True))
        w.SetFileName(os.path.join(DIR, 'tank-names-%s.vtu' % name))
        w.SetDataMode(mode)
        if mode == 1:
            w.SetCompressorTypeToNone()
        w.Write()
    mb = vtk.vtkMultiBlockDataSet()
    mb.SetBlock(0, grid(False))
    mb.GetMetaData(0).Set(vtk.vtkCompositeDataSet.NAME(), 'fluid')
    walls = vtk.vtkMultiBlockDataSet()
    for b, (side, n) in enumerate(((0, NAMES[0]), (2, NAMES[1]))):
        walls.SetBlock(b, side_polydata(side))
        walls.GetMetaData(b).Set(vtk.vtkCompositeDataSet.NAME(), n)
    mb.SetBlock(1, walls)
    mb.GetMetaData(1).Set(vtk.vtkCompositeDataSet.NAME(), 'walls')
    w = vtk.vtkXMLMultiBlockDataWriter()
    w.SetInputData(mb)
    w.SetFileName(os.path.join(DIR, 'tank-blocks.vtm'))
    w.Write()


def read_back():
    out = {}
    for name in ('ascii', 'binary', 'appended'):
        r = vtk.vtkXMLUnstructuredGridReader()
        r.SetFileName(os.path.join(DIR, 'tank-names-%s.vtu' % name))
        r.Update()
        a = r.GetOutput().GetFieldData().GetAbstractArray('zone names')
        out['tank-names-%s.vtu' % name] = {'zone names': [a.GetValue(i) for i in range(a.GetNumberOfValues())]}
    r = vtk.vtkXMLMultiBlockDataReader()
    r.SetFileName(os.path.join(DIR, 'tank-blocks.vtm'))
    r.Update()
    leaves = []
    it = r.GetOutput().NewIterator()
    it.InitTraversal()
    while not it.IsDoneWithTraversal():
        leaves.append({'name': it.GetCurrentMetaData().Get(vtk.vtkCompositeDataSet.NAME()),
                       'cells': it.GetCurrentDataObject().GetNumberOfCells()})
        it.GoToNextItem()
    out['tank-blocks.vtm'] = {'leaves': leaves}
    return out


if __name__ == '__main__':
    if '--check' in sys.argv:
        want = json.load(open(OUT))
        got = read_back()
        print('group names: %s' % ('same' if got == want else 'DIFFERENT'))
        sys.exit(0 if got == want else 1)
    write()
    with open(OUT, 'w') as f:
        json.dump(read_back(), f, indent=1)
        f.write('\n')
