/**
 * Handles drawn at a fixed size on screen, whatever the data's size or the zoom: before each draw the
 * object is scaled so that one unit of its geometry spans `pixels` pixels at its distance from the camera
 * (a 1 mm bead and a 10 m duct get the same 7-px end handles).
 */
import * as THREE from 'three';

const size = new THREE.Vector2(), pos = new THREE.Vector3();

/**
 * Targets drawn with fewer pixels than the view shows them at (the software path's drag frames): their
 * pixels per view pixel. A handle keeps its size on screen in them.
 */
const pixelScales = new WeakMap<THREE.WebGLRenderTarget, number>();

/** Declares that `target`'s pictures are shown stretched by 1/`scale` (0 < scale ≤ 1). */
export function setPixelScale(target: THREE.WebGLRenderTarget, scale: number): void { pixelScales.set(target, scale); }

/** World length that spans one pixel at `point` for `camera` drawing `heightPx` pixels high. */
export function worldPerPixel(camera: THREE.Camera, point: THREE.Vector3, heightPx: number): number {
  const cam = camera as THREE.PerspectiveCamera & THREE.OrthographicCamera;
  if (cam.isOrthographicCamera) return (cam.top - cam.bottom) / cam.zoom / Math.max(1, heightPx);
  const d = point.distanceTo(camera.getWorldPosition(pos));
  return (2 * d * Math.tan((cam.fov * Math.PI) / 360)) / cam.zoom / Math.max(1, heightPx);
}

/** Keeps `object` (geometry of unit radius) `pixels` pixels in radius on screen. */
export function keepScreenSize(object: THREE.Object3D, pixels: number): void {
  object.onBeforeRender = (renderer, _scene, camera) => {
    const target = renderer.getRenderTarget();
    const h = target ? target.height / (pixelScales.get(target as THREE.WebGLRenderTarget) ?? 1) : renderer.getSize(size).y;
    object.scale.setScalar(pixels * worldPerPixel(camera, object.getWorldPosition(new THREE.Vector3()), h));
    object.updateMatrixWorld();
    // the renderer already took the model-view matrix: refresh it for this draw
    object.modelViewMatrix.multiplyMatrices(camera.matrixWorldInverse, object.matrixWorld);
    object.normalMatrix.getNormalMatrix(object.modelViewMatrix);
  };
}
