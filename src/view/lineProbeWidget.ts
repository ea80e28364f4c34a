/**
 * The line probe in the view: a segment with two draggable end points. Dragging moves an end in the
 * plane through it that faces the camera; the caller recomputes the probe as it moves.
 */
import * as THREE from 'three';
import type { Vec3 } from '../../workers/api.ts';
import { keepScreenSize } from './screenSize.ts';

/** Radius of the end handles on screen (CSS pixels). */
export const HANDLE_PIXELS = 7;

export class LineProbeWidget {
  readonly group = new THREE.Group();
  private readonly line: THREE.Line;
  private readonly ends: [THREE.Mesh, THREE.Mesh];
  private dragging: 0 | 1 | -1 = -1;
  private readonly dragPlane = new THREE.Plane();

  /** `size` (the data's diagonal) is kept for callers; the end handles are a fixed size on screen. */
  constructor(size: number) {
    const g = new THREE.BufferGeometry();
    g.setAttribute('position', new THREE.BufferAttribute(new Float32Array(6), 3));
    this.line = new THREE.Line(g, new THREE.LineBasicMaterial({ color: 0x1d4ed8, depthTest: false }));
    this.line.renderOrder = 3;
    const mk = (color: number) => {
      const m = new THREE.Mesh(new THREE.SphereGeometry(1, 20, 14), new THREE.MeshBasicMaterial({ color, depthTest: false }));
      m.renderOrder = 4;
      // until the first draw sizes it, about as large as before
      m.scale.setScalar(size * 0.012);
      keepScreenSize(m, HANDLE_PIXELS);
      return m;
    };
    this.ends = [mk(0x1d4ed8), mk(0x0ea5e9)];
    this.group.add(this.line, ...this.ends);
  }

  set(from: Vec3, to: Vec3): void {
    this.ends[0].position.set(...from);
    this.ends[1].position.set(...to);
    const a = this.line.geometry.getAttribute('position') as THREE.BufferAttribute;
    a.setXYZ(0, ...from);
    a.setXYZ(1, ...to);
    a.needsUpdate = true;
    this.line.geometry.computeBoundingSphere();
  }

  get from(): Vec3 { return this.ends[0].position.toArray() as Vec3; }
  get to(): Vec3 { return this.ends[1].position.toArray() as Vec3; }

  /** Starts a drag if the ray hits an end handle; returns whether it did. */
  startDrag(ray: THREE.Raycaster, camera: THREE.Camera): boolean {
    if (!this.group.visible) return false;
    const hits = ray.intersectObjects(this.ends, false);
    if (hits.length === 0) return false;
    this.dragging = hits[0]!.object === this.ends[0] ? 0 : 1;
    const n = new THREE.Vector3();
    camera.getWorldDirection(n);
    this.dragPlane.setFromNormalAndCoplanarPoint(n, this.ends[this.dragging].position);
    return true;
  }

  /** Moves the dragged end to where the ray meets its drag plane; returns whether it moved. */
  drag(ray: THREE.Raycaster): boolean {
    if (this.dragging < 0) return false;
    const p = ray.ray.intersectPlane(this.dragPlane, new THREE.Vector3());
    if (!p) return false;
    const moved = p.toArray() as Vec3;
    if (this.dragging === 0) this.set(moved, this.to); else this.set(this.from, moved);
    return true;
  }

  endDrag(): boolean {
    const was = this.dragging >= 0;
    this.dragging = -1;
    return was;
  }

  get isDragging(): boolean { return this.dragging >= 0; }
}
