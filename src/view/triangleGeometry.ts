/**
 * Buffer geometry of triangles drawn by the field material (cut-planes, iso-surfaces): positions and normals
 * (length unit), the group index and the colour value per vertex, all taken over from the worker's arrays
 * without copies.
 */
import * as THREE from 'three';
import type { DrawingValues, TriangleDrawing } from '../../workers/api.ts';

/** The geometry of `d` with its bounding sphere computed. */
export function triangleGeometry(d: TriangleDrawing & DrawingValues): THREE.BufferGeometry {
  const g = new THREE.BufferGeometry();
  g.setAttribute('position', new THREE.BufferAttribute(d.positions, 3));
  g.setAttribute('normal', new THREE.BufferAttribute(d.normals, 3));
  g.setAttribute('aGroup', new THREE.BufferAttribute(d.groups, 1));
  g.setAttribute('aValue', new THREE.BufferAttribute(d.values, 1));
  g.computeBoundingSphere();
  return g;
}
