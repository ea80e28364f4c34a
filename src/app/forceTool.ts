/**
 * Force total over surfaces picked in the view (click a surface to add or remove it): pressure and
 * viscous force, moment and coefficients on the reference conditions (`referenceTool.ts`), evaluated by
 * the study layer's force evaluator in the worker (the command line's path, so the numbers are the
 * `force` verb's). The viscous part is an explicit choice — the file's wall-shear array, the velocity
 * gradient with μ of the reference conditions, or none — and the pin says which; the lift direction is
 * the reference conditions' (set, or derived by the stated rule, which the result then states). Surfaces
 * can also be chosen by what they are (name, a box holding them, an area range: `groupChoice.ts`); the probe
 * set then keeps that selector rather than the groups' names or ids.
 */
import { SHEAR_NAME } from '../surface/surfaceLoads.ts';
import type GUI from 'lil-gui';
import type * as THREE from 'three';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type ForceProbe, type Probe, type ReferenceDoc, type SurfaceRef } from '../study/probeSet.ts';
import type { ResultNote } from '../ui/notes.ts';
import { describeSelector, type GroupSelector } from '../surface/groupSelect.ts';
import { groupIdsOf, groupRef } from './groupChoice.ts';
import { addGroupChoice, emptyChoice } from './groupChoiceFolder.ts';
import { latestWins } from './latestWins.ts';
import { outcomeResult } from './outcomeResult.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

/** Id of the force total when the user starts one in the view. */
const ID = 'force-1';

/** How the viscous part is got (the probe set's `options.viscous`, never `auto` from the app). */
export type ViscousChoice = 'wall-shear' | 'gradient' | 'none';

/** Wall-shear arrays by name, as the force evaluator finds them (src/surface/surfaceLoads.ts). */
const VELOCITY_NAME = /^(velocity|velocities|u|vel|flow[ _-]?velocity)$/i;

/** Pin keys of a force total, in order. */
const PINNED = ['CD', 'force.drag', 'CL'];

export class ForceTool {
  private readonly selected = new Set<number>();
  private readonly folder: GUI;
  private readonly request;
  private chosen: GUI['controllers'][number] | undefined;
  private readonly chosenText = { surfaces: '(click surfaces in the view)' };
  /** Id and label of the force total (a loaded probe set may name it). */
  private id = ID;
  private label = 'Force total';
  private readonly viscous = { method: 'none' as ViscousChoice };
  /** The "by what they are" fields. */
  private readonly choice = emptyChoice();
  /** Reference values this force total overrides (from a loaded probe set's `options.reference`). */
  private override: ReferenceDoc | undefined;
  /** The surfaces as a loaded set named them, written back while the selection is still theirs. */
  private loadedRefs: { refs: SurfaceRef[]; groups: string } | undefined;

  constructor(private readonly v: Viewer, private readonly refs: ReferenceTool) {
    this.folder = v.gui.addFolder('Force total');
    this.request = latestWins(
      (probe: ForceProbe) => v.track(v.compute.evaluateProbeSet({ format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION, reference: refs.doc(), probes: [probe] })),
      (ev) => { const o = ev.probes[0]; if (o && this.selected.size && o.id === this.id) v.setResult(this.result(o)); },
      (e) => v.banner.error(`Force total: ${(e as Error).message}`),
    );
    v.onDataset(() => {
      this.selected.clear(); this.id = ID; this.label = 'Force total'; this.override = undefined;
      this.viscous.method = this.defaultViscous();
      this.buildPanel();
    });
    v.onResultRemoved((id) => { if (id === this.id) this.clear(); });
    v.onRename((id, label) => { if (id === this.id) this.label = label; });
    v.addPointerTool({ click: (_ev, ray) => this.click(ray) });
    refs.onChange(() => this.recompute());
    // the group rows and the chosen list show the groups' labels
    v.groupLabels.onChange(() => this.buildPanel());
    this.buildPanel();
  }

  /** The wall-shear array of the open file (3 components, named like one), if any. */
  private shearArray(): string | undefined {
    return this.v.fields.find((f) => f.components === 3 && SHEAR_NAME.test(f.name))?.name;
  }

  /** The file's wall-shear array when it has one, else the velocity gradient when it has a velocity, else none. */
  private defaultViscous(): ViscousChoice {
    if (this.shearArray()) return 'wall-shear';
    return this.v.fields.some((f) => f.components === 3 && VELOCITY_NAME.test(f.name)) ? 'gradient' : 'none';
  }

  /** The viscous method in words, for the pin. */
  private viscousText(): string {
    switch (this.viscous.method) {
      case 'wall-shear': return `viscous: wall-shear array "${this.shearArray() ?? '?'}"`;
      case 'gradient': return `viscous: velocity gradient, μ = ${Number((this.override?.viscosity ?? this.refs.conditions.viscosity).toPrecision(6))} Pa·s`;
      default: return 'viscous: none (pressure force only)';
    }
  }

  private result(o: Parameters<typeof outcomeResult>[0]) {
    const notes: ResultNote[] = [];
    if (this.override) notes.push({ level: 'info', text: `own reference values override the reference conditions: ${JSON.stringify(this.override)}` });
    return outcomeResult(o, [0, 0, 0], { pinned: PINNED, origin: '', notes, tag: this.viscousText() });
  }

  /** Adds or removes a surface group from the total. */
  toggle(group: number): void {
    if (this.selected.has(group)) this.selected.delete(group); else this.selected.add(group);
    this.v.surface?.setGroupSelected(group, this.selected.has(group));
    if (this.selected.size) this.v.select(this.id);
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
    this.override = undefined;
    this.loadedRefs = undefined;
    this.v.view.requestRender();
  }

  /** True when a probe-set probe is a force total this tool can hold (surfaces found by name or id; a viscous method and own reference values allowed, no other options). */
  accepts(p: Probe): p is ForceProbe {
    if (p.kind !== 'force' || p.fields && Object.keys(p.fields).length) return false;
    const o = p.options ?? {};
    if (Object.keys(o).some((k) => k !== 'reference' && k !== 'viscous')) return false;
    if (o.viscous === 'wall-shear' && !this.shearArray()) return false;
    return this.resolve(p.geometry.surfaces) !== undefined;
  }

  /** Group ids of references by name, id or selector (`groupIdsOf`). */
  private resolve(refs: readonly SurfaceRef[]): number[] | undefined {
    return groupIdsOf(this.v.description?.groups ?? [], refs);
  }

  /** The force total as a probe-set probe (surfaces by name, or by id where names repeat), or null when no surface is chosen. */
  probe(): ForceProbe | null {
    if (this.selected.size === 0) return null;
    const groups = this.v.description?.groups ?? [];
    const same = this.loadedRefs && this.loadedRefs.groups === [...this.selected].sort((a, b) => a - b).join(',');
    const surfaces = same ? [...this.loadedRefs!.refs] : groups.filter((g) => this.selected.has(g.id))
      .map((g) => groupRef(groups, g));
    return {
      id: this.id, kind: 'force', label: this.label, geometry: { surfaces },
      options: { viscous: this.viscous.method, ...(this.override ? { reference: { ...this.override } } : {}) },
    };
  }

  /** Starts the force total of a probe-set probe (see `accepts`), keeping its id, label, viscous method and own reference values. */
  setFrom(p: ForceProbe): void {
    this.clear();
    this.id = p.id;
    this.label = p.label ?? p.id;
    const m = p.options?.viscous;
    this.viscous.method = m === 'wall-shear' || m === 'gradient' || m === 'none' ? m : this.defaultViscous();
    this.override = p.options?.reference ? { ...p.options.reference } : undefined;
    for (const c of this.folder.controllersRecursive()) c.updateDisplay();
    const ids = this.resolve(p.geometry.surfaces) ?? [];
    this.loadedRefs = { refs: [...p.geometry.surfaces], groups: [...new Set(ids)].sort((a, b) => a - b).join(',') };
    for (const g of ids) this.toggle(g);
  }

  private recompute(): void {
    const p = this.probe();
    if (!p) { this.v.removeResult(this.id, false); return; }
    this.request.request(p);
  }

  /** Chooses the surfaces a selector picked (replacing the chosen ones); the set keeps the selector. */
  private chooseBy(selector: GroupSelector, ids: number[]): void {
    const { id, label, override } = this;
    this.clear();
    this.id = id; this.label = label; this.override = override;
    this.loadedRefs = { refs: [selector], groups: ids.join(',') };
    for (const g of ids) this.toggle(g);
  }

  private click(ray: THREE.Raycaster): boolean {
    const hit = this.v.surface?.pick(ray);
    if (!hit) return false;
    this.toggle(hit.group);
    return true;
  }

  private updateChosen(): void {
    const names = (this.v.description?.groups ?? []).filter((g) => this.selected.has(g.id)).map((g) => this.v.groupLabel(g));
    // surfaces chosen by what they are say so: the set keeps that, not these names
    const selectors = this.loadedRefs && this.loadedRefs.groups === [...this.selected].sort((a, b) => a - b).join(',')
      ? this.loadedRefs.refs.filter((r): r is GroupSelector => typeof r === 'object') : [];
    this.chosenText.surfaces = names.length ? names.join(', ') + selectors.map((r) => ` (${describeSelector(r)})`).join('') : '(click surfaces in the view)';
    this.chosen?.updateDisplay();
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    for (const f of [...this.folder.folders]) f.destroy();
    this.folder.domElement.querySelectorAll('.panel-note').forEach((n) => n.remove());
    this.chosen = this.folder.add(this.chosenText, 'surfaces').name('surfaces').disable();
    const groups = this.v.description?.groups ?? [];
    // with many parts, clicking in the view is the way to choose; a long list of boxes would bury the rest
    for (const g of groups.length <= 8 ? groups : []) {
      // reads the selection live, so clicks in the view show here too
      const sel = this.selected, o = { get on() { return sel.has(g.id); }, set on(_v: boolean) { /* set by onChange */ } };
      this.folder.add(o, 'on').name(`include ${this.v.groupLabel(g)}`).onChange(() => this.toggle(g.id)).listen();
    }
    const methods: Record<string, ViscousChoice> = {};
    const shear = this.shearArray();
    if (shear || this.viscous.method === 'wall-shear') methods[`file's wall-shear array${shear ? ` "${shear}"` : ''}`] = 'wall-shear';
    methods['velocity gradient with μ (reference)'] = 'gradient';
    methods['none (pressure force only)'] = 'none';
    this.folder.add(this.viscous, 'method', methods).name('viscous part').onChange(() => this.recompute());
    addGroupChoice(this.folder, this.choice, 'choose matching surfaces', () => this.v.description?.groups ?? [],
      (sel, ids) => this.chooseBy(sel, ids), (m) => this.v.banner.error(`Force total: ${m}`));
    const note = document.createElement('div');
    note.className = 'panel-note';
    note.textContent = 'ρ, U, A, L, μ, p_ref, drag and lift directions and the moment point come from Reference conditions.';
    this.folder.domElement.querySelector('.lil-children')?.append(note);
    this.updateChosen();
  }
}
