#!/usr/bin/python3
"""Velocity gradients by VTK 9.1 (Debian python3-vtk9): vtkGradientFilter on the point velocity of sample files.

VTK's gradient filter is a first-order reference: at a node it averages the gradients of the linear
interpolants of the cells around it. For every case below it records, at every STRIDE-th node, the
node's coordinates, VTK's velocity gradient (9 components, d u_a / d x_b row by row), vorticity and
Q-criterion. tests/derive/gradientReference.test.ts compares fieldtally's second-order gradient with these
numbers and with the exact solutions of the sample fields.
Run: /usr/bin/python3 tests/reference/gradient_reference.py [--check]   (from anywhere)
With --check it recomputes and compares with the committed JSON instead of writing (relative 1e-12),
prints one line per difference ("differs") and exits 1 if there is any.
"""
import os
import sys

import vtk

from committed_values import write_or_check

vtk.vtkSMPTools.Initialize(1)

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUT = os.path.join(ROOT, 'tests', 'reference', 'expected', 'gradient', 'gradient_reference.json')

# (name, file relative to the repository root, velocity array, node stride)
CASES = [
    ('pipe-medium', 'sample-fields/pipe-medium.vtu', 'velocity', 23),
    ('sphere-stokes', 'sample-fields/sphere-stokes.vtu', 'velocity', 131),
]


def run_case(name, rel, array, stride):
    reader = vtk.vtkXMLUnstructuredGridReader()
    reader.SetFileName(os.path.join(ROOT, rel))
    reader.Update()
    grad = vtk.vtkGradientFilter()
    grad.SetInputConnection(reader.GetOutputPort())
    grad.SetInputArrayToProcess(0, 0, 0, vtk.vtkDataObject.FIELD_ASSOCIATION_POINTS, array)
    grad.SetResultArrayName('gradient')
    grad.SetComputeVorticity(True)
    grad.SetVorticityArrayName('vorticity')
    grad.SetComputeQCriterion(True)
    grad.SetQCriterionArrayName('q')
    grad.Update()
    out = grad.GetOutput()
    pd = out.GetPointData()
    g, w, q = pd.GetArray('gradient'), pd.GetArray('vorticity'), pd.GetArray('q')
    nodes = []
    for i in range(0, out.GetNumberOfPoints(), stride):
        nodes.append({
            'id': i,
            'x': list(out.GetPoint(i)),
            'gradient': [g.GetComponent(i, k) for k in range(9)],
            'vorticity': [w.GetComponent(i, k) for k in range(3)],
            'q': q.GetComponent(i, 0),
        })
    return {'name': name, 'file': rel, 'array': array, 'stride': stride, 'nodes': nodes}


def flatten(doc):
    for c in doc['cases']:
        for n in c['nodes']:
            for key in ('gradient', 'vorticity'):
                for k, v in enumerate(n[key]):
                    yield '%s node %d %s[%d]' % (c['name'], n['id'], key, k), v
            yield '%s node %d q' % (c['name'], n['id']), n['q']


def main():
    doc = {'vtk': vtk.vtkVersion.GetVTKVersion(), 'filter': 'vtkGradientFilter', 'cases': [run_case(*c) for c in CASES]}
    write_or_check(doc, OUT, flatten)


main()
