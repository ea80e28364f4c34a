/**
 * The axis triad on screen (a small SVG in the view's bottom-right corner, turned with the camera each
 * frame) and in exported pictures (the same SVG drawn onto the picture's canvas). Geometry and look:
 * src/study/axisTriad.ts.
 */
import type * as THREE from 'three';
import { TRIAD_STYLE, triadBox, triadSvg, type ViewBasis } from '../study/axisTriad.ts';

/** The camera's right, up and forward unit vectors in world axes (its world matrix columns). */
export function basisOfCamera(camera: THREE.Camera): ViewBasis {
  camera.updateMatrixWorld();
  const e = camera.matrixWorld.elements;
  const n = (x: number, y: number, z: number): [number, number, number] => { const l = Math.hypot(x, y, z) || 1; return [x / l, y / l, z / l]; };
  return { right: n(e[0]!, e[1]!, e[2]!), up: n(e[4]!, e[5]!, e[6]!), forward: n(-e[8]!, -e[9]!, -e[10]!) };
}

/** The on-screen triad: an SVG element placed by CSS (`.axis-triad-view`), redrawn when the camera turns. */
export class TriadView {
  readonly el: SVGSVGElement;
  private last = '';

  constructor(host: HTMLElement) {
    const s = TRIAD_STYLE.size;
    this.el = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
    this.el.setAttribute('class', 'axis-triad-view');
    this.el.setAttribute('viewBox', `0 0 ${s} ${s}`);
    this.el.setAttribute('width', String(s));
    this.el.setAttribute('height', String(s));
    this.el.setAttribute('aria-label', 'axis directions');
    this.el.setAttribute('font-family', 'system-ui, sans-serif');
    host.append(this.el);
  }

  /** Redraws for the camera (only when its orientation changed). */
  update(camera: THREE.Camera): void {
    const markup = triadSvg(basisOfCamera(camera), 0, 0);
    if (markup === this.last) return;
    this.last = markup;
    this.el.innerHTML = markup;
  }
}

/**
 * Draws the triad onto an exported picture's canvas in its bottom-right corner, `bottomClear` pixels above
 * the bottom (the footer); returns the square it took, for the pins to keep clear of.
 */
export async function drawTriad(ctx: CanvasRenderingContext2D, camera: THREE.Camera, width: number, height: number, scale: number, bottomClear: number): Promise<{ x: number; y: number; width: number; height: number }> {
  const box = triadBox(width, height, scale, bottomClear);
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${box.width}" height="${box.height}" font-family="system-ui, sans-serif">${triadSvg(basisOfCamera(camera), 0, 0, scale)}</svg>`;
  const img = new Image();
  img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`;
  await img.decode();
  ctx.drawImage(img, box.x, box.y, box.width, box.height);
  return box;
}
