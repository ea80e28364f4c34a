/**
 * Wall quantities on a surface group: colour the group by |τ_w|, c_f or y⁺ (other surfaces grey) and pin
 * its statistics — area-weighted mean, min and max, the area share above editable y⁺ thresholds — with a
 * y⁺ histogram in the panel. τ_w comes from the file's wall-shear array or from the second-order velocity
 * gradient with μ of the reference conditions (the panel and the pin say which, as the core reports it);
 * ρ, U and μ are the reference conditions'. A pinned group is a `wall` probe of the probe set, evaluated
 * by the study layer (the `wall` verb's numbers), so it is saved, restored and undone with the set.
 */
import type GUI from 'lil-gui';
import type { WallReply, WallRequest } from '../../workers/api.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type Probe, type WallProbe } from '../study/probeSet.ts';
import { histogramSvg } from '../ui/wallHistogram.ts';
import type { FieldSource, ResolvedColour, SourceEntry } from './fieldSource.ts';
import { latestWinsPerKey } from './latestWins.ts';
import { outcomeResult } from './outcomeResult.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

/** Chooser keys of the wall quantities: `wall:<quantity>` on the panel's group. */
const KEY = 'wall:';

type Quantity = WallRequest['quantity'];

/** Panel labels, legend titles and units of the quantities. */
const QUANTITIES: Record<Quantity, { label: string; title: string; unit: string }> = {
  shear: { label: '|τ_w| wall shear [Pa]', title: '|τ_w|', unit: 'Pa' },
  cf: { label: 'c_f skin friction', title: 'c_f', unit: '' },
  yplus: { label: 'y+', title: 'y+', unit: '' },
};

/** Defaults of the panel: y⁺ thresholds 1 and 5 (common practice: the viscous sublayer and its edge), 10 bins. */
export const WALL_PANEL_DEFAULTS = { thresholds: [1, 5], bins: 10, wallDistance: 'cell-centroid', shearFrom: 'auto' } as const;

/** A pinned group's probe as the tool keeps it. */
interface WallPin { id: string; label: string; surfaces: (string | number)[]; thresholds: number[]; wallDistance: WallRequest['wallDistance']; shearFrom: WallRequest['shearFrom'] }

/** Parses "1, 5, 30" into thresholds; throws one line naming what was expected. */
export function parseThresholds(text: string): number[] {
  const parts = text.split(/[,;\s]+/).filter(Boolean);
  const out = parts.map(Number);
  if (out.length === 0 || out.length > 20 || out.some((t) => !Number.isFinite(t) || t < 0)) {
    throw new Error(`y+ thresholds: expected 1 to 20 numbers ≥ 0 separated by commas, got "${text}"`);
  }
  return [...new Set(out)].sort((a, b) => a - b);
}

export class WallTool implements FieldSource {
  private readonly folder: GUI;
  private readonly settings = {
    group: 0, quantity: 'yplus' as Quantity, wallDistance: WALL_PANEL_DEFAULTS.wallDistance as WallRequest['wallDistance'],
    shearFrom: WALL_PANEL_DEFAULTS.shearFrom as WallRequest['shearFrom'], thresholds: WALL_PANEL_DEFAULTS.thresholds.join(', '),
  };
  private pins: WallPin[] = [];
  /** Set once the tool was used on this file (colour, pin, a choice changed, a pinned group restored). */
  private used = false;
  private next = 1;
  private readonly panel: HTMLDivElement;
  private readonly evaluate;

  constructor(private readonly v: Viewer, private readonly refs: ReferenceTool) {
    this.folder = v.gui.addFolder('Wall quantities');
    this.panel = document.createElement('div');
    this.panel.className = 'wall-panel panel-note';
    this.evaluate = latestWinsPerKey((p: WallPin) => p.id,
      (p: WallPin) => v.track(v.compute.evaluateProbeSet({ format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION, reference: refs.doc(), probes: [this.doc(p)] })),
      (ev, p) => { const o = ev.probes[0]; if (o && this.pins.includes(p)) v.setResult(this.result(o, p)); },
      (e) => v.banner.error(`Wall quantities: ${(e as Error).message}`));
    v.addFieldSource(this);
    v.onDataset(() => { this.pins = []; this.next = 1; this.used = false; this.settings.group = this.defaultGroup(); this.buildPanel(); });
    v.onResultRemoved((id) => { this.pins = this.pins.filter((p) => p.id !== id); });
    v.onRename((id, label) => { const p = this.pins.find((x) => x.id === id); if (p) p.label = label; });
    // the group choice and the colour entries show the groups' labels
    v.groupLabels.onChange(() => { if (v.description) { this.buildPanel(); v.rebuildColorChooser(); } });
    refs.onChange(() => {
      for (const p of this.pins) this.evaluate.request(p);
      if (this.owns(v.settings.field)) void v.recolor();
      void this.refreshPanel();
    });
    this.buildPanel();
  }

  // ---- colour source ----

  entries(): SourceEntry[] {
    const g = this.group();
    if (!g) return [];
    return (Object.keys(QUANTITIES) as Quantity[]).map((q) => ({ label: `wall: ${QUANTITIES[q].title} on ${this.v.groupLabel(g)}`, key: `${KEY}${q}` }));
  }

  owns(key: string): boolean { return key.startsWith(KEY); }

  async resolve(key: string): Promise<ResolvedColour> {
    const q = key.slice(KEY.length) as Quantity, g = this.group();
    if (!g || !(q in QUANTITIES)) throw new Error(`no wall quantity "${q}" on a surface group`);
    if (!this.used) { this.used = true; void this.refreshPanel(); }
    const r = await this.request(q);
    return { kind: 'values', values: r.values, title: `${QUANTITIES[q].title} on ${this.v.groupLabel(g)}`, unit: QUANTITIES[q].unit };
  }

  // ---- probe set ----

  /** The pinned groups as probe-set probes. */
  probes(): WallProbe[] { return this.pins.map((p) => this.doc(p)); }

  /** True for a `wall` probe this tool can hold: surfaces found, no own field names, only the panel's options. */
  accepts(p: Probe): p is WallProbe {
    if (p.kind !== 'wall' || (p.fields && Object.keys(p.fields).length)) return false;
    const o = p.options ?? {};
    if (Object.keys(o).some((k) => !['thresholds', 'wallDistance', 'shearFrom', 'wallGradient'].includes(k))) return false;
    if (o.wallGradient !== undefined && o.wallGradient !== 'second-order') return false;
    // a group chosen by a selector (name, bounds, area) is evaluated by the worker with the set's other probes
    if (p.geometry.surfaces.some((r) => typeof r === 'object')) return false;
    return this.resolveRefs(p.geometry.surfaces as (string | number)[]) !== undefined;
  }

  /** Pins a probe-set `wall` probe (see `accepts`), keeping its id, label and options. */
  addFrom(p: WallProbe): void {
    const o = p.options ?? {};
    const pin: WallPin = {
      id: p.id, label: p.label ?? p.id, surfaces: p.geometry.surfaces.filter((r): r is string | number => typeof r !== 'object'), thresholds: o.thresholds ? [...o.thresholds] : [1, 5, 30],
      wallDistance: o.wallDistance ?? 'cell-centroid', shearFrom: o.shearFrom ?? 'auto',
    };
    this.pins.push(pin);
    // the panel shows the thresholds of a pinned group it has chosen (after an undo, a reload, an opened set)
    if (this.resolveRefs(pin.surfaces)?.every((g) => g === this.settings.group)) {
      this.used = true;
      this.settings.thresholds = pin.thresholds.join(', ');
      for (const c of this.folder.controllers) c.updateDisplay();
      void this.refreshPanel();
    }
    const n = /^wall-(\d+)$/.exec(p.id);
    if (n) this.next = Math.max(this.next, Number(n[1]) + 1);
    this.evaluate.request(pin);
  }

  removeAll(): void {
    for (const p of this.pins) this.v.removeResult(p.id, false);
    this.pins = [];
  }

  /** Pins the panel's group with the panel's thresholds and choices. */
  pin(): void {
    const g = this.group();
    if (!g) { this.v.banner.error('Wall quantities: this file has no surface groups'); return; }
    let thresholds: number[];
    try { thresholds = parseThresholds(this.settings.thresholds); } catch (e) { this.v.banner.error((e as Error).message); return; }
    const groups = this.v.description?.groups ?? [];
    const ref = groups.filter((x) => x.name === g.name).length === 1 ? g.name : g.fileId;
    while (this.v.allResults.some((r) => r.id === `wall-${this.next}`)) this.next++;
    this.used = true;
    const pin: WallPin = { id: `wall-${this.next++}`, label: `Wall ${this.v.groupLabel(g)}`, surfaces: [ref], thresholds, wallDistance: this.settings.wallDistance, shearFrom: this.settings.shearFrom };
    this.pins.push(pin);
    this.v.select(pin.id);
    this.evaluate.request(pin);
    void this.refreshPanel();
  }

  private doc(p: WallPin): WallProbe {
    return {
      id: p.id, kind: 'wall', label: p.label, geometry: { surfaces: [...p.surfaces] },
      options: { thresholds: [...p.thresholds], wallDistance: p.wallDistance, shearFrom: p.shearFrom, wallGradient: 'second-order' },
    };
  }

  private result(o: Parameters<typeof outcomeResult>[0], p: WallPin) {
    const pinned = ['yPlus.mean', 'yPlus.min', 'yPlus.max', ...p.thresholds.map((t) => `yPlusAbove.${t}`), 'wallShear.mean', 'cf.mean'];
    const tau = /τ_w from (.*?); y =/.exec(o.definition)?.[1];
    return outcomeResult(o, [0, 0, 0], { pinned, origin: '', ...(tau ? { tag: `τ_w from ${tau}` } : {}) });
  }

  private resolveRefs(refs: readonly (string | number)[]): number[] | undefined {
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

  // ---- panel ----

  private group() { return this.v.description?.groups.find((g) => g.id === this.settings.group); }

  /** Among the groups shown at opening (an enclosing far field is hidden): one named like a wall, else the largest. */
  private defaultGroup(): number {
    const all = this.v.description?.groups ?? [], shown = all.filter((g) => this.v.shownGroups.has(g.id));
    const groups = shown.length ? shown : all;
    const wall = groups.find((g) => /wall|body|surface|sphere|cylinder|blade|hull|wing/i.test(g.name));
    return (wall ?? [...groups].sort((a, b) => b.area - a.area)[0])?.id ?? 0;
  }

  private request(q: Quantity): Promise<WallReply> {
    let thresholds: number[];
    try { thresholds = parseThresholds(this.settings.thresholds); } catch { thresholds = [...WALL_PANEL_DEFAULTS.thresholds]; }
    const c = this.refs.conditions;
    return this.v.compute.wallSurface({
      groups: [this.settings.group], quantity: q, density: c.density, speed: c.speed, viscosity: c.viscosity,
      thresholds, bins: WALL_PANEL_DEFAULTS.bins, wallDistance: this.settings.wallDistance, shearFrom: this.settings.shearFrom,
    });
  }

  /**
   * Panel text: where τ_w comes from, the y⁺ histogram of the group. Computed once the tool is used (not on
   * opening a file, so the first picture is not kept waiting).
   */
  private async refreshPanel(): Promise<void> {
    if (!this.group() || !this.v.description) { this.panel.replaceChildren(); return; }
    if (!this.used) {
      const hint = document.createElement('div');
      hint.className = 'wall-source';
      hint.textContent = 'Colour the group or pin its statistics: the y+ histogram and the source of τ_w show here.';
      this.panel.replaceChildren(hint);
      return;
    }
    try {
      const r = await this.v.track(this.request('shear'));
      const text = document.createElement('div');
      text.className = 'wall-source';
      text.textContent = `τ_w from ${r.shearSource}; ${r.wallDistanceDefinition}.`;
      const hist = document.createElement('div');
      hist.className = 'wall-histogram-host';
      if (r.yPlusHistogram) {
        hist.innerHTML = histogramSvg({ ...r.yPlusHistogram, above: r.yPlusAbove, title: `y+ over ${this.v.groupLabel(this.group()!)} (area share)` });
      }
      this.panel.replaceChildren(text, hist);
    } catch (e) {
      const t = document.createElement('div');
      t.className = 'wall-source';
      t.textContent = `Wall quantities: ${(e as Error).message}`;
      this.panel.replaceChildren(t);
    }
  }

  private recolourIfShown(): void {
    if (this.owns(this.v.settings.field)) void this.v.recolor();
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    const groups = this.v.description?.groups ?? [];
    const opts: Record<string, number> = {};
    for (const g of groups) { const l = this.v.groupLabel(g); opts[l in opts ? `${l} (${g.fileId})` : l] = g.id; }
    const s = this.settings;
    const changed = () => { this.used = true; this.v.rebuildColorChooser(); this.recolourIfShown(); void this.refreshPanel(); };
    this.folder.add(s, 'group', opts).name('surface group').onChange(changed);
    const q: Record<string, Quantity> = {};
    for (const k of Object.keys(QUANTITIES) as Quantity[]) q[QUANTITIES[k].label] = k;
    this.folder.add(s, 'quantity', q).name('quantity');
    this.folder.add({ colour: () => void this.v.chooseField(`${KEY}${s.quantity}`) }, 'colour').name('colour the group by it');
    this.folder.add(s, 'wallDistance', { 'wall cell centroid': 'cell-centroid', 'first off-wall node': 'first-node' }).name('y of y+').onChange(changed);
    this.folder.add(s, 'shearFrom', { 'wall-shear array if present': 'auto', "file's wall-shear array": 'wall-shear', 'velocity gradient with μ': 'gradient' }).name('τ_w from').onChange(changed);
    this.folder.add(s, 'thresholds').name('y+ thresholds').onFinishChange((t: string) => {
      let list: number[] | undefined;
      try { list = parseThresholds(t); } catch (e) { this.v.banner.error((e as Error).message); s.thresholds = WALL_PANEL_DEFAULTS.thresholds.join(', '); }
      for (const c of this.folder.controllers) c.updateDisplay();
      // the group's pinned statistics take the new thresholds (an undo step of the probe set)
      const ids = new Set([s.group]);
      if (list) for (const p of this.pins) if (this.resolveRefs(p.surfaces)?.every((g) => ids.has(g))) { p.thresholds = list; this.evaluate.request(p); }
      void this.refreshPanel();
    });
    this.folder.add({ pin: () => this.pin() }, 'pin').name('pin statistics of the group');
    this.folder.domElement.querySelector('.lil-children')?.append(this.panel);
    void this.refreshPanel();
  }
}
