/**
 * Cut-planes: placed by typed origin and normal, slid along the normal (slider, or dragging the knob
 * or the cut in the view) with live recomputation, optionally restricted to one passage by a seed
 * point picked on the plane. Each plane's numbers go to the pins and the table.
 */
import { assignNoiseScales, meshMagnitudes, type NoiseContext } from '../ui/roundingNoise.ts';
import type GUI from 'lil-gui';
import type * as THREE from 'three';
import type { CutDrawingReply, CutReply, CutRequest, Vec3 } from '../../workers/api.ts';
import { guessRole } from '../cut/fieldRoles.ts';
import type { CutPlaneProbe, PlaneDoc, Probe } from '../study/probeSet.ts';
import { formatNumber, formatVec } from '../ui/format.ts';
import { classifyNotes } from '../ui/notes.ts';
import type { ProbeResult, Quantity } from '../ui/results.ts';
import { UNITS, fieldUnit } from '../ui/units.ts';
import { CutPlaneLayer } from '../view/cutPlaneLayer.ts';
import { markDrawn, timedCall } from './callTiming.ts';
import { drawThenNumbers } from './drawThenNumbers.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

interface Plane {
  id: string;
  number: number;
  label: string;
  layer: CutPlaneLayer;
  ox: number; oy: number; oz: number;
  nx: number; ny: number; nz: number;
  seed: Vec3 | undefined;
  /** The plane's own density (kg/m³), overriding the reference conditions; undefined: the reference's (or the file's density field). */
  ownDensity: number | undefined;
  /** Last computed reply (kept for exports). */
  reply?: CutReply;
}

export class PlaneTool {
  private planes: Plane[] = [];
  private current: Plane | undefined;
  private readonly folder: GUI;
  private readonly settings = {
    velocity: '',
    pressure: '',
    slide: 0,
    pickingSeed: false,
  };
  private readonly request;
  private drag: { t0: number; origin: Vec3 } | undefined;
  private readonly planeListeners: (() => void)[] = [];

  constructor(private readonly v: Viewer, private readonly refs: ReferenceTool) {
    this.folder = v.gui.addFolder('Cut-plane');
    // one lane per probe: several probes computed at once never drop each other's requests; a drag step
    // asks for the picture first and the numbers follow when no newer step waits
    const request = (p: Plane): CutRequest => ({
      origin: [p.ox, p.oy, p.oz], normal: [p.nx, p.ny, p.nz], ...(p.seed ? { seed: p.seed } : {}),
      ...(v.colorChoice ? { color: v.colorChoice } : {}),
      velocity: this.settings.velocity, pressure: this.settings.pressure, rho: this.densityOf(p).rho,
    });
    this.request = drawThenNumbers((x: { id: string }) => x.id,
      (p: Plane) => v.track(timedCall('cutDrawing', () => v.compute.cutDrawing(request(p)), true, p.id)),
      (p: Plane) => v.track(timedCall('cut', () => v.compute.cut(request(p)), true, p.id)),
      (reply, p) => this.showDrawing(p, reply),
      (reply, p) => this.show(p, reply),
      (e) => { v.banner.error(`Cut-plane: ${(e as Error).message}`); v.view.releaseFrames(); v.view.requestRender(); },
    );
    v.onDataset(() => this.reset());
    v.onColor(() => { for (const p of this.planes) this.request.request(p, false); });
    refs.onChange(() => { this.buildPanel(); this.recomputeAll(); });
    // derived or formula fields attached: they join the field choices and the cuts are made again
    v.onFields(() => { this.buildPanel(); this.recomputeAll(); });
    v.onColorSettings(() => this.applyColorSettings());
    v.onResultRemoved((id) => this.remove(id));
    v.onRename((id, label) => { const p = this.planes.find((q) => q.id === id); if (p) { p.label = label; this.buildPanel(); this.planesChanged(); } });
    v.addPointerTool(this.pointer());
    this.buildPanel();
  }

  private reset(): void {
    this.removeAll();
    this.settings.velocity = '';
    this.settings.pressure = '';
    this.buildPanel();
  }

  /** Called when a plane is added, moved or removed (tools built on planes follow it). */
  onPlanesChanged(f: () => void): void { this.planeListeners.push(f); }
  private planesChanged(): void { for (const f of this.planeListeners) f(); }

  /** The planes by id and label, with their geometry as a probe set writes it (file's length unit). */
  list(): { id: string; label: string; plane: PlaneDoc }[] {
    return this.planes.map((p) => ({ id: p.id, label: p.label, plane: planeDoc(p) }));
  }

  /**
   * The density a plane uses, by the probe set's rule: its own value, else the file's density field, else
   * the reference density; `text` says which for the pin and the table.
   */
  densityOf(p: { ownDensity: number | undefined }): { rho: number | string; text: string } {
    if (p.ownDensity !== undefined) return { rho: p.ownDensity, text: `ρ = ${formatNumber(p.ownDensity)} kg/m³ (own value, overrides the reference ${formatNumber(this.refs.density)} kg/m³)` };
    const field = guessRole(this.v.fields.map((f) => ({ name: f.name, association: f.association, components: f.components })), 'density').field;
    if (field) return { rho: field.name, text: `ρ from the file's field "${field.name}"` };
    return { rho: this.refs.density, text: `ρ = ${formatNumber(this.refs.density)} kg/m³ (reference conditions)` };
  }

  /** Removes every plane. */
  removeAll(): void {
    for (const p of [...this.planes]) this.remove(p.id);
  }

  /** True when a probe-set probe is a plane this tool can hold and edit (whole cut or a seed; density the reference's or a constant of its own). */
  accepts(p: Probe): p is CutPlaneProbe {
    if (p.kind !== 'cut-plane') return false;
    const r = p.geometry.region ?? {}, f = p.fields ?? {};
    return !r.disk && !r.rectangle && !r.cellGroups && f.velocity !== null && f.pressure !== null && !p.options?.kinematicPressure &&
      (f.density === undefined || typeof f.density === 'number');
  }

  /** The planes as probe-set probes (origin, normal and seed in the file's length unit; a density only when the plane has its own, kg/m³). */
  probes(): CutPlaneProbe[] {
    const s = this.settings;
    return this.planes.map((p) => {
      const fields = { ...(s.velocity ? { velocity: s.velocity } : {}), ...(s.pressure ? { pressure: s.pressure } : {}), ...(p.ownDensity !== undefined ? { density: p.ownDensity } : {}) };
      return { id: p.id, kind: 'cut-plane', label: p.label, geometry: planeDoc(p), ...(Object.keys(fields).length ? { fields } : {}) };
    });
  }

  /** Adds a plane from a probe-set probe (see `accepts`), keeping its id and label. */
  addFrom(probe: CutPlaneProbe): void {
    const g = probe.geometry, f = probe.fields ?? {};
    if (typeof f.velocity === 'string') this.settings.velocity = f.velocity;
    if (typeof f.pressure === 'string') this.settings.pressure = f.pressure;
    const number = Math.max(0, ...this.planes.map((p) => p.number)) + 1;
    const p: Plane = {
      id: probe.id, number, label: probe.label ?? probe.id, layer: new CutPlaneLayer(this.v.colorMap, this.v.diagonal),
      ox: g.origin[0], oy: g.origin[1], oz: g.origin[2], nx: g.normal[0], ny: g.normal[1], nz: g.normal[2],
      seed: g.region?.seed ? [...g.region.seed] : undefined,
      // a density equal to the reference's (as older sets wrote on every plane) is no override
      ownDensity: typeof f.density === 'number' && f.density !== this.refs.density ? f.density : undefined,
    };
    this.planes.push(p);
    this.v.view.root.add(p.layer.group);
    // the new plane is first drawn with its cut
    this.v.view.holdFrames();
    // no see-through here: a set re-applied on a newly opened file leaves that file's fresh view alone
    this.select(p);
    this.changed();
  }

  /** World position of the current plane's drag knob, or undefined without a plane. */
  knobPosition(): Vec3 | undefined {
    return this.current?.layer.knobPosition;
  }

  /** The velocity and pressure fields chosen for every plane (undefined: found by name). */
  fieldChoice(): { velocity?: string; pressure?: string } {
    const s = this.settings;
    return { ...(s.velocity ? { velocity: s.velocity } : {}), ...(s.pressure ? { pressure: s.pressure } : {}) };
  }

  /** Adds a plane through the middle of the shown geometry, normal along the longest side of its box. */
  add(): void { this.addAt(undefined); }

  /**
   * Adds a plane with its normal along the longest side of the data's box, through the shown geometry's
   * centre, or at `fraction` (0…1) of the data along that side; returns its id.
   */
  addAt(fraction: number | undefined): string {
    const b = this.v.bounds, { center } = this.v.view.extent;
    const sides = [b[1] - b[0], b[3] - b[2], b[5] - b[4]];
    const axis = sides.indexOf(Math.max(...sides));
    const number = Math.max(0, ...this.planes.map((p) => p.number)) + 1;
    const o: Vec3 = [center.x, center.y, center.z];
    if (fraction !== undefined) o[axis] = Number((b[2 * axis]! + fraction * sides[axis]!).toPrecision(6));
    const p: Plane = {
      id: this.freeId(number), number, label: `Plane ${number}`, layer: new CutPlaneLayer(this.v.colorMap, this.v.diagonal),
      ox: o[0], oy: o[1], oz: o[2], nx: axis === 0 ? 1 : 0, ny: axis === 1 ? 1 : 0, nz: axis === 2 ? 1 : 0, seed: undefined,
      ownDensity: undefined,
    };
    this.planes.push(p);
    this.v.view.root.add(p.layer.group);
    // the cut lies inside the walls: let it show through the first time
    if (this.v.settings.opacity === 1) this.v.setSurfaceOpacity(0.35);
    this.select(p);
    this.changed();
    return p.id;
  }

  /** `plane-N`, or the next free number when a loaded set already uses that id. */
  private freeId(n: number): string {
    const used = new Set(this.v.allResults.map((r) => r.id));
    while (used.has(`plane-${n}`)) n++;
    return `plane-${n}`;
  }

  private select(p: Plane | undefined): void {
    this.current = p;
    if (p) this.v.select(p.id);
    for (const q of this.planes) q.layer.setEditing(q === p);
    this.settings.pickingSeed = false;
    this.buildPanel();
  }

  private remove(id: string): void {
    const p = this.planes.find((q) => q.id === id);
    if (!p) return;
    this.v.view.root.remove(p.layer.group);
    p.layer.dispose();
    this.planes = this.planes.filter((q) => q !== p);
    this.v.removeResult(id, false);
    if (this.current === p) this.select(this.planes.at(-1));
    this.v.view.requestRender();
    this.planesChanged();
  }

  /** The current plane moved or changed: redraw its marker, recompute (latest request wins; `live`: a drag step, picture first). */
  private changed(live = false): void {
    const p = this.current;
    if (!p) return;
    const n = Math.hypot(p.nx, p.ny, p.nz);
    if (!(n > 0)) { this.v.banner.error('Cut-plane: the normal (0, 0, 0) has no direction; type a non-zero normal.'); return; }
    p.layer.setPlane([p.ox, p.oy, p.oz], [p.nx, p.ny, p.nz]);
    p.layer.setSeed(p.seed);
    this.settings.slide = (p.ox * p.nx + p.oy * p.ny + p.oz * p.nz) / n;
    for (const c of this.folder.controllersRecursive()) c.updateDisplay();
    // a drag step's marker is drawn with its cut (one frame, the two in step): a frame for the marker
    // alone would be in the way when the cut arrives
    if (!live) this.v.view.requestRender();
    this.request.request(p, live);
    this.planesChanged();
  }

  /** A drag step's picture: the cut redrawn, its numbers still those of the last computed position until they follow. */
  private showDrawing(p: Plane, reply: CutDrawingReply): void {
    if (!this.planes.includes(p)) return;
    p.layer.setTriangles(reply.drawing, !!this.v.colorChoice && !!reply.drawing);
    p.layer.material.setRange(...this.v.colorRange);
    p.layer.material.setColorMap(this.v.colorMap);
    markDrawn(reply, this.v.view.nextFrame());
    this.v.view.releaseFrames();
  }

  private show(p: Plane, reply: CutReply): void {
    if (!this.planes.includes(p)) return;
    p.reply = reply;
    const colored = !!this.v.colorChoice && !!reply.drawing;
    p.layer.setTriangles(reply.drawing, colored);
    p.layer.material.setRange(...this.v.colorRange);
    p.layer.material.setColorMap(this.v.colorMap);
    const density = this.densityOf(p);
    const noise: NoiseContext = { density: density.rho, ...(this.v.description ? { fields: meshMagnitudes(this.v.description.report) } : {}) };
    this.v.setResult(planeResult(p, reply, density.text, noise));
    markDrawn(reply, this.v.view.nextFrame());
    this.v.view.releaseFrames();
  }

  /** Range and map follow the surface's. */
  private applyColorSettings(): void {
    for (const p of this.planes) { p.layer.material.setRange(...this.v.colorRange); p.layer.material.setColorMap(this.v.colorMap); }
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    for (const f of [...this.folder.folders]) f.destroy();
    this.folder.domElement.querySelectorAll('.panel-note').forEach((n) => n.remove());
    const s = this.settings;
    this.folder.add({ add: () => this.add() }, 'add').name('+ new cut-plane');
    const p = this.current;
    if (!p) return;
    if (this.planes.length > 1) {
      const opts: Record<string, string> = {};
      for (const q of this.planes) opts[q.label] = q.id;
      this.folder.add({ which: p.id }, 'which', opts).name('editing').onChange((id: string) => this.select(this.planes.find((q) => q.id === id)));
    }
    const num = (key: 'ox' | 'oy' | 'oz' | 'nx' | 'ny' | 'nz', label: string) =>
      this.folder.add(p, key).name(label).onFinishChange(() => this.changed());
    num('ox', 'origin x [m]'); num('oy', 'origin y [m]'); num('oz', 'origin z [m]');
    num('nx', 'normal x'); num('ny', 'normal y'); num('nz', 'normal z');
    const [lo, hi] = this.slideRange(p);
    this.folder.add(s, 'slide', lo, hi, (hi - lo) / 1000).name('slide along normal [m]').onChange((d: number) => {
      const n = Math.hypot(p.nx, p.ny, p.nz), cur = (p.ox * p.nx + p.oy * p.ny + p.oz * p.nz) / n, k = (d - cur) / n;
      const r6 = (x: number) => Number(x.toPrecision(6));
      p.ox = r6(p.ox + k * p.nx); p.oy = r6(p.oy + k * p.ny); p.oz = r6(p.oz + k * p.nz);
      this.changed(true);
    });
    const own = { on: p.ownDensity !== undefined, value: p.ownDensity ?? this.refs.density };
    const value = this.folder.add(own, 'value').name(`density ρ [${UNITS.density}]`).onFinishChange((x: number) => {
      if (!(x > 0) || !Number.isFinite(x)) { this.v.banner.error(`Cut-plane: the density must be a positive number (got ${x}).`); own.value = p.ownDensity ?? this.refs.density; value.updateDisplay(); return; }
      p.ownDensity = x;
      this.request.request(p, false);
      this.planesChanged();
    }).enable(own.on);
    this.folder.add(own, 'on').name('own density (overrides reference)').onChange((on: boolean) => {
      p.ownDensity = on ? own.value : undefined;
      own.value = p.ownDensity ?? this.refs.density;
      value.enable(on).updateDisplay();
      this.request.request(p, false);
      this.planesChanged();
    });
    const vectors: Record<string, string> = { '(by name)': '' }, scalars: Record<string, string> = { '(by name)': '' };
    for (const f of this.v.fields) (f.components === 3 ? vectors : f.components === 1 ? scalars : {})[`${f.name} (${f.association})`] = `${f.association}:${f.name}`;
    this.folder.add(s, 'velocity', vectors).name('velocity field').onChange(() => this.recomputeAll());
    this.folder.add(s, 'pressure', scalars).name('pressure field').onChange(() => this.recomputeAll());
    this.folder.add(s, 'pickingSeed').name('pick seed on the plane').listen();
    this.folder.add({ clear: () => { p.seed = undefined; this.changed(); } }, 'clear').name('clear seed (whole cut)');
    const note = document.createElement('div');
    note.className = 'panel-note';
    note.textContent = 'Drag the blue knob or the cut to slide the plane. A seed point keeps only the passage it lies in. Flow is positive along the normal.';
    this.folder.domElement.querySelector('.lil-children')?.append(note);
  }

  private slideRange(p: Plane): [number, number] {
    const b = this.v.bounds, n = Math.hypot(p.nx, p.ny, p.nz) || 1;
    let lo = Infinity, hi = -Infinity;
    for (const x of [b[0], b[1]]) for (const y of [b[2], b[3]]) for (const z of [b[4], b[5]]) {
      const d = (x * p.nx + y * p.ny + z * p.nz) / n;
      lo = Math.min(lo, d); hi = Math.max(hi, d);
    }
    return [Number(lo.toPrecision(6)), Number(hi.toPrecision(6))];
  }

  private recomputeAll(): void { for (const p of this.planes) this.request.request(p, false); }

  private pointer() {
    return {
      down: (_ev: PointerEvent, ray: THREE.Raycaster): boolean => {
        const p = this.current;
        if (!p || this.settings.pickingSeed || !p.layer.grabbed(ray)) return false;
        const t0 = p.layer.alongNormal(ray.ray);
        if (t0 === undefined) return false;
        this.drag = { t0, origin: [p.ox, p.oy, p.oz] };
        return true;
      },
      move: (_ev: PointerEvent, ray: THREE.Raycaster): void => {
        const p = this.current, d = this.drag;
        if (!p || !d) return;
        // measure along the normal line through the origin at drag start
        p.layer.setPlane(d.origin, [p.nx, p.ny, p.nz]);
        const t = p.layer.alongNormal(ray.ray);
        if (t === undefined) return;
        const n = p.layer.unitNormal, k = t - d.t0;
        // 6 significant figures: what the panel shows is exactly what is computed
        const r6 = (x: number) => Number(x.toPrecision(6));
        p.ox = r6(d.origin[0] + k * n.x); p.oy = r6(d.origin[1] + k * n.y); p.oz = r6(d.origin[2] + k * n.z);
        this.changed(true);
      },
      up: (): void => { this.drag = undefined; },
      click: (_ev: PointerEvent, ray: THREE.Raycaster): boolean => {
        const p = this.current;
        if (!p || !this.settings.pickingSeed) return false;
        const hit = p.layer.rayHit(ray.ray);
        if (!hit) return false;
        p.seed = [hit.x, hit.y, hit.z];
        this.settings.pickingSeed = false;
        this.changed();
        return true;
      },
    };
  }
}

function planeDoc(p: Plane): PlaneDoc {
  return { origin: [p.ox, p.oy, p.oz], normal: [p.nx, p.ny, p.nz], ...(p.seed ? { region: { seed: [...p.seed] } } : {}) };
}

/** The numbers of a plane for pins, table and exports. */
function planeResult(p: Plane, r: CutReply, densityText: string, noise: NoiseContext): ProbeResult {
  const s = r.integrals;
  const n = r.normal;
  const definition = `origin ${formatVec([p.ox, p.oy, p.oz])} m, normal ${formatVec(n)}` +
    (p.seed ? `, seed ${formatVec(p.seed)} m` : '') + `, ${densityText}`;
  const anchor: Vec3 = s.centroid ? [...s.centroid] : [p.ox, p.oy, p.oz];
  const base = { id: p.id, kind: 'plane' as const, label: p.label, anchor, definition, pinVisible: true };
  if (s.empty) return { ...base, quantities: [], notes: classifyNotes([s.reason ?? 'the plane cuts no cell']) };
  const pres = s.roles.pressure?.replace(/ \((point|cell)\)$/, '');
  const vel = s.roles.velocity?.replace(/ \((point|cell)\)$/, '');
  const q: Quantity[] = [];
  const add = (key: string, label: string, value: number | null | undefined, unit: string, pinned = false) => {
    if (value !== null && value !== undefined) q.push({ key, label, value, unit, pinned });
  };
  add('massFlowRate', 'ṁ', s.massFlowRate, UNITS.massFlow, true);
  add('volumeFlowRate', 'Q', s.volumeFlowRate, UNITS.volumeFlow, true);
  add('area', 'A', s.area, UNITS.area, true);
  if (s.volumeFlowRate !== null && s.area) add('meanNormalVelocity', 'ū·n = Q/A', s.volumeFlowRate / s.area, UNITS.velocity);
  if (pres) {
    const unit = fieldUnit(pres) || UNITS.pressure;
    add('pressureAreaMean', `${pres} area-mean`, s.areaMean[pres] as number, unit);
    add('pressureMassMean', `${pres} mass-mean`, s.massFlowMean[pres] as number, unit);
  }
  if (s.totalPressure) {
    add('totalPressureAreaMean', 'p₀ area-mean', s.totalPressure.areaMean, UNITS.pressure);
    add('totalPressureMassMean', 'p₀ mass-mean', s.totalPressure.massFlowMean, UNITS.pressure, true);
  }
  if (vel) add('velocityMagnitudeMassMean', `|${vel}| mass-mean`, s.magnitudeMassFlowMean[vel], UNITS.velocity);
  add('uniformityIndex', 'uniformity γ', s.uniformityIndex, '');
  if (s.reverseFlow) add('reverseFlowAreaShare', 'reverse-flow area share', s.reverseFlow.areaShare, '');
  const notes = [...s.notes, ...(r.region.length ? [`region: ${r.region.join('; ')}`] : [])];
  return { ...base, quantities: assignNoiseScales('plane', q, { ...noise, roles: { velocity: vel, pressure: pres } }), ...(notes.length ? { notes: classifyNotes(notes) } : {}) };
}
