#!/usr/bin/python3
"""Cut-plane integrals of the sample fields as VTK 9 computes them: vtkCutter, then vtkIntegrateAttributes.

Run with /usr/bin/python3 (Debian python3-vtk9) from anywhere. It asks Node to write the sample cases
(tests/reference/cutInputs.ts: meshes and planes) as .vtu files into a temporary folder, cuts each with each
plane and writes tests/reference/expected/cut/cut_reference.json, which tests/cut/cutReference.test.ts
compares with fieldtally's cut and integrals. An optional argument writes the JSON elsewhere (the system
test re-runs the script that way).

Like with like: the files also hold 2D cells (the sphere case's wall and outer triangles); VTK would cut them
into lines and add line integrals, while fieldtally cuts 3D cells only, so the 3D cells are taken out first
(vtkExtractCellsByType). No case has a point and a cell array of the same name: VTK 9.1's integration
shadows a point array by a cell array of that name.
"""
import json
import os
import subprocess
import sys
import tempfile

import vtk

HERE = os.path.dirname(os.path.abspath(__file__))
REPO = os.path.normpath(os.path.join(HERE, '..', '..'))
OUT = os.path.join(HERE, 'expected', 'cut', 'cut_reference.json')
TYPES_3D = [10, 11, 12, 13, 14, 15, 16, 42]


def cut_and_integrate(grid, origin, normal):
    plane = vtk.vtkPlane()
    plane.SetOrigin(*origin)
    plane.SetNormal(*normal)
    cutter = vtk.vtkCutter()
    cutter.SetCutFunction(plane)
    cutter.SetOutputPointsPrecision(vtk.vtkAlgorithm.DOUBLE_PRECISION)
    cutter.SetInputData(grid)
    cutter.Update()
    cut = cutter.GetOutput()
    integ = vtk.vtkIntegrateAttributes()
    integ.SetInputData(cut)
    integ.Update()
    out = integ.GetOutput()
    result = {'origin': origin, 'normal': normal, 'triangles': cut.GetNumberOfCells(), 'point': {}, 'cell': {}}
    cd = out.GetCellData()
    area = cd.GetArray('Area')
    result['area'] = area.GetValue(0) if area is not None and out.GetNumberOfCells() > 0 else 0.0
    for kind, data in (('point', out.GetPointData()), ('cell', cd)):
        for i in range(data.GetNumberOfArrays()):
            a = data.GetArray(i)
            if a is None or a.GetName() == 'Area':
                continue
            n = a.GetNumberOfComponents()
            result[kind][a.GetName()] = [a.GetComponent(0, c) for c in range(n)] if a.GetNumberOfTuples() > 0 else None
    return result


def main():
    out_path = sys.argv[1] if len(sys.argv) > 1 else OUT
    with tempfile.TemporaryDirectory() as tmp:
        subprocess.run(['node', os.path.join(REPO, 'bin', 'run-ts.mjs'), os.path.join(REPO, 'tests', 'reference', 'cutInputs.ts'), tmp],
                       cwd=REPO, check=True)
        with open(os.path.join(tmp, 'cases.json')) as f:
            cases = json.load(f)
        results = []
        for case in cases:
            reader = vtk.vtkXMLUnstructuredGridReader()
            reader.SetFileName(os.path.join(tmp, case['file']))
            reader.Update()
            grid = reader.GetOutput()
            if any(grid.GetCellType(c) not in TYPES_3D for c in range(grid.GetNumberOfCells())):
                # Only when needed: in VTK 9.1 the filter returns no points when it keeps every cell, and it
                # crashes on polyhedra.
                extract = vtk.vtkExtractCellsByType()
                for t in TYPES_3D:
                    extract.AddCellType(t)
                extract.SetInputData(grid)
                extract.Update()
                grid = extract.GetOutput()
            planes = [cut_and_integrate(grid, p['origin'], p['normal']) for p in case['planes']]
            results.append({'name': case['name'], 'cells3d': grid.GetNumberOfCells(), 'planes': planes})
    doc = {
        'generator': 'tests/reference/cut_reference.py (vtkCutter + vtkIntegrateAttributes on 3D cells)',
        'vtk': vtk.vtkVersion.GetVTKVersion(),
        'cases': results,
    }
    os.makedirs(os.path.dirname(out_path), exist_ok=True)
    with open(out_path, 'w') as f:
        json.dump(doc, f, indent=1)
        f.write('\n')


if __name__ == '__main__':
    main()
