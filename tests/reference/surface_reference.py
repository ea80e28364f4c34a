#!/usr/bin/python3
"""Boundary faces of the external VTK files, as VTK 9 extracts them: count, area, face sizes.

Run with /usr/bin/python3 (Debian python3-vtk9): `surface_reference.py [out.json]`. Writes
tests/reference/expected/surface/boundary_faces.json (or out.json), which tests/surface/surfaceReference.test.ts
compares with fieldtally's boundary extraction; tests/system/surfaceReference.test.ts re-runs it.

Like with like: VTK's surface filters pass 2D cells (and lines, vertices) straight through, while fieldtally's
boundary faces are faces of 3D cells only. So the 3D cells are taken out first (vtkExtractCellsByType), then
vtkDataSetSurfaceFilter extracts their boundary with NonlinearSubdivisionLevel 0, so quadratic cells give their
corner (linear) faces, as fieldtally reads them. The pieces of a .pvtu set are appended by VTK's reader
without merging their duplicated interface points, so the faces between pieces come out as boundary; the
'merged' figures append the pieces with vtkAppendFilter MergePoints on (coincident points merged across
inputs), which is what fieldtally's cross-piece matching does. For single files 'merged' equals the plain
figures. Face area is vtkCellSizeFilter's (it triangulates non-planar quads).
"""
import json
import os
import re
import sys

import vtk

HERE = os.path.dirname(os.path.abspath(__file__))
EXTERNAL = os.path.normpath(os.path.join(HERE, '..', 'fixtures', 'external'))
OUT = os.path.join(HERE, 'expected', 'surface', 'boundary_faces.json')

FILES = [
    'vtk-data/VTKCellTypes.vtk',
    'vtk-data/AngularSector.vtk',
    'vtk-data/Quadratic/CylinderLinear.vtk',
    'vtk-data/Quadratic/CylinderQuadratic.vtk',
    'vtk-data/post.vtk',
    'vtk-data/polyhedron2pieces.vtu',
    'vtk-data/Wedge.vtu',
    'vtkio/hexahedron_ascii.vtu',
    'vtkio/hexahedron_inline_binary.vtu',
    'vtkio/box.vtu',
    'vtkio/pygmsh/ascii.vtk',
    'vtu11/pyramids_3D/ascii.vtu',
    'vtu11/pyramids_3D/base64.vtu',
    'vtu11/pyramids_3D/base64appended.vtu',
    'vtu11/pyramids_3D/raw.vtu',
    'vtu11/pyramids_3D/raw_compressed.vtu',
    'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test.pvtu',
]

# Linear and higher-order 3D cell types (VTK numbering).
TYPES_3D = [10, 11, 12, 13, 14, 15, 16, 42, 24, 25, 26, 27, 29, 32, 33, 34, 36, 37, 71, 72, 73, 74, 78, 79, 80, 81]


def read(path):
    full = os.path.join(EXTERNAL, path)
    if path.endswith('.pvtu'):
        r = vtk.vtkXMLPUnstructuredGridReader()
    elif path.endswith('.vtu'):
        r = vtk.vtkXMLUnstructuredGridReader()
    else:
        r = vtk.vtkUnstructuredGridReader()
    r.SetFileName(full)
    r.Update()
    out = r.GetOutput()
    if out.GetNumberOfPoints() == 0:
        sys.exit('surface_reference.py: VTK read no points from ' + full)
    return out


def merged(path, grid):
    """Pieces of a .pvtu appended with coincident points merged (vtkAppendFilter merges across inputs only)."""
    if not path.endswith('.pvtu'):
        return grid
    full = os.path.join(EXTERNAL, path)
    with open(full) as f:
        sources = re.findall(r'<Piece\s+Source="([^"]+)"', f.read())
    a = vtk.vtkAppendFilter()
    a.MergePointsOn()
    for src in sources:
        r = vtk.vtkXMLUnstructuredGridReader()
        r.SetFileName(os.path.join(os.path.dirname(full), src))
        r.Update()
        a.AddInputData(r.GetOutput())
    a.Update()
    return a.GetOutput()


def only_3d(grid):
    n = grid.GetNumberOfCells()
    if all(grid.GetCellType(i) in TYPES_3D for i in range(n)):
        # vtkExtractCellsByType crashes VTK 9.1 here when every cell passes; nothing to remove anyway.
        return grid
    ex = vtk.vtkExtractCellsByType()
    ex.SetInputData(grid)
    for t in TYPES_3D:
        ex.AddCellType(t)
    ex.Update()
    return ex.GetOutput()


def boundary(grid):
    cells = only_3d(grid)
    surf = vtk.vtkDataSetSurfaceFilter()
    surf.SetInputData(cells)
    surf.SetNonlinearSubdivisionLevel(0)
    surf.Update()
    poly = surf.GetOutput()
    if poly.GetNumberOfCells() == 0:
        return {'cells3d': cells.GetNumberOfCells(), 'faces': 0, 'facesBySize': {}, 'area': 0.0}
    sizes = vtk.vtkCellSizeFilter()
    sizes.SetInputData(poly)
    sizes.ComputeVertexCountOff()
    sizes.ComputeLengthOff()
    sizes.ComputeVolumeOff()
    sizes.ComputeAreaOn()
    sizes.Update()
    areas = sizes.GetOutput().GetCellData().GetArray('Area')
    count = poly.GetNumberOfCells()
    by_size = {}
    area = 0.0
    for i in range(count):
        n = poly.GetCell(i).GetNumberOfPoints()
        by_size[str(n)] = by_size.get(str(n), 0) + 1
        area += areas.GetValue(i)
    return {
        'cells3d': cells.GetNumberOfCells(),
        'faces': count,
        'facesBySize': by_size,
        'area': area,
    }


def main():
    result = {
        'generator': 'tests/reference/surface_reference.py',
        'vtkVersion': vtk.vtkVersion.GetVTKVersion(),
        'method': 'vtkExtractCellsByType (3D types) -> vtkDataSetSurfaceFilter (NonlinearSubdivisionLevel 0) '
                  '-> vtkCellSizeFilter area; "merged": pieces of a set appended by vtkAppendFilter MergePoints first',
        'files': {},
    }
    for path in FILES:
        grid = read(path)
        entry = boundary(grid)
        entry['merged'] = boundary(merged(path, grid))
        result['files'][path] = entry
    out = sys.argv[1] if len(sys.argv) > 1 else OUT
    os.makedirs(os.path.dirname(os.path.abspath(out)), exist_ok=True)
    with open(out, 'w') as f:
        json.dump(result, f, indent=2, sort_keys=True)
        f.write('\n')
    print('wrote ' + out)


if __name__ == '__main__':
    main()
