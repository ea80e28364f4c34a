/**
 * Wall quantities on a surface group: colour the group by |τ_w|, c_f or y⁺ (other surfaces grey) and pin
 * its statistics — area-weighted mean, min and max, the area share above editable y⁺ thresholds — with a
 * y⁺ histogram in the panel. τ_w comes from the file's wall-shear array or from the second-order velocity
 * gradient with μ of the reference conditions (the panel and the pin say which, as the core reports it);
 * ρ, U and μ are the reference conditions'. A pinned group is a `wall` probe of the probe set, evaluated
 * by the study layer (the `wall` verb's numbers), so it is saved, restored and undone with the set.
 * Surfaces can also be chosen by what they are (name, a box holding them, an area range: `groupChoice.ts`,
 * the force tool's folder); the probe set then keeps that selector, so the same wall is found in another file
 * whatever its group numbers there.
 */
import type GUI from 'lil-gui';
import type { WallReply, WallRequest } from '../../workers/api.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type Probe, type SurfaceRef, type WallProbe } from '../study/probeSet.ts';
import { describeSelector, type GroupSelector } from '../surface/groupSelect.ts';
import { histogramSvg } from '../ui/wallHistogram.ts';
import type { FieldSource, ResolvedColour, SourceEntry } from './fieldSource.ts';
import { groupIdsOf, groupRef } from './groupChoice.ts';
import { addGroupChoice, emptyChoice } from './groupChoiceFolder.ts';
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
interface WallPin { id: string; label: string; surfaces: SurfaceRef[]; thresholds: number[]; wallDistance: WallRequest['wallDistance']; shearFrom: WallRequest['shearFrom'] }

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
  /** The fields of "choose surfaces by what they are", kept across rebuilds of the panel. */
  private readonly choice = emptyChoice();
  /** Surfaces chosen by a selector (they replace the list's group until a group is chosen from the list). */
  private chosenBy: { selector: GroupSelector; ids: number[] } | undefined;
  private readonly chosenText = { surfaces: '' };
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
    v.onDataset(() => { this.pins = []; this.next = 1; this.used = false; this.chosenBy = undefined; this.settings.group = this.defaultGroup(); this.buildPanel(); });
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
    if (!this.group()) return [];
    const on = this.surfacesText();
    return (Object.keys(QUANTITIES) as Quantity[]).map((q) => ({ label: `wall: ${QUANTITIES[q].title} on ${on}`, key: `${KEY}${q}` }));
  }

  owns(key: string): boolean { return key.startsWith(KEY); }

  async resolve(key: string): Promise<ResolvedColour> {
    const q = key.slice(KEY.length) as Quantity;
    if (!this.group() || !(q in QUANTITIES)) throw new Error(`no wall quantity "${q}" on a surface group`);
    if (!this.used) { this.used = true; void this.refreshPanel(); }
    const r = await this.request(q);
    return { kind: 'values', values: r.values, title: `${QUANTITIES[q].title} on ${this.surfacesText()}`, unit: QUANTITIES[q].unit };
  }

  // ---- probe set ----

  /** The pinned groups as probe-set probes. */
  probes(): WallProbe[] { return this.pins.map((p) => this.doc(p)); }

  /** True for a `wall` probe this tool can hold: surfaces found (by name, id or selector), no own field names, only the panel's options. */
  accepts(p: Probe): p is WallProbe {
    if (p.kind !== 'wall' || (p.fields && Object.keys(p.fields).length)) return false;
    const o = p.options ?? {};
    if (Object.keys(o).some((k) => !['thresholds', 'wallDistance', 'shearFrom', 'wallGradient'].includes(k))) return false;
    if (o.wallGradient !== undefined && o.wallGradient !== 'second-order') return false;
    // a selector that matches nothing here, or needs the faces (`nearest`), is evaluated by the worker with the set's other probes
    return this.resolveRefs(p.geometry.surfaces) !== undefined;
  }

  /** Pins a probe-set `wall` probe (see `accepts`), keeping its id, label and options. */
  addFrom(p: WallProbe): void {
    const o = p.options ?? {};
    const pin: WallPin = {
      id: p.id, label: p.label ?? p.id, surfaces: [...p.geometry.surfaces], thresholds: o.thresholds ? [...o.thresholds] : [1, 5, 30],
      wallDistance: o.wallDistance ?? 'cell-centroid', shearFrom: o.shearFrom ?? 'auto',
    };
    this.pins.push(pin);
    // the panel shows the thresholds of a pinned group it has chosen (after an undo, a reload, an opened set)
    if (this.isPanels(pin)) {
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
    const surfaces: SurfaceRef[] = this.chosenBy ? [this.chosenBy.selector] : [groupRef(this.v.description?.groups ?? [], g)];
    while (this.v.allResults.some((r) => r.id === `wall-${this.next}`)) this.next++;
    this.used = true;
    const pin: WallPin = { id: `wall-${this.next++}`, label: `Wall ${this.surfacesText()}`, surfaces, thresholds, wallDistance: this.settings.wallDistance, shearFrom: this.settings.shearFrom };
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

  private resolveRefs(refs: readonly SurfaceRef[]): number[] | undefined {
    return groupIdsOf(this.v.description?.groups ?? [], refs);
  }

  /** True when a pinned probe's surfaces are the panel's (so the panel's thresholds are its). */
  private isPanels(p: WallPin): boolean {
    const ids = this.resolveRefs(p.surfaces), panel = new Set(this.surfaceIds());
    return ids !== undefined && ids.length > 0 && ids.every((g) => panel.has(g));
  }

  // ---- panel ----

  private group() { return this.v.description?.groups.find((g) => g.id === this.settings.group); }

  /** Group ids (`GroupInfo.id`) the panel colours and pins: the selector's, else the list's group. */
  private surfaceIds(): number[] { return this.chosenBy ? [...this.chosenBy.ids] : [this.settings.group]; }

  /** The panel's surfaces in words: their labels, and the selector that chose them. */
  private surfacesText(): string {
    const ids = new Set(this.surfaceIds());
    const names = (this.v.description?.groups ?? []).filter((g) => ids.has(g.id)).map((g) => this.v.groupLabel(g)).join(', ');
    return this.chosenBy ? `${names} (${describeSelector(this.chosenBy.selector)})` : names;
  }

  /** Takes the surfaces a selector picked as the panel's; a pin made now keeps the selector. */
  private chooseBy(selector: GroupSelector, ids: number[]): void {
    this.chosenBy = { selector, ids };
    this.settings.group = ids[0]!;
    for (const c of this.folder.controllers) c.updateDisplay();
    this.panelChanged();
  }

  /** After a change of surfaces or options: the colour chooser, the colour shown and the panel text follow. */
  private panelChanged(): void {
    this.used = true;
    this.chosenText.surfaces = this.surfacesText();
    this.v.rebuildColorChooser();
    this.recolourIfShown();
    void this.refreshPanel();
  }

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
      groups: this.surfaceIds(), quantity: q, density: c.density, speed: c.speed, viscosity: c.viscosity,
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
        hist.innerHTML = histogramSvg({ ...r.yPlusHistogram, above: r.yPlusAbove, title: `y+ over ${this.surfacesText()} (area share)` });
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
    for (const f of [...this.folder.folders]) f.destroy();
    const groups = this.v.description?.groups ?? [];
    const opts: Record<string, number> = {};
    for (const g of groups) { const l = this.v.groupLabel(g); opts[l in opts ? `${l} (${g.fileId})` : l] = g.id; }
    const s = this.settings;
    const changed = () => this.panelChanged();
    // a group taken from the list replaces surfaces chosen by what they are
    this.folder.add(s, 'group', opts).name('surface group').onChange(() => { this.chosenBy = undefined; changed(); });
    this.chosenText.surfaces = this.group() ? this.surfacesText() : '';
    this.folder.add(this.chosenText, 'surfaces').name('surfaces').disable().listen();
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
      if (list) for (const p of this.pins) if (this.isPanels(p)) { p.thresholds = list; this.evaluate.request(p); }
      void this.refreshPanel();
    });
    this.folder.add({ pin: () => this.pin() }, 'pin').name('pin statistics of the group');
    addGroupChoice(this.folder, this.choice, 'take matching surfaces', () => this.v.description?.groups ?? [],
      (sel, ids) => this.chooseBy(sel, ids), (m) => this.v.banner.error(`Wall quantities: ${m}`));
    this.folder.domElement.querySelector('.lil-children')?.append(this.panel);
    void this.refreshPanel();
  }
}
