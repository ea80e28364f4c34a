/**
 * The cut-plane in the view: the cut's triangles coloured by a field, a faint square showing the
 * plane's extent (what the user grabs to drag it along its normal), a normal arrow, and the seed point
 * when the cut is restricted to one passage.
 */
import * as THREE from 'three';
import type { DrawingValues, TriangleDrawing, Vec3 } from '../../workers/api.ts';
import type { ColorMap } from './colorMaps.ts';
import { FieldMaterial } from './fieldMaterial.ts';
import { triangleGeometry } from './triangleGeometry.ts';
import { keepScreenSize } from './screenSize.ts';


/** Radius of the cut-plane's drag knob on screen (CSS pixels). */
export const KNOB_PIXELS = 9;
export class CutPlaneLayer {
  readonly group = new THREE.Group();
  readonly material: FieldMaterial;
  private mesh: THREE.Mesh | undefined;
  private readonly handle: THREE.Mesh;
  private readonly arrow: THREE.ArrowHelper;
  private readonly seed: THREE.Mesh;
  /** A knob at the arrow's tip: grabbing it (or the cut) drags the plane along its normal. */
  private readonly knob: THREE.Mesh;
  private origin = new THREE.Vector3();
  private normal = new THREE.Vector3(0, 0, 1);

  /** `size` is the data's diagonal: the square and arrow scale with it. */
  constructor(map: ColorMap, private readonly size: number) {
    this.material = new FieldMaterial(map, 1);
    this.handle = new THREE.Mesh(
      new THREE.PlaneGeometry(1, 1),
      // not drawn (its outline is): it is only a target for picking the seed; a filled square costs a full-view blend per frame
      new THREE.MeshBasicMaterial({ visible: false, side: THREE.DoubleSide }),
    );
    this.handle.scale.setScalar(size * 0.8);
    const border = new THREE.LineSegments(
      new THREE.EdgesGeometry(new THREE.PlaneGeometry(1, 1)),
      new THREE.LineBasicMaterial({ color: 0x2563eb, transparent: true, opacity: 0.6 }),
    );
    this.handle.add(border);
    this.arrow = new THREE.ArrowHelper(new THREE.Vector3(0, 0, 1), new THREE.Vector3(), size * 0.15, 0x2563eb, size * 0.04, size * 0.025);
    this.seed = new THREE.Mesh(new THREE.SphereGeometry(size * 0.008, 16, 12), new THREE.MeshBasicMaterial({ color: 0xdc2626 }));
    this.seed.visible = false;
    // the knob is a fixed size on screen (a 1 mm bead and a 10 m duct alike); about its old size until first drawn
    this.knob = new THREE.Mesh(new THREE.SphereGeometry(1, 20, 14), new THREE.MeshBasicMaterial({ color: 0x2563eb }));
    this.knob.scale.setScalar(size * 0.022);
    keepScreenSize(this.knob, KNOB_PIXELS);
    this.group.add(this.handle, this.arrow, this.seed, this.knob);
  }

  /** Places the square and arrow at the plane (origin, unit normal). */
  setPlane(origin: Vec3, normal: Vec3): void {
    this.origin.set(...origin);
    this.normal.set(...normal).normalize();
    this.handle.position.copy(this.origin);
    this.handle.quaternion.setFromUnitVectors(new THREE.Vector3(0, 0, 1), this.normal);
    this.arrow.position.copy(this.origin);
    this.arrow.setDirection(this.normal);
    this.knob.position.copy(this.origin).addScaledVector(this.normal, this.size * 0.15);
  }

  /** Shows the plane as the one being edited (square, arrow and knob) or as a finished one (cut only). */
  setEditing(on: boolean): void {
    this.handle.visible = on;
    this.arrow.visible = on;
    this.knob.visible = on;
  }

  /** Replaces the cut's triangles (arrays transferred from the worker); null clears them. */
  setTriangles(d: (TriangleDrawing & DrawingValues) | null, colored: boolean): void {
    if (this.mesh) { this.group.remove(this.mesh); this.mesh.geometry.dispose(); this.mesh = undefined; }
    if (!d || d.positions.length === 0) return;
    const g = triangleGeometry(d);
    this.material.setSolid(!colored);
    this.mesh = new THREE.Mesh(g, this.material);
    this.mesh.renderOrder = 1;
    this.group.add(this.mesh);
  }

  setSeed(p: Vec3 | undefined): void {
    this.seed.visible = !!p;
    if (p) this.seed.position.set(...p);
  }

  /** The point where a ray meets the plane, or undefined when parallel. */
  rayHit(ray: THREE.Ray): THREE.Vector3 | undefined {
    const plane = new THREE.Plane().setFromNormalAndCoplanarPoint(this.normal, this.origin);
    return ray.intersectPlane(plane, new THREE.Vector3()) ?? undefined;
  }

  /** Whether a ray hits the grab square (to start dragging) or the cut triangles. */
  grabbed(ray: THREE.Raycaster): boolean {
    return ray.intersectObject(this.knob, false).length > 0 || (!!this.mesh && ray.intersectObject(this.mesh, false).length > 0);
  }

  /**
   * Position t along the normal line through the origin closest to a ray (for dragging along the
   * normal); undefined when the ray runs along the normal.
   */
  alongNormal(ray: THREE.Ray): number | undefined {
    const w0 = new THREE.Vector3().subVectors(this.origin, ray.origin);
    const b = this.normal.dot(ray.direction), d = this.normal.dot(w0), e = ray.direction.dot(w0);
    const den = 1 - b * b;
    if (den < 1e-9) return undefined;
    return (b * e - d) / den;
  }

  get knobPosition(): Vec3 { return this.knob.position.toArray() as Vec3; }
  get unitNormal(): THREE.Vector3 { return this.normal.clone(); }
  get planeOrigin(): THREE.Vector3 { return this.origin.clone(); }
  get extent(): number { return this.size; }

  dispose(): void {
    if (this.mesh) this.mesh.geometry.dispose();
    this.material.dispose();
    this.handle.geometry.dispose();
  }
}
