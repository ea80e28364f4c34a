#!/usr/bin/python3
"""Line probes by VTK 9.1 (Debian python3-vtk9): vtkLineSource + vtkProbeFilter on real and sample files.

For every case below it samples a segment at evenly spaced points (both ends included) and records, per
sample, VTK's valid-point mask and the value of every point and cell array of the file (cell arrays: the
value of the cell VTK finds). Writes one JSON per file into tests/reference/expected/probe/.
tests/locate/probeReference.test.ts compares fieldtally's line probe with these numbers where both find
the sample inside the mesh.
Run: /usr/bin/python3 tests/reference/probe_reference.py [--check]   (from anywhere)
With --check it recomputes and compares with the committed JSON instead of writing (relative 1e-12),
prints one line per difference ("differs") and exits 1 if there is any.
"""
import json
import math
import os
import sys

import vtk

# One thread: the probe filter's cell locator is built in parallel, and on points that lie on a shared face the
# cell it returns (hence the value, when VTK extrapolates within its tolerance) would change from run to run.
vtk.vtkSMPTools.Initialize(1)

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'probe')

# (output name, file relative to the repository root, [(line name, from, to, samples)]).
CASES = [
    ('CylinderLinear', 'tests/fixtures/external/vtk-data/Quadratic/CylinderLinear.vtk', [
        ('across-x', (-0.012, 0.0013, 0.0503), (0.012, 0.0013, 0.0503), 101),
        ('across-diagonal', (-0.007, -0.0069, 0.033), (0.0071, 0.007, 0.067), 81),
        ('along-axis', (0.0003, -0.0002, -0.01), (0.0003, -0.0002, 0.11), 121),
        ('along-off-axis', (0.0051, 0.0012, 0.001), (0.0049, 0.0015, 0.099), 97),
    ]),
    ('pipe-coarse', 'sample-fields/pipe-coarse.vtu', [
        ('across-x', (-0.0105, 0.0011, 0.0437), (0.0105, 0.0011, 0.0437), 101),
        ('along-off-axis', (0.0042, -0.0031, -0.002), (0.0043, -0.0029, 0.102), 89),
    ]),
    ('pipe-wedge-core', 'sample-fields/pipe-wedge-core.vtu', [
        ('across-x', (-0.0099, 0.0004, 0.0512), (0.0099, 0.0004, 0.0512), 101),
        ('along-near-axis', (0.0002, 0.0001, 0.0003), (0.0003, -0.0001, 0.0996), 77),
    ]),
    ('pipe-medium-celldata', 'sample-fields/pipe-medium-celldata.vtu', [
        ('across-y', (0.0007, -0.0104, 0.0613), (0.0007, 0.0104, 0.0613), 101),
    ]),
    ('sphere-potential', 'sample-fields/sphere-potential.vtu', [
        ('through-sphere', (-0.3, 0.013, 0.007), (0.3, 0.013, 0.007), 121),
        ('oblique', (0.02, -0.24, 0.03), (0.11, 0.2, -0.05), 101),
    ]),
    ('sphere-stokes-celldata', 'sample-fields/sphere-stokes-celldata.vtu', [
        ('through-sphere', (-0.003, 0.00017, 0.00011), (0.003, 0.00017, 0.00011), 121),
    ]),
    ('duct', 'sample-fields/duct.vtu', [
        ('diagonal', (-0.0049, -0.0048, 0.0021), (0.0049, 0.0047, 0.0979), 101),
    ]),
]


def read(path):
    if path.endswith('.vtk'):
        r = vtk.vtkUnstructuredGridReader()
        r.ReadAllScalarsOn(); r.ReadAllVectorsOn(); r.ReadAllFieldsOn()
    else:
        r = vtk.vtkXMLUnstructuredGridReader()
    r.SetFileName(path)
    r.Update()
    return r.GetOutput()


def probe(ds, p0, p1, n):
    line = vtk.vtkLineSource()
    line.SetPoint1(*p0); line.SetPoint2(*p1); line.SetResolution(n - 1)
    f = vtk.vtkProbeFilter()
    f.SetInputConnection(line.GetOutputPort())
    f.SetSourceData(ds)
    f.Update()
    out = f.GetOutput()
    pd = out.GetPointData()
    mask = pd.GetArray(f.GetValidPointMaskArrayName())
    valid = [int(mask.GetTuple1(i)) for i in range(n)]
    fields = {}
    for assoc, data in (('point', ds.GetPointData()), ('cell', ds.GetCellData())):
        for a in range(data.GetNumberOfArrays()):
            name = data.GetArray(a).GetName()
            arr = pd.GetArray(name)
            if arr is None or name in fields:
                continue
            nc = arr.GetNumberOfComponents()
            vals = [[arr.GetComponent(i, c) for c in range(nc)] if valid[i] else None for i in range(n)]
            fields[name] = {'association': assoc, 'components': nc, 'values': vals}
    return valid, fields


def compute():
    results = {}
    for out_name, rel, lines in CASES:
        path = os.path.normpath(os.path.join(ROOT, rel))
        ds = read(path)
        entry = {
            'generator': 'tests/reference/probe_reference.py (vtkLineSource + vtkProbeFilter)',
            'vtk': vtk.vtkVersion.GetVTKVersion(), 'file': rel, 'lines': [],
        }
        for name, p0, p1, n in lines:
            valid, fields = probe(ds, p0, p1, n)
            entry['lines'].append({'name': name, 'from': list(p0), 'to': list(p1), 'samples': n, 'valid': valid, 'fields': fields})
        results[out_name] = entry
    return results


def close(a, b):
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(close(x, y) for x, y in zip(a, b))
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(close(a[k], b[k]) for k in a)
    if isinstance(a, float) or isinstance(b, float):
        return isinstance(a, (int, float)) and isinstance(b, (int, float)) and math.isclose(a, b, rel_tol=1e-12, abs_tol=1e-300)
    return a == b


def main():
    results = compute()
    if '--check' in sys.argv:
        bad = 0
        for name, entry in results.items():
            path = os.path.join(OUT, name + '.json')
            with open(path) as fh:
                committed = json.load(fh)
            for line_now, line_then in zip(entry['lines'], committed['lines']):
                if not close(line_now, line_then):
                    print(f'{name}.json line {line_now["name"]} differs from VTK {entry["vtk"]} now')
                    bad += 1
            if len(entry['lines']) != len(committed['lines']):
                print(f'{name}.json differs: {len(committed["lines"])} lines committed, {len(entry["lines"])} now')
                bad += 1
        print(f'{len(results)} files checked, {bad} difference(s)')
        sys.exit(1 if bad else 0)
    os.makedirs(OUT, exist_ok=True)
    for name, entry in results.items():
        with open(os.path.join(OUT, name + '.json'), 'w') as fh:
            json.dump(entry, fh, indent=1)
            fh.write('\n')
    print(f'wrote {len(results)} files into {os.path.relpath(OUT, ROOT)}')


if __name__ == '__main__':
    main()
