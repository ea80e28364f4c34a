/**
 * The boundary surface in the view: triangles coloured by a field (FieldMaterial), the face outlines
 * as lines (on/off), per-group visibility and selection, and picking of a group under the pointer.
 * Geometry is built directly on the arrays transferred from the worker (no pass over them here).
 */
import * as THREE from 'three';
import type { DrawingValues, SurfaceDrawing } from '../../workers/api.ts';
import type { ColorMap } from './colorMaps.ts';
import { FieldMaterial, OutlineMaterial } from './fieldMaterial.ts';

export class SurfaceLayer {
  readonly group = new THREE.Group();
  readonly material: FieldMaterial;
  private readonly mesh: THREE.Mesh;
  private readonly edges: THREE.LineSegments;
  private readonly groupIds: Float32Array;
  private readonly hidden = new Set<number>();

  constructor(d: SurfaceDrawing, map: ColorMap, groupCount: number) {
    const g = new THREE.BufferGeometry();
    g.setAttribute('position', new THREE.BufferAttribute(d.positions, 3));
    g.setAttribute('normal', new THREE.BufferAttribute(d.normals, 3));
    g.setAttribute('aGroup', new THREE.BufferAttribute(d.groups, 1));
    g.setAttribute('aValue', new THREE.BufferAttribute(new Float32Array(d.groups.length), 1));
    const [x0, x1, y0, y1, z0, z1] = d.box;
    // from the worker's box: no pass over the vertices on the main thread
    g.boundingSphere = x0 <= x1
      ? new THREE.Sphere(new THREE.Vector3((x0 + x1) / 2, (y0 + y1) / 2, (z0 + z1) / 2), Math.hypot(x1 - x0, y1 - y0, z1 - z0) / 2)
      : new THREE.Sphere();
    this.groupIds = d.groups;
    this.material = new FieldMaterial(map, groupCount);
    this.material.setSolid(true);
    this.mesh = new THREE.Mesh(g, this.material);
    const eg = new THREE.BufferGeometry();
    eg.setAttribute('position', new THREE.BufferAttribute(d.edges, 3));
    eg.setAttribute('aGroup', new THREE.BufferAttribute(d.edgeGroups, 1));
    eg.boundingSphere = g.boundingSphere.clone();
    this.edges = new THREE.LineSegments(eg, new OutlineMaterial(this.material.groupFlags));
    this.group.add(this.mesh, this.edges);
  }

  /** Colours by per-vertex values (from the worker, in this surface's vertex order); null: plain grey. */
  setValues(v: DrawingValues | null): void {
    const geo = this.mesh.geometry;
    if (v) geo.setAttribute('aValue', new THREE.BufferAttribute(v.values, 1));
    this.material.setSolid(!v);
  }

  setEdgesVisible(on: boolean): void { this.edges.visible = on; }

  /** Opacity of the surface (1 opaque); below 1 lets cut-planes and probes inside show through. */
  setOpacity(a: number): void {
    this.material.uniforms.uOpacity.value = a;
    this.material.transparent = a < 1;
    this.material.depthWrite = a >= 1;
    this.material.needsUpdate = true;
  }

  setGroupVisible(id: number, visible: boolean): void {
    if (visible) this.hidden.delete(id); else this.hidden.add(id);
    this.material.setGroupVisible(id, visible);
  }

  setGroupSelected(id: number, selected: boolean): void { this.material.setGroupSelected(id, selected); }

  /**
   * The visible group and point under a ray, or undefined. Hidden groups are passed through, so a
   * click reaches what the user sees.
   */
  /** Bounds of the drawn triangles of the given groups (for fitting the view to what is shown). */
  static boundsOf(groups: readonly { id: number; bounds: number[] }[], ids: ReadonlySet<number>): number[] | undefined {
    let b: number[] | undefined;
    for (const g of groups) {
      if (!ids.has(g.id)) continue;
      b = b ? b.map((v, i) => (i % 2 === 0 ? Math.min(v, g.bounds[i]!) : Math.max(v, g.bounds[i]!))) : [...g.bounds];
    }
    return b;
  }

  pick(ray: THREE.Raycaster): { group: number; point: THREE.Vector3 } | undefined {
    const hits = ray.intersectObject(this.mesh, false);
    for (const h of hits) {
      if (h.faceIndex === undefined || h.faceIndex === null) continue;
      const g = Math.round(this.groupIds[3 * h.faceIndex]!);
      if (!this.hidden.has(g)) return { group: g, point: h.point };
    }
    return undefined;
  }

  dispose(): void {
    this.mesh.geometry.dispose();
    this.material.dispose();
    this.edges.geometry.dispose();
    (this.edges.material as THREE.Material).dispose();
  }
}
