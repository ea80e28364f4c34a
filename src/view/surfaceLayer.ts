/**
 * The boundary surface in the view: triangles coloured by a field (FieldMaterial), the face outlines
 * as lines (on/off), per-group visibility, selection (an outline around the group, a rim and a light tint:
 * the field's colours stay readable), and picking of a group under the pointer.
 *
 * Geometry is built directly on the arrays transferred from the worker (no pass over them here), in parts
 * of at most `PART_VERTICES` vertices that view the same arrays. With a software rasteriser each part's
 * upload blocks the page for its size, so a progressive layer hands out its parts a few at a time
 * (`nextParts`, at most `UPLOAD_BYTES_PER_TASK` each) for uploading in separate tasks.
 */
import * as THREE from 'three';
import type { DrawingValues, GroupOutline, SurfaceReply } from '../../workers/api.ts';
import type { ColorMap } from './colorMaps.ts';
import { FieldMaterial, OutlineMaterial } from './fieldMaterial.ts';
import { SelectionOutline } from './selectionOutline.ts';

/** Vertices of one drawn part (a multiple of 6: whole triangles, whole segments). */
export const PART_VERTICES = 6 * 16_384;

/**
 * Bytes of vertex data a progressive layer hands out at a time: software rasterisers took about 8 ms per
 * MB to upload (measured in headless chromium with SwiftShader), so ~3 MB keeps a task near 25 ms.
 */
export const UPLOAD_BYTES_PER_TASK = 3 << 20;

/** Bytes per vertex: triangles (position, normal, group, value), outlines (position, group, faces sharing the edge). */
const TRIANGLE_VERTEX_BYTES = 32, EDGE_VERTEX_BYTES = 20;

interface Part {
  object: THREE.Mesh | THREE.LineSegments;
  /** First vertex in the whole drawing. */
  start: number;
  bytes: number;
  /** Drawn (uploaded) yet. */
  revealed: boolean;
}

export class SurfaceLayer {
  readonly group = new THREE.Group();
  readonly material: FieldMaterial;
  private readonly meshes: Part[] = [];
  private readonly edges: Part[] = [];
  private outline: SelectionOutline;
  private readonly lines: OutlineMaterial;
  private readonly groupIds: Float32Array;
  private readonly hidden = new Set<number>();
  private readonly selected = new Set<number>();
  private edgesOn = true;
  /** Counts changes to what is drawn (values, outlines, opacity, groups, parts shown): part of `stillKey`. */
  private changes = 0;

  /**
   * `progressive` (software rendering): only the first parts show (the next frame uploads them), the rest
   * come from `nextParts`; otherwise every part shows at once.
   */
  constructor(d: SurfaceReply, map: ColorMap, groupCount: number, progressive = false) {
    const [x0, x1, y0, y1, z0, z1] = d.box;
    // from the worker's box: no pass over the vertices on the main thread
    const sphere = x0 <= x1
      ? new THREE.Sphere(new THREE.Vector3((x0 + x1) / 2, (y0 + y1) / 2, (z0 + z1) / 2), Math.hypot(x1 - x0, y1 - y0, z1 - z0) / 2)
      : new THREE.Sphere();
    this.groupIds = d.groups;
    this.material = new FieldMaterial(map, groupCount);
    this.material.setSolid(true);
    const lines = this.lines = new OutlineMaterial(this.material.groupFlags);
    const vertices = d.groups.length;
    for (let a = 0; a === 0 || a < vertices; a += PART_VERTICES) {
      const b = Math.min(vertices, a + PART_VERTICES);
      const g = new THREE.BufferGeometry();
      g.setAttribute('position', new THREE.BufferAttribute(d.positions.subarray(3 * a, 3 * b), 3));
      g.setAttribute('normal', new THREE.BufferAttribute(d.normals.subarray(3 * a, 3 * b), 3));
      g.setAttribute('aGroup', new THREE.BufferAttribute(d.groups.subarray(a, b), 1));
      g.setAttribute('aValue', new THREE.BufferAttribute(new Float32Array(b - a), 1));
      g.boundingSphere = sphere.clone();
      this.meshes.push({ object: new THREE.Mesh(g, this.material), start: a, bytes: (b - a) * TRIANGLE_VERTEX_BYTES, revealed: false });
    }
    const edgeVertices = d.edgeGroups.length;
    for (let a = 0; a < edgeVertices; a += PART_VERTICES) {
      const b = Math.min(edgeVertices, a + PART_VERTICES);
      const g = new THREE.BufferGeometry();
      g.setAttribute('position', new THREE.BufferAttribute(d.edges.subarray(3 * a, 3 * b), 3));
      g.setAttribute('aGroup', new THREE.BufferAttribute(d.edgeGroups.subarray(a, b), 1));
      g.setAttribute('aShare', new THREE.BufferAttribute(d.edgeShares.subarray(a, b), 1));
      g.boundingSphere = sphere.clone();
      this.edges.push({ object: new THREE.LineSegments(g, lines), start: a, bytes: (b - a) * EDGE_VERTEX_BYTES, revealed: false });
    }
    this.outline = new SelectionOutline(d.outline);
    for (const p of [...this.meshes, ...this.edges]) { p.object.visible = false; this.group.add(p.object); }
    this.group.add(this.outline.group);
    if (progressive) this.nextParts(); else while (this.nextParts().length);
  }

  /**
   * The next parts to show, surfaces before outlines, up to `UPLOAD_BYTES_PER_TASK` (at least one part);
   * they count as shown from now on (upload them, e.g. with `ViewScene.upload`, before the next frame).
   * Empty once every part is shown.
   */
  nextParts(): THREE.Object3D[] {
    let budget = UPLOAD_BYTES_PER_TASK;
    const out: THREE.Object3D[] = [];
    for (const p of [...this.meshes, ...this.edges]) {
      if (p.revealed) continue;
      if (budget < p.bytes && out.length > 0) break;
      budget -= p.bytes;
      p.revealed = true;
      this.changes++;
      p.object.visible = this.meshes.includes(p) || this.edgesOn;
      out.push(p.object);
    }
    return out;
  }

  /** True once every part has been shown. */
  get complete(): boolean { return this.meshes.every((p) => p.revealed) && this.edges.every((p) => p.revealed); }

  /** Colours by per-vertex values (from the worker, in this surface's vertex order); null: plain grey. */
  setValues(v: DrawingValues | null): void {
    this.changes++;
    if (v) {
      for (const p of this.meshes) {
        const geo = (p.object as THREE.Mesh).geometry, n = geo.getAttribute('aGroup').count;
        geo.setAttribute('aValue', new THREE.BufferAttribute(v.values.subarray(p.start, p.start + n), 1));
      }
    }
    this.material.setSolid(!v);
  }

  setEdgesVisible(on: boolean): void {
    this.edgesOn = on;
    this.changes++;
    for (const p of this.edges) p.object.visible = on && p.revealed;
  }

  /** Opacity of the surface (1 opaque); below 1 lets cut-planes and probes inside show through. */
  setOpacity(a: number): void {
    this.changes++;
    this.material.uniforms.uOpacity.value = a;
    this.material.transparent = a < 1;
    this.material.depthWrite = a >= 1;
    this.material.needsUpdate = true;
  }

  setGroupVisible(id: number, visible: boolean): void {
    if (visible) this.hidden.delete(id); else this.hidden.add(id);
    this.material.setGroupVisible(id, visible);
    this.updateOutline();
  }

  setGroupSelected(id: number, selected: boolean): void {
    if (selected) this.selected.add(id); else this.selected.delete(id);
    this.material.setGroupSelected(id, selected);
    this.updateOutline();
  }

  /** Replaces the groups' outline (a surface drawn before its outline arrived); the selection is outlined anew. */
  setGroupOutline(o: GroupOutline): void {
    this.group.remove(this.outline.group);
    this.outline.dispose();
    this.outline = new SelectionOutline(o);
    this.group.add(this.outline.group);
    this.updateOutline();
  }

  private updateOutline(): void {
    this.changes++;
    this.outline.set(new Set([...this.selected].filter((g) => !this.hidden.has(g))));
  }

  /**
   * What the surface's picture depends on besides the camera (for `ViewScene.keepStill`): changes made
   * through this layer, the colour range, map and solid flag; undefined while it is see-through.
   */
  stillKey(): string | undefined {
    if (this.material.transparent) return undefined;
    const u = this.material.uniforms;
    return `${this.changes}|${u.uRange.value.x},${u.uRange.value.y}|${u.uMap.value.uuid}|${u.uSolid.value}`;
  }

  /** Bounds of the drawn triangles of the given groups (for fitting the view to what is shown). */
  static boundsOf(groups: readonly { id: number; bounds: number[] }[], ids: ReadonlySet<number>): number[] | undefined {
    let b: number[] | undefined;
    for (const g of groups) {
      if (!ids.has(g.id)) continue;
      b = b ? b.map((v, i) => (i % 2 === 0 ? Math.min(v, g.bounds[i]!) : Math.max(v, g.bounds[i]!))) : [...g.bounds];
    }
    return b;
  }

  /**
   * The visible group and point under a ray, or undefined. Hidden groups are passed through, so a
   * click reaches what the user sees.
   */
  pick(ray: THREE.Raycaster): { group: number; point: THREE.Vector3 } | undefined {
    const hits: { distance: number; group: number; point: THREE.Vector3 }[] = [];
    for (const p of this.meshes) {
      for (const h of ray.intersectObject(p.object, false)) {
        if (h.faceIndex === undefined || h.faceIndex === null) continue;
        const g = Math.round(this.groupIds[p.start + 3 * h.faceIndex]!);
        if (!this.hidden.has(g)) { hits.push({ distance: h.distance, group: g, point: h.point }); break; }
      }
    }
    hits.sort((a, b) => a.distance - b.distance);
    return hits[0] ? { group: hits[0].group, point: hits[0].point } : undefined;
  }

  dispose(): void {
    for (const p of [...this.meshes, ...this.edges]) p.object.geometry.dispose();
    this.material.dispose();
    this.lines.dispose();
    this.outline.dispose();
  }
}
