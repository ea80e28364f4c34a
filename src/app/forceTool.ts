/**
 * Force total over surfaces picked in the view (click a surface to add or remove it): pressure and
 * viscous force, moment and coefficients on the reference values typed in the panel.
 */
import type GUI from 'lil-gui';
import type * as THREE from 'three';
import type { ForceReply, Vec3 } from '../../workers/api.ts';
import type { ResolvedReference } from '../study/evaluate.ts';
import type { ForceProbe, Probe, ReferenceDoc } from '../study/probeSet.ts';
import { formatNumber, formatVec } from '../ui/format.ts';
import { openSurfaceNote } from '../surface/surfaceQuality.ts';
import { classifyNotes } from '../ui/notes.ts';
import type { ProbeResult, Quantity } from '../ui/results.ts';
import { assignNoiseScales } from '../ui/roundingNoise.ts';
import { UNITS } from '../ui/units.ts';
import { DEFAULT_DENSITY } from './planeTool.ts';
import { latestWins } from './latestWins.ts';
import type { Viewer } from './viewer.ts';

/** Id of the force total when the user starts one in the view. */
const ID = 'force-1';

export class ForceTool {
  private readonly selected = new Set<number>();
  private readonly folder: GUI;
  private readonly refs = {
    rho: DEFAULT_DENSITY, speed: 1, area: 1, length: 1, mu: 0, referencePressure: 0,
    dragX: 1, dragY: 0, dragZ: 0, liftX: 0, liftY: 0, liftZ: 1, momentX: 0, momentY: 0, momentZ: 0,
  };
  private readonly request;
  private chosen: GUI['controllers'][number] | undefined;
  private readonly chosenText = { surfaces: '(click surfaces in the view)' };
  /** Id and label of the force total (a loaded probe set may name it). */
  private id = ID;
  private label = 'Force total';

  constructor(private readonly v: Viewer) {
    this.folder = v.gui.addFolder('Force total');
    this.request = latestWins(
      (groups: number[]) => v.track(v.compute.forces({
        groups, rho: this.refs.rho, speed: this.refs.speed, area: this.refs.area, length: this.refs.length, mu: this.refs.mu, referencePressure: this.refs.referencePressure,
        dragDirection: [this.refs.dragX, this.refs.dragY, this.refs.dragZ], liftDirection: [this.refs.liftX, this.refs.liftY, this.refs.liftZ],
        momentPoint: [this.refs.momentX, this.refs.momentY, this.refs.momentZ],
      })),
      (reply) => { if (this.selected.size) v.setResult(forceResult(reply, this.refs, this.id, this.label)); },
      (e) => v.banner.error(`Force total: ${(e as Error).message}`),
    );
    v.onDataset(() => { this.selected.clear(); this.id = ID; this.label = 'Force total'; this.buildPanel(); });
    v.onResultRemoved((id) => { if (id === this.id) this.clear(); });
    v.addPointerTool({ click: (_ev, ray) => this.click(ray) });
    this.buildPanel();
  }

  /** Adds or removes a surface group from the total. */
  toggle(group: number): void {
    if (this.selected.has(group)) this.selected.delete(group); else this.selected.add(group);
    this.v.surface?.setGroupSelected(group, this.selected.has(group));
    this.updateChosen();
    this.v.view.requestRender();
    this.recompute();
  }

  /** Drops the force total (no surfaces chosen). */
  clear(): void {
    for (const g of this.selected) this.v.surface?.setGroupSelected(g, false);
    this.selected.clear();
    this.updateChosen();
    this.v.removeResult(this.id, false);
    this.id = ID;
    this.label = 'Force total';
    this.v.view.requestRender();
  }

  /** True when a probe-set probe is a force total this tool can hold (surfaces found by name or id, no other options). */
  accepts(p: Probe): p is ForceProbe {
    if (p.kind !== 'force' || p.fields && Object.keys(p.fields).length) return false;
    const o = p.options ?? {};
    if (Object.keys(o).some((k) => k !== 'reference')) return false;
    return this.resolve(p.geometry.surfaces) !== undefined;
  }

  private resolve(refs: readonly (string | number)[]): number[] | undefined {
    const groups = this.v.description?.groups ?? [];
    const out: number[] = [];
    for (const r of refs) {
      const byName = groups.filter((g) => g.name === String(r));
      const g = byName.length === 1 ? byName[0] : byName.length === 0 && /^-?\d+$/.test(String(r)) ? groups.find((x) => x.fileId === Number(r)) : undefined;
      if (!g) return undefined;
      out.push(g.id);
    }
    return out;
  }

  /** The force total as a probe-set probe (surfaces by name), or null when no surface is chosen. */
  probe(): ForceProbe | null {
    if (this.selected.size === 0) return null;
    const names = (this.v.description?.groups ?? []).filter((g) => this.selected.has(g.id)).map((g) => g.name);
    return { id: this.id, kind: 'force', label: this.label, geometry: { surfaces: names } };
  }

  /** The reference values typed in the panel (SI; μ only when given). */
  reference(): ReferenceDoc {
    const r = this.refs;
    return {
      density: r.rho, speed: r.speed, area: r.area, length: r.length, pressure: r.referencePressure, ...(r.mu > 0 ? { viscosity: r.mu } : {}),
      dragDirection: [r.dragX, r.dragY, r.dragZ], liftDirection: [r.liftX, r.liftY, r.liftZ], momentPoint: [r.momentX, r.momentY, r.momentZ],
    };
  }

  /** Takes reference values (a probe set's, preset applied) into the panel. */
  setReference(ref: ResolvedReference): void {
    const r = this.refs;
    if (ref.density !== undefined) r.rho = ref.density;
    if (ref.speed !== undefined) r.speed = ref.speed;
    if (ref.area !== undefined) r.area = ref.area;
    if (ref.length !== undefined) r.length = ref.length;
    if (ref.pressure !== undefined) r.referencePressure = ref.pressure;
    r.mu = ref.viscosity ?? 0;
    if (ref.dragDirection) [r.dragX, r.dragY, r.dragZ] = ref.dragDirection;
    if (ref.liftDirection) [r.liftX, r.liftY, r.liftZ] = ref.liftDirection;
    if (ref.momentPoint) [r.momentX, r.momentY, r.momentZ] = ref.momentPoint;
    for (const c of this.folder.controllersRecursive()) c.updateDisplay();
  }

  /** Starts the force total of a probe-set probe (see `accepts`), keeping its id and label. */
  setFrom(p: ForceProbe): void {
    this.clear();
    this.id = p.id;
    this.label = p.label ?? p.id;
    for (const g of this.resolve(p.geometry.surfaces) ?? []) this.toggle(g);
  }

  private recompute(): void {
    if (this.selected.size === 0) { this.v.removeResult(this.id, false); return; }
    this.request.request([...this.selected].sort((a, b) => a - b));
  }

  private click(ray: THREE.Raycaster): boolean {
    const hit = this.v.surface?.pick(ray);
    if (!hit) return false;
    this.toggle(hit.group);
    return true;
  }

  private updateChosen(): void {
    const names = (this.v.description?.groups ?? []).filter((g) => this.selected.has(g.id)).map((g) => g.name);
    this.chosenText.surfaces = names.length ? names.join(', ') : '(click surfaces in the view)';
    this.chosen?.updateDisplay();
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    this.chosen = this.folder.add(this.chosenText, 'surfaces').name('surfaces').disable();
    const groups = this.v.description?.groups ?? [];
    // with many parts, clicking in the view is the way to choose; a long list of boxes would bury the rest
    for (const g of groups.length <= 8 ? groups : []) {
      // reads the selection live, so clicks in the view show here too
      const sel = this.selected, o = { get on() { return sel.has(g.id); }, set on(_v: boolean) { /* set by onChange */ } };
      this.folder.add(o, 'on').name(`include ${g.name}`).onChange(() => this.toggle(g.id)).listen();
    }
    const r = this.refs, go = () => this.recompute();
    const add = (k: keyof typeof r, label: string) => this.folder.add(r, k).name(label).onFinishChange(go);
    add('rho', `ref. density ρ [${UNITS.density}]`);
    add('speed', 'ref. speed U [m/s]');
    add('area', `ref. area A [${UNITS.area}]`);
    add('length', 'ref. length L [m]');
    add('referencePressure', `ref. pressure [${UNITS.pressure}]`);
    add('mu', `viscosity μ [${UNITS.viscosity}] (0: file array only)`);
    add('dragX', 'drag direction x'); add('dragY', 'drag direction y'); add('dragZ', 'drag direction z');
    add('liftX', 'lift direction x'); add('liftY', 'lift direction y'); add('liftZ', 'lift direction z');
    add('momentX', 'moment point x [m]'); add('momentY', 'moment point y [m]'); add('momentZ', 'moment point z [m]');
    this.updateChosen();
  }
}

/** The numbers of a force total for pins, table and exports. */
function forceResult(reply: ForceReply, refs: { rho: number; speed: number; area: number }, id: string, label: string): ProbeResult {
  const f = reply.result, c = f.coefficients;
  const q: Quantity[] = [];
  const add = (key: string, label: string, value: number | null | undefined, unit: string, pinned = false) => {
    if (value !== null && value !== undefined) q.push({ key, label, value, unit, pinned });
  };
  add('CD', 'C_D', c?.drag, '', true);
  add('dragForce', 'F_drag', f.components.total.drag, UNITS.force, true);
  add('dragPressure', 'F_drag pressure', f.components.pressure.drag, UNITS.force);
  add('dragViscous', 'F_drag viscous', f.components.viscous?.drag, UNITS.force);
  add('CL', 'C_L', c?.lift, '', true);
  add('liftForce', 'F_lift', f.components.total.lift, UNITS.force);
  add('sideForce', 'F_side', f.components.total.side, UNITS.force);
  add('CDpressure', 'C_D pressure part', c?.pressure.drag, '');
  add('CDviscous', 'C_D viscous part', c?.viscous?.drag, '');
  add('CS', 'C_S (side)', c?.side, '');
  for (const [k, i] of [['x', 0], ['y', 1], ['z', 2]] as const) add(`force${k.toUpperCase()}`, `F_${k}`, f.force[i], UNITS.force);
  for (const [k, i] of [['x', 0], ['y', 1], ['z', 2]] as const) add(`moment${k.toUpperCase()}`, `M_${k}`, f.moment[i], UNITS.moment);
  add('wettedArea', 'wetted area', f.area, UNITS.area);
  const definition = `${reply.groupNames.join(' + ')}; ρ = ${formatNumber(refs.rho)} kg/m³, U = ${formatNumber(refs.speed)} m/s, ` +
    `A = ${formatNumber(refs.area)} m², drag ${formatVec(f.directions.drag)}, lift ${formatVec(f.directions.lift)}; viscous part: ${f.viscous.method}`;
  const notes = classifyNotes(f.notes);
  const open = openSurfaceNote(reply.surface);
  if (open) notes.unshift({ level: 'warning', text: open });
  return {
    id, kind: 'force', label, anchor: reply.centroid as Vec3, definition, quantities: assignNoiseScales('force', q), pinVisible: true,
    ...(notes.length ? { notes } : {}),
  };
}
