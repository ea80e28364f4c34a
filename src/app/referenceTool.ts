/**
 * The panel's "Reference conditions" folder: the one place the fluid (preset or custom ρ and μ), the
 * reference speed, area, length and pressure, the drag and lift directions and the moment point are set.
 * Cut-planes, pressure losses, flow splits and the force total read them (a probe may override a value,
 * which it then shows as its own); any change re-evaluates every probe through the listeners.
 */
import type GUI from 'lil-gui';
import type { ReferenceDoc, Vec3 } from '../study/probeSet.ts';
import { FLUID_PRESETS } from '../study/units.ts';
import { UNITS } from '../ui/units.ts';
import {
  CUSTOM_FLUID, choosePreset, conditionsFromDoc, defaultConditions, fluidAfterEdit, liftOf, referenceDoc, type ReferenceConditions,
} from './referenceConditions.ts';
import type { Viewer } from './viewer.ts';

export class ReferenceTool {
  private c: ReferenceConditions = defaultConditions();
  private readonly folder: GUI;
  private readonly listeners: (() => void)[] = [];
  private readonly ruleNote: HTMLDivElement;
  /** What the panel edits (flat numbers for lil-gui); copied into `c` on every edit. */
  private readonly edit = {
    fluid: '', density: 0, viscosity: 0, speed: 0, area: 0, length: 0, pressure: 0,
    dragX: 0, dragY: 0, dragZ: 0, liftFrom: 'rule', liftX: 0, liftY: 0, liftZ: 0, momentX: 0, momentY: 0, momentZ: 0,
  };

  constructor(private readonly v: Viewer) {
    this.folder = v.gui.addFolder('Reference conditions');
    this.ruleNote = document.createElement('div');
    this.ruleNote.className = 'panel-note reference-lift-rule';
    this.build();
    // the lift rule reads the mesh's extents: a new file may change it
    v.onDataset(() => { this.sync(); if (this.c.liftFrom === 'rule') this.emit(); });
  }

  /** Called after every change of a reference value. */
  onChange(f: () => void): void { this.listeners.push(f); }

  /** The conditions now (a copy). */
  get conditions(): ReferenceConditions { return { ...this.c, drag: [...this.c.drag], lift: [...this.c.lift], momentPoint: [...this.c.momentPoint] }; }

  /** ρ (kg/m³). */
  get density(): number { return this.c.density; }

  /** The lift direction in use and the rule's sentence when derived. */
  lift(): { direction: Vec3; rule: string | null } { return liftOf(this.c, this.v.bounds); }

  /** The probe set's `reference` member (see `referenceDoc`). */
  doc(): ReferenceDoc { return referenceDoc(this.c, this.v.bounds); }

  /** Replaces the conditions (from a probe set, or an undo); tells the listeners when `notify`. */
  set(c: ReferenceConditions, notify = true): void {
    this.c = { ...c };
    this.sync();
    if (notify) this.emit();
  }

  /** Takes a probe set's reference values (members it leaves out start from the defaults). */
  setFromDoc(doc: ReferenceDoc | undefined, notify = true): void {
    this.set(conditionsFromDoc(doc, defaultConditions()), notify);
  }

  private emit(): void { for (const f of this.listeners) f(); }

  /** Copies the conditions into the panel. */
  private sync(): void {
    const c = this.c, e = this.edit;
    e.fluid = c.fluid; e.density = c.density; e.viscosity = c.viscosity; e.speed = c.speed; e.area = c.area; e.length = c.length; e.pressure = c.pressure;
    [e.dragX, e.dragY, e.dragZ] = c.drag;
    e.liftFrom = c.liftFrom;
    [e.liftX, e.liftY, e.liftZ] = this.lift().direction;
    [e.momentX, e.momentY, e.momentZ] = c.momentPoint;
    for (const k of this.folder.controllersRecursive()) {
      k.updateDisplay();
      if (/^lift direction [xyz]$/.test(k._name)) k.enable(c.liftFrom === 'set');
    }
    const rule = this.lift().rule;
    this.ruleNote.textContent = rule ? `${rule[0]!.toUpperCase()}${rule.slice(1)}.` : 'Lift direction set by hand.';
  }

  /** Reads the panel back after an edit of `key`. */
  private edited(key: keyof ReferenceTool['edit']): void {
    const e = this.edit;
    let c: ReferenceConditions = { ...this.c };
    if (key === 'fluid') c = choosePreset(c, e.fluid);
    else {
      c.density = e.density; c.viscosity = e.viscosity; c.speed = e.speed; c.area = e.area; c.length = e.length; c.pressure = e.pressure;
      c.drag = [e.dragX, e.dragY, e.dragZ];
      c.liftFrom = e.liftFrom === 'set' ? 'set' : 'rule';
      // switching to "set" starts from the direction the rule gave
      if (key === 'liftFrom' && c.liftFrom === 'set') c.lift = liftOf(this.c, this.v.bounds).direction;
      else if (c.liftFrom === 'set') c.lift = [e.liftX, e.liftY, e.liftZ];
      c.momentPoint = [e.momentX, e.momentY, e.momentZ];
      if (key === 'density' || key === 'viscosity') c.fluid = fluidAfterEdit(c);
    }
    const problem = invalid(c);
    if (problem) { this.v.banner.error(`Reference conditions: ${problem}`); this.sync(); return; }
    this.set(c);
  }

  private build(): void {
    const f = this.folder, e = this.edit;
    const fluids: Record<string, string> = {};
    for (const p of FLUID_PRESETS) fluids[p.label] = p.id;
    fluids['custom (type ρ and μ)'] = CUSTOM_FLUID;
    const num = (key: keyof ReferenceTool['edit'], label: string) => f.add(e, key).name(label).onFinishChange(() => this.edited(key));
    f.add(e, 'fluid', fluids).name('fluid').onChange(() => this.edited('fluid'));
    num('density', `ref. density ρ [${UNITS.density}]`);
    num('viscosity', `viscosity μ [${UNITS.viscosity}]`);
    num('speed', 'ref. speed U [m/s]');
    num('area', `ref. area A [${UNITS.area}]`);
    num('length', 'ref. length L [m]');
    num('pressure', `ref. pressure [${UNITS.pressure}]`);
    num('dragX', 'drag direction x'); num('dragY', 'drag direction y'); num('dragZ', 'drag direction z');
    f.add(e, 'liftFrom', { 'by the stated rule': 'rule', 'set by hand': 'set' }).name('lift direction from').onChange(() => this.edited('liftFrom'));
    num('liftX', 'lift direction x'); num('liftY', 'lift direction y'); num('liftZ', 'lift direction z');
    num('momentX', 'moment point x [m]'); num('momentY', 'moment point y [m]'); num('momentZ', 'moment point z [m]');
    f.domElement.querySelector('.lil-children')?.append(this.ruleNote);
    this.sync();
  }
}

/** Why conditions cannot be used, or null. */
function invalid(c: ReferenceConditions): string | null {
  const pos: [string, number][] = [['density ρ', c.density], ['speed U', c.speed], ['area A', c.area], ['length L', c.length]];
  for (const [name, v] of pos) if (!(v > 0) || !Number.isFinite(v)) return `the reference ${name} must be a positive number (got ${v})`;
  if (!(c.viscosity >= 0) || !Number.isFinite(c.viscosity)) return `the viscosity μ must be zero or positive (got ${c.viscosity})`;
  if (!Number.isFinite(c.pressure)) return `the reference pressure must be a number (got ${c.pressure})`;
  if (!(Math.hypot(...c.drag) > 0)) return 'the drag direction (0, 0, 0) has no direction';
  if (c.liftFrom === 'set') {
    const n = Math.hypot(...c.lift), d = Math.hypot(...c.drag);
    const cos = Math.abs(c.lift[0] * c.drag[0] + c.lift[1] * c.drag[1] + c.lift[2] * c.drag[2]) / (n * d);
    if (!(n > 0)) return 'the lift direction (0, 0, 0) has no direction';
    if (cos > 0.999) return 'the lift direction lies along the drag direction; set one across it';
  }
  return null;
}
