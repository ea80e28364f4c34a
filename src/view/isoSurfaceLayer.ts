/**
 * An iso-surface in the view: its triangles coloured by a field (or solid when none is chosen), drawn with
 * the surface's field material so the colour map and range follow the panel.
 */
import * as THREE from 'three';
import type { DrawingValues, TriangleDrawing } from '../../workers/api.ts';
import type { ColorMap } from './colorMaps.ts';
import { FieldMaterial } from './fieldMaterial.ts';
import { triangleGeometry } from './triangleGeometry.ts';

export class IsoSurfaceLayer {
  readonly group = new THREE.Group();
  readonly material: FieldMaterial;
  private mesh: THREE.Mesh | undefined;

  constructor(map: ColorMap) {
    this.material = new FieldMaterial(map, 1);
  }

  /** Replaces the triangles (arrays transferred from the worker); null clears them. `range`: colour range (field units). */
  setTriangles(d: (TriangleDrawing & DrawingValues) | null, colored: boolean, range?: [number, number]): void {
    if (this.mesh) { this.group.remove(this.mesh); this.mesh.geometry.dispose(); this.mesh = undefined; }
    if (!d || d.positions.length === 0) return;
    const g = triangleGeometry(d);
    this.material.setSolid(!colored);
    const [lo, hi] = range && Number.isFinite(range[0]) && Number.isFinite(range[1]) ? range : [0, 1];
    this.material.setRange(lo, hi > lo ? hi : lo + 1);
    this.mesh = new THREE.Mesh(g, this.material);
    this.mesh.renderOrder = 1;
    this.group.add(this.mesh);
  }

  dispose(): void {
    if (this.mesh) this.mesh.geometry.dispose();
    this.material.dispose();
  }
}
