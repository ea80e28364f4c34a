/**
 * The three.js stage: renderer, camera, orbit/pan/zoom controls, render-on-demand, camera presets
 * (along each axis, isometric), fit to view, and projection of world points to screen pixels for pins.
 * Knows nothing of fields or probes; the other view modules add objects to `root`.
 */
import * as THREE from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import type { Bounds } from '../model/bounds.ts';
import { setPixelScale } from './screenSize.ts';

/** Camera presets: look along an axis (from the positive or negative side) or isometric. */
export type ViewPreset = '+x' | '-x' | '+y' | '-y' | '+z' | '-z' | 'iso';

/** Whether WebGL is rasterised in software (SwiftShader, llvmpipe …), judged from a throw-away context. */
function softwareRendering(): boolean {
  const gl = document.createElement('canvas').getContext('webgl2');
  if (!gl) return true;
  const info = gl.getExtension('WEBGL_debug_renderer_info');
  const name = String(info ? gl.getParameter(info.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
  gl.getExtension('WEBGL_lose_context')?.loseContext();
  return /swiftshader|llvmpipe|softpipe|software|basic render/i.test(name);
}

/** Background of the view and of exported pictures (light, for reports). */
export const BACKGROUND = 0xf5f6f8;

/**
 * Longest wait (ms) for a new probe's first result before a frame is drawn anyway (`holdFrames`): a cut on
 * 1M cells takes about 0.1–0.25 s, a line probe a few tens of ms.
 */
export const NEW_PROBE_FRAME_HOLD_MS = 300;

/**
 * Software path: scale of the picture's pixels while a probe is dragged (`setDragging`): a quarter of the
 * pixels to rasterise, the picture a little soft until the drag ends.
 */
export const DRAG_PIXEL_SCALE = 0.5;

/** Software frames whose costs `ViewScene.frameTimes` keeps. */
const FRAME_TIMES_KEPT = 64;

export class ViewScene {
  readonly renderer: THREE.WebGLRenderer;
  readonly scene = new THREE.Scene();
  readonly camera: THREE.PerspectiveCamera;
  readonly controls: OrbitControls;
  /** Everything drawn from the data goes here. */
  readonly root = new THREE.Group();
  private fitBounds: Bounds = [-1, 1, -1, 1, -1, 1];
  private frameQueued = false;
  private readonly listeners: (() => void)[] = [];

  /** True when WebGL runs on a software rasteriser (no GPU): pictures are drawn leaner to keep the page responsive. */
  readonly software: boolean;
  /**
   * Software path: the scene is drawn offscreen and its pixels fetched without blocking (fence + async
   * read), then shown on a 2D canvas. A WebGL canvas on the page would make the browser wait for the CPU
   * rasteriser on the main thread at every frame.
   */
  private readonly shown: { ctx: CanvasRenderingContext2D; target: THREE.WebGLRenderTarget; pixels: Uint8Array<ArrayBuffer> } | undefined;
  private inFlight = false;
  /** Software path: a probe is being dragged (frames at `DRAG_PIXEL_SCALE`), and the target they use. */
  private dragging = false;
  private dragTarget: THREE.WebGLRenderTarget | undefined;
  private again = false;
  /**
   * The last software frames' costs (ms, newest last, at most `FRAME_TIMES_KEPT`): `draw` issuing the draw
   * calls, `raster` waiting for the rasteriser and the pixels, `show` putting them on the page. Read by the
   * viewer benchmark.
   */
  readonly frameTimes: { draw: number; raster: number; show: number }[] = [];

  constructor(readonly canvas: HTMLCanvasElement) {
    this.software = softwareRendering();
    if (this.software) {
      const gl = new OffscreenCanvas(1, 1);
      // multisampling would double the CPU rasteriser's work
      this.renderer = new THREE.WebGLRenderer({ canvas: gl as unknown as HTMLCanvasElement, antialias: false, alpha: false });
      this.shown = {
        ctx: canvas.getContext('2d', { alpha: false })!,
        target: new THREE.WebGLRenderTarget(1, 1, { colorSpace: THREE.SRGBColorSpace }),
        pixels: new Uint8Array(4),
      };
    } else {
      this.renderer = new THREE.WebGLRenderer({ canvas, antialias: true, alpha: false });
    }
    this.renderer.setPixelRatio(this.software ? 1 : Math.min(window.devicePixelRatio, 2));
    this.renderer.setClearColor(BACKGROUND, 1);
    // shader status queries wait for the GPU process; with software rendering that stalls the page
    this.renderer.debug.checkShaderErrors = false;
    this.camera = new THREE.PerspectiveCamera(30, 1, 1e-3, 1e3);
    this.camera.up.set(0, 0, 1);
    this.scene.add(this.root);
    this.controls = new OrbitControls(this.camera, canvas);
    this.controls.enableDamping = false;
    this.controls.zoomToCursor = true;
    this.controls.addEventListener('change', () => this.requestRender());
    new ResizeObserver(() => this.resize()).observe(canvas.parentElement ?? canvas);
    this.resize();
  }

  /**
   * Compiles the shader programs of the given objects ahead of use (in a scene that is never drawn), so
   * the first plane or probe does not stall on compilation. Keep the objects alive: disposing them
   * would release the programs.
   */
  async warmUp(objects: THREE.Object3D[]): Promise<void> {
    const warm = new THREE.Scene();
    for (const o of objects) warm.add(o);
    const cam = new THREE.PerspectiveCamera(30, 1, 0.01, 100);
    cam.position.set(2, -3, 2);
    cam.lookAt(0.5, 0.5, 0.5);
    // programs depend on where they draw: compile for the target frames go to
    const target = this.shown?.target ?? null;
    this.renderer.setRenderTarget(target);
    await this.renderer.compileAsync(warm, cam);
    // one real draw of each kind: a software rasteriser builds its pipelines on first draw, not on compile
    this.renderer.setRenderTarget(target);
    this.renderer.render(warm, cam);
    this.renderer.setRenderTarget(null);
    this.requestRender();
  }

  /**
   * Uploads the buffers of `objects` (in the scene, visible) to the GPU now, by drawing them into a 1×1
   * target nobody sees, so that a later frame does not upload them all in one long task.
   */
  upload(objects: readonly THREE.Object3D[]): void {
    if (objects.length === 0) return;
    const scene = new THREE.Scene(), parents = objects.map((o) => o.parent), culled = objects.map((o) => o.frustumCulled);
    // the same colour space as frames use, so the same shader programs serve both
    this.uploadTarget ??= new THREE.WebGLRenderTarget(1, 1, { colorSpace: THREE.SRGBColorSpace });
    for (const o of objects) { o.frustumCulled = false; scene.add(o); }
    const previous = this.renderer.getRenderTarget();
    this.renderer.setRenderTarget(this.uploadTarget);
    this.renderer.render(scene, this.camera);
    this.renderer.setRenderTarget(previous);
    objects.forEach((o, i) => { o.frustumCulled = culled[i]!; parents[i]?.add(o); });
  }
  private uploadTarget: THREE.WebGLRenderTarget | undefined;

  /** Resolves after the next rendered frame (requests one). */
  nextFrame(): Promise<void> {
    return new Promise((resolve) => { this.once.push(resolve); this.requestRender(); });
  }
  private once: (() => void)[] = [];

  /** Called after every rendered frame (pins follow the camera through it). */
  onFrame(listener: () => void): void { this.listeners.push(listener); }

  /**
   * Software path: frames requested in the next `ms` wait until `releaseFrames()` (or the time is up), so a
   * new probe's marker and its first result share one frame. A frame started for the marker alone would
   * hold the result back by a whole software frame.
   */
  holdFrames(ms = NEW_PROBE_FRAME_HOLD_MS): void {
    if (!this.shown) return;
    this.releaseFrames();
    this.held = setTimeout(() => this.releaseFrames(), ms);
  }

  /** Ends `holdFrames` and draws what was requested meanwhile. */
  releaseFrames(): void {
    if (this.held === undefined) return;
    clearTimeout(this.held);
    this.held = undefined;
    if (this.heldRequest) { this.heldRequest = false; this.requestRender(); }
  }
  private held: ReturnType<typeof setTimeout> | undefined;
  private heldRequest = false;

  /** Schedules one frame; several requests in a frame render once. */
  requestRender(): void {
    // tests and the benchmark wait for the picture to settle through this attribute
    document.body.dataset['drawing'] = 'true';
    if (this.held !== undefined) { this.heldRequest = true; return; }
    if (this.frameQueued) return;
    if (this.inFlight) { this.again = true; return; }
    this.frameQueued = true;
    requestAnimationFrame(() => {
      this.frameQueued = false;
      if (this.shown) { void this.drawOffscreen(this.shown); return; }
      this.renderer.render(this.scene, this.camera);
      this.frameDone();
    });
  }

  private frameDone(): void {
    if (!this.again && !this.frameQueued) document.body.dataset['drawing'] = 'false';
    for (const l of this.listeners) l();
    const once = this.once;
    this.once = [];
    for (const f of once) f();
  }

  /** Software path: draw offscreen, fetch the pixels without waiting, show them; one frame in flight. */
  private async drawOffscreen(shown: NonNullable<ViewScene['shown']>): Promise<void> {
    this.inFlight = true;
    try {
      const target = this.dragging ? this.dragTargetFor(shown.target) : shown.target, w = target.width, h = target.height;
      if (shown.pixels.length !== 4 * w * h) shown.pixels = new Uint8Array(4 * w * h);
      const t0 = performance.now();
      this.drawInto(target);
      const t1 = performance.now();
      await this.renderer.readRenderTargetPixelsAsync(target, 0, 0, w, h, shown.pixels);
      const t2 = performance.now();
      const image = new ImageData(new Uint8ClampedArray(shown.pixels.buffer, 0, 4 * w * h), w, h);
      const bitmap = await createImageBitmap(image, { imageOrientation: 'flipY' });
      const full = shown.target;
      if (this.canvas.width !== full.width || this.canvas.height !== full.height) { this.canvas.width = full.width; this.canvas.height = full.height; }
      shown.ctx.drawImage(bitmap, 0, 0, full.width, full.height);
      bitmap.close();
      this.frameTimes.push({ draw: t1 - t0, raster: t2 - t1, show: performance.now() - t2 });
      if (this.frameTimes.length > FRAME_TIMES_KEPT) this.frameTimes.shift();
      this.frameDone();
    } finally {
      this.inFlight = false;
      if (this.again) { this.again = false; this.requestRender(); }
    }
  }

  /**
   * Keeps the picture of `object` (a child of `root`: the boundary surface) between software frames while
   * `key()` stays the same and the camera and size do not move: a frame that only changes other objects (a
   * dragged cut-plane, a new line probe) copies the kept colours and depths and draws just those objects on
   * top. `key` returns undefined when the layer cannot be kept (see-through: what lies behind it would have
   * to be blended under it). Undefined `object` stops keeping.
   */
  keepStill(object: THREE.Object3D | undefined, key?: () => string | undefined): void {
    this.still = object && key ? { object, key } : undefined;
    this.stillKey = undefined;
  }
  private still: { object: THREE.Object3D; key: () => string | undefined } | undefined;
  /** Colours and depths of the kept layer alone, and what they were drawn for. */
  private stillTarget: THREE.WebGLRenderTarget | undefined;
  private stillKey: string | undefined;
  /** Frames drawn with the kept layer copied instead of drawn (for tests and the benchmark). */
  stillFrames = 0;

  /**
   * Draws the scene into `target`: at once, or (a kept layer, see `keepStill`) by copying the kept layer's
   * colours and depths, drawn again only when its key, the camera or the size changed, and drawing the
   * other objects over them. The result is the same picture: the kept layer is opaque, so drawing it
   * before the other opaque objects changes no pixel; only see-through lines of both overlapping one
   * another may blend in another order.
   */
  private drawInto(target: THREE.WebGLRenderTarget): void {
    const r = this.renderer, still = this.still;
    const layerKey = still && still.object.parent === this.root && still.object.visible ? still.key() : undefined;
    if (!still || layerKey === undefined) {
      this.stillKey = undefined;
      r.setRenderTarget(target);
      r.render(this.scene, this.camera);
      r.setRenderTarget(null);
      return;
    }
    this.camera.updateMatrixWorld();
    const key = `${layerKey}|${target.width}x${target.height}|${this.camera.matrixWorld.elements.join(',')}|${this.camera.projectionMatrix.elements.join(',')}`;
    const kept = this.stillTarget ??= new THREE.WebGLRenderTarget(target.width, target.height, { colorSpace: THREE.SRGBColorSpace });
    if (kept.width !== target.width || kept.height !== target.height) kept.setSize(target.width, target.height);
    const others = [...this.scene.children.filter((o) => o !== this.root), ...this.root.children.filter((o) => o !== still.object)];
    const shown = others.map((o) => o.visible);
    if (key !== this.stillKey) {
      // the kept layer alone
      for (const o of others) o.visible = false;
      r.setRenderTarget(kept);
      r.render(this.scene, this.camera);
      others.forEach((o, i) => { o.visible = shown[i]!; });
      this.stillKey = key;
    } else this.stillFrames++;
    r.setRenderTarget(target);
    const gl = r.getContext() as WebGL2RenderingContext;
    const into = (r.properties.get(target) as { __webglFramebuffer: WebGLFramebuffer }).__webglFramebuffer;
    const from = (r.properties.get(kept) as { __webglFramebuffer: WebGLFramebuffer }).__webglFramebuffer;
    gl.bindFramebuffer(gl.READ_FRAMEBUFFER, from);
    gl.blitFramebuffer(0, 0, kept.width, kept.height, 0, 0, target.width, target.height, gl.COLOR_BUFFER_BIT | gl.DEPTH_BUFFER_BIT, gl.NEAREST);
    // three.js believes `into` is bound for reading and drawing
    gl.bindFramebuffer(gl.READ_FRAMEBUFFER, into);
    still.object.visible = false;
    const autoClear = r.autoClear;
    r.autoClear = false;
    try { r.render(this.scene, this.camera); } finally {
      r.autoClear = autoClear;
      still.object.visible = true;
    }
    r.setRenderTarget(null);
  }

  /**
   * Software path: while `on` (a probe is dragged, each step waited for), frames are drawn with
   * `DRAG_PIXEL_SCALE` of the pixels and shown stretched; the frame after the drag is sharp again.
   */
  setDragging(on: boolean): void {
    if (!this.shown || this.dragging === on) return;
    this.dragging = on;
    this.requestRender();
  }

  private dragTargetFor(full: THREE.WebGLRenderTarget): THREE.WebGLRenderTarget {
    const w = Math.max(1, Math.round(full.width * DRAG_PIXEL_SCALE)), h = Math.max(1, Math.round(full.height * DRAG_PIXEL_SCALE));
    let t = this.dragTarget;
    if (!t) {
      t = this.dragTarget = new THREE.WebGLRenderTarget(w, h, { colorSpace: THREE.SRGBColorSpace });
      // handles keep their size on screen
      setPixelScale(t, DRAG_PIXEL_SCALE);
    }
    if (t.width !== w || t.height !== h) t.setSize(w, h);
    return t;
  }

  /** Size of the view in CSS pixels. */
  get size(): { width: number; height: number } {
    return { width: this.canvas.clientWidth, height: this.canvas.clientHeight };
  }

  private resize(): void {
    const { width, height } = this.size;
    if (width === 0 || height === 0) return;
    this.renderer.setSize(width, height, false);
    if (this.shown) {
      const ratio = this.renderer.getPixelRatio();
      this.shown.target.setSize(Math.round(width * ratio), Math.round(height * ratio));
    }
    this.camera.aspect = width / height;
    this.camera.updateProjectionMatrix();
    this.requestRender();
  }

  /** The data's bounds (file length units), used by fit and presets and for clipping distances. */
  setBounds(b: Bounds): void {
    this.fitBounds = b;
    const d = Math.max(1e-12, Math.hypot(b[1] - b[0], b[3] - b[2], b[5] - b[4]));
    this.camera.near = d * 1e-3;
    this.camera.far = d * 100;
    this.controls.minDistance = d * 1e-3;
    this.controls.maxDistance = d * 20;
    this.camera.updateProjectionMatrix();
  }

  /** The box that fit and the presets frame (what is shown; defaults to the data's bounds). */
  setFitBounds(b: Bounds): void { this.fitBounds = b; }

  /** Centre and diagonal of the framed box. */
  get extent(): { center: THREE.Vector3; diagonal: number } {
    const b = this.fitBounds;
    return {
      center: new THREE.Vector3((b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2),
      diagonal: Math.max(1e-12, Math.hypot(b[1] - b[0], b[3] - b[2], b[5] - b[4])),
    };
  }

  /** Moves the camera back along its current direction until the whole bounds fit in the view. */
  fit(): void {
    const { center, diagonal } = this.extent;
    const dir = new THREE.Vector3().subVectors(this.camera.position, this.controls.target);
    if (dir.lengthSq() === 0) dir.set(1, -1, 1);
    dir.normalize();
    const halfFov = THREE.MathUtils.degToRad(this.camera.fov / 2);
    const fovMin = Math.min(halfFov, Math.atan(Math.tan(halfFov) * this.camera.aspect));
    const dist = (diagonal / 2) / Math.sin(fovMin) * 1.05;
    this.controls.target.copy(center);
    this.camera.position.copy(center).addScaledVector(dir, dist);
    this.camera.updateProjectionMatrix();
    this.controls.update();
    this.requestRender();
  }

  /** Looks along an axis (the camera sits on the named side) or from the isometric corner, then fits. */
  view(preset: ViewPreset): void {
    const dirs: Record<ViewPreset, [number, number, number]> = {
      '+x': [1, 0, 0], '-x': [-1, 0, 0], '+y': [0, 1, 0], '-y': [0, -1, 0], '+z': [0, 0, 1], '-z': [0, 0, -1], iso: [1, -1, 1],
    };
    const [x, y, z] = dirs[preset];
    this.camera.up.set(0, 0, 1);
    if (preset === '+z' || preset === '-z') this.camera.up.set(0, 1, 0);
    this.camera.position.copy(this.controls.target).add(new THREE.Vector3(x, y, z));
    this.fit();
  }

  /** World point → CSS pixels in the view (origin top-left); `behind` when it is behind the camera. */
  project(p: ArrayLike<number>, width = this.size.width, height = this.size.height): { x: number; y: number; behind: boolean } {
    // beyond the far plane or outside the view a point still has a screen direction (pins mark it on the edge);
    // only a point behind the camera has none on the picture, and it is reported far off towards its side
    const c = new THREE.Vector3(p[0], p[1], p[2]).applyMatrix4(this.camera.matrixWorldInverse);
    if ((this.camera as THREE.PerspectiveCamera).isPerspectiveCamera && c.z >= 0) {
      const n = Math.hypot(c.x, c.y) || 1;
      return { x: width / 2 + (c.x / n) * 1e6, y: height / 2 - (c.y / n) * 1e6, behind: false };
    }
    const v = new THREE.Vector3(p[0], p[1], p[2]).project(this.camera);
    return { x: (v.x + 1) / 2 * width, y: (1 - v.y) / 2 * height, behind: false };
  }

  /** Normalised device coordinates of a pointer event, for ray casting. */
  pointerNdc(ev: { clientX: number; clientY: number }): THREE.Vector2 {
    const r = this.canvas.getBoundingClientRect();
    return new THREE.Vector2(((ev.clientX - r.left) / r.width) * 2 - 1, -((ev.clientY - r.top) / r.height) * 2 + 1);
  }

  /**
   * Renders the scene at `width`×`height` device pixels into an offscreen target and returns the
   * pixels top row first (RGBA). The on-screen view is not disturbed.
   */
  async snapshot(width: number, height: number): Promise<ImageData> {
    const target = new THREE.WebGLRenderTarget(width, height, { samples: this.software ? 0 : 4, colorSpace: THREE.SRGBColorSpace });
    const cam = this.camera.clone();
    cam.aspect = width / height;
    cam.updateProjectionMatrix();
    this.renderer.setRenderTarget(target);
    this.renderer.render(this.scene, cam);
    this.renderer.setRenderTarget(null);
    const buf = new Uint8Array(4 * width * height);
    await this.renderer.readRenderTargetPixelsAsync(target, 0, 0, width, height, buf);
    target.dispose();
    const out = new ImageData(width, height);
    const row = 4 * width;
    for (let y = 0; y < height; y++) out.data.set(buf.subarray((height - 1 - y) * row, (height - y) * row), y * row);
    return out;
  }

  /** The camera as used by `snapshot` for a given aspect ratio, for projecting pins onto the picture. */
  cameraFor(width: number, height: number): THREE.PerspectiveCamera {
    const cam = this.camera.clone();
    cam.aspect = width / height;
    cam.updateProjectionMatrix();
    return cam;
  }
}
