/**
 * Iso-surfaces in the view: choose a field (a file array, a derived field, a vector's magnitude or one
 * component), a value and a field to colour by; the worker evaluates the `iso` probe (the study layer's
 * evaluator, so the numbers are the `iso-surface` verb's) and sends its triangles. Each surface is drawn
 * coloured by its own range of the colour field, with its area and enclosed volume (or why it is open)
 * pinned beside it. The surfaces are probes of the probe set: saved, restored, undone and re-evaluated on a
 * new file like the others.
 */
import type GUI from 'lil-gui';
import { DERIVED_FIELDS } from '../derive/derivedFields.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type IsoProbe, type Probe } from '../study/probeSet.ts';
import { withUnit } from '../ui/format.ts';
import { unitLabel } from '../study/units.ts';
import { IsoSurfaceLayer } from '../view/isoSurfaceLayer.ts';
import { outcomeResult } from './outcomeResult.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

/** Pin keys of an iso-surface, in order. */
const PINNED = ['area', 'volume', 'colour.mean'];

/** Colour-by choice meaning none. */
const NONE = '(none)';

interface Shown { probe: IsoProbe; layer: IsoSurfaceLayer }

export class IsoTool {
  private readonly shown = new Map<string, Shown>();
  private readonly folder: GUI;
  private readonly form = { field: '', value: 0, colourBy: NONE };
  private generation = 0;

  constructor(private readonly v: Viewer, private readonly refs: ReferenceTool) {
    this.folder = v.gui.addFolder('Iso-surfaces');
    v.onDataset(() => this.buildPanel());
    v.onResultRemoved((id) => this.drop(id));
    v.onRename((id, label) => { const s = this.shown.get(id); if (s) s.probe.label = label; });
    v.onColorSettings(() => { for (const s of this.shown.values()) s.layer.material.setColorMap(v.colorMap); v.view.requestRender(); });
    this.buildPanel();
  }

  /** The field specs the panel offers: scalars, vectors by magnitude and component, and the derived scalars. */
  private specs(): string[] {
    const out: string[] = [];
    for (const f of this.v.fields) {
      const name = out.includes(f.name) ? `${f.association}:${f.name}` : f.name;
      out.push(name);
      if (f.components === 3) out.push(`${name}_x`, `${name}_y`, `${name}_z`);
    }
    for (const [name, d] of Object.entries(DERIVED_FIELDS)) if (d.components === 1 && !out.includes(name)) out.push(name);
    return out;
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    const specs = this.specs();
    if (!specs.includes(this.form.field)) this.form.field = specs[0] ?? '';
    if (![NONE, ...specs].includes(this.form.colourBy)) this.form.colourBy = NONE;
    const fieldCtl = this.folder.add(this.form, 'field', specs).name('field');
    fieldCtl.onChange(() => this.suggestValue());
    this.folder.add(this.form, 'value').name('value');
    this.folder.add(this.form, 'colourBy', [NONE, ...specs]).name('colour by');
    this.folder.add({ add: () => void this.addNew() }, 'add').name('add iso-surface');
    this.suggestValue();
  }

  /** The middle of the chosen file field's range, as a first value (derived fields keep the typed value). */
  private suggestValue(): void {
    const base = this.form.field.replace(/^(point|cell):/, '').replace(/_(x|y|z)$/, '');
    const f = this.v.fields.find((x) => x.name === base);
    if (f?.range && f.components === 1) this.form.value = Number(((f.range[0] + f.range[1]) / 2).toPrecision(4));
    for (const c of this.folder.controllers) c.updateDisplay();
  }

  private freeId(): string {
    let n = 1;
    while (this.shown.has(`iso-${n}`)) n++;
    return `iso-${n}`;
  }

  /** Adds the surface the panel describes. */
  async addNew(): Promise<void> {
    if (!this.v.description) return;
    if (!this.form.field) { this.v.banner.error('Iso-surface: the file has no field to draw an iso-surface of.'); return; }
    if (!Number.isFinite(this.form.value)) { this.v.banner.error(`Iso-surface: the value must be a finite number, got ${this.form.value}`); return; }
    const id = this.freeId();
    const probe: IsoProbe = {
      id, kind: 'iso', label: `${this.form.field} = ${this.form.value}`,
      geometry: { field: this.form.field, value: this.form.value },
      ...(this.form.colourBy !== NONE ? { fields: { colourBy: this.form.colourBy } } : {}),
    };
    await this.addFrom(probe);
    this.v.select(id);
  }

  /** Whether the tool can hold a probe of a set. */
  accepts(p: Probe): p is IsoProbe { return p.kind === 'iso'; }

  /** Shows a probe of a set (or a new one) and evaluates it. */
  async addFrom(p: Probe): Promise<void> {
    if (!this.accepts(p)) return;
    const probe: IsoProbe = structuredClone(p);
    const layer = new IsoSurfaceLayer(this.v.colorMap);
    this.shown.set(probe.id, { probe, layer });
    this.v.view.root.add(layer.group);
    await this.evaluate(probe.id, this.generation);
  }

  private async evaluate(id: string, gen: number): Promise<void> {
    const s = this.shown.get(id);
    if (!s) return;
    try {
      const reply = await this.v.track(this.v.compute.isoSurface({ format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION, reference: this.refs.doc(), probes: [s.probe] }));
      if (gen !== this.generation || this.shown.get(id) !== s) return;
      const o = reply.evaluation.probes[0]!;
      s.layer.setTriangles(reply.drawing, !!s.probe.fields?.colourBy && !!reply.drawing, reply.drawing?.range);
      const b = this.v.bounds, centre: [number, number, number] = [(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2];
      // The pin says whether the volume is given, and what the surface's colours span (its own range).
      const q = (k: string) => o.quantities.find((x) => x.key === k);
      const lo = q('colour.min'), hi = q('colour.max');
      const colours = lo && hi ? `; colours ${s.probe.fields?.colourBy}: ${withUnit(lo.value, unitLabel(lo.unit))} … ${withUnit(hi.value, unitLabel(hi.unit))}` : '';
      const state = o.notes.find((n) => n.startsWith('open') || n.startsWith('closed')) ?? '';
      this.v.setResult(outcomeResult(o, centre, { pinned: PINNED, origin: ' — iso-surface tool', ...(o.ok ? { tag: `${state}${colours}` } : {}) }));
      this.v.view.requestRender();
    } catch (e) {
      this.v.banner.error(`Iso-surface: ${(e as Error).message}`);
    }
  }

  /** The iso probes shown, for the probe set. */
  probes(): IsoProbe[] {
    return [...this.shown.values()].map((s) => structuredClone(s.probe));
  }

  private drop(id: string): void {
    const s = this.shown.get(id);
    if (!s) return;
    this.v.view.root.remove(s.layer.group);
    s.layer.dispose();
    this.shown.delete(id);
    this.v.view.requestRender();
  }

  /** Removes every surface (and its result). */
  removeAll(): void {
    this.generation++;
    for (const id of [...this.shown.keys()]) { this.drop(id); this.v.removeResult(id, false); }
  }
}
