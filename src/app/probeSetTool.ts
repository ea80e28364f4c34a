/**
 * The probe set in the viewer: every probe placed in the view (cut-planes, line probes, the force total,
 * iso-surfaces)
 * plus the probes of a loaded set that the view's tools cannot edit (points, pressure losses, mass
 * balances, planes with other regions, any probe of a set in non-SI units), which the worker evaluates as
 * a set. Saved and opened as a file (download / upload), kept in local storage on every change and
 * restored after a reload (`probeSetStore.ts`); opening another result file re-applies the set, so every
 * probe is evaluated again on the new file. A baseline can be kept; the next file is then compared with
 * it, side by side. A set that cannot be read is refused with its error and changes nothing.
 */
import type GUI from 'lil-gui';
import type { SetEvaluation } from '../../workers/api.ts';
import { compareEvaluations } from '../study/compare.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, probeLabel, type Probe, type ProbeSet, type UnitsDoc } from '../study/probeSet.ts';
import { readProbeSet, writeProbeSet } from '../study/probeSetFile.ts';
import { siFactors } from '../study/siDataset.ts';
import { ComparisonTable } from '../ui/comparisonTable.ts';
import { download } from '../ui/download.ts';
import { meshMagnitudes } from '../ui/roundingNoise.ts';
import type { ForceTool } from './forceTool.ts';
import type { IsoTool } from './isoTool.ts';
import type { FormulaTool } from './formulaTool.ts';
import type { WallTool } from './wallTool.ts';
import type { LineTool } from './lineTool.ts';
import type { LossTool } from './lossTool.ts';
import { outcomeResult } from './outcomeResult.ts';
import type { PlaneTool } from './planeTool.ts';
import { ProbeSetStore, type KeyValueStore } from './probeSetStore.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { SplitTool } from './splitTool.ts';
import { UndoHistory } from './undoHistory.ts';
import type { Viewer } from './viewer.ts';

/** Quiet time after the last change before the set is stored (ms). */
const SAVE_DELAY_MS = 250;

function localStore(): KeyValueStore | null {
  try { return window.localStorage; } catch { return null; }
}

export class ProbeSetTool {
  private extras: Probe[] = [];
  private meta: { title?: string; description?: string; units?: UnitsDoc } = {};
  /** Probe ids in the order of the last applied set, so a saved set keeps its order. */
  private order: string[] = [];
  private carry: ProbeSet | undefined;
  private applying = false;
  private generation = 0;
  private saveTimer: ReturnType<typeof setTimeout> | undefined;
  private baseline: { file: string; evaluation: SetEvaluation } | undefined;
  private message: { kind: 'notice' | 'error'; text: string } | undefined;
  private readonly store = new ProbeSetStore(localStore());
  /** Snapshots of the set for undo/redo; `quietStep` makes the next snapshot replace the state without a step. */
  private readonly history = new UndoHistory();
  private quietStep = true;
  private readonly input: HTMLInputElement;
  private readonly comparison: ComparisonTable;

  constructor(private readonly v: Viewer,
    private readonly tools: { refs: ReferenceTool; planes: PlaneTool; lines: LineTool; force: ForceTool; losses: LossTool; splits: SplitTool; iso?: IsoTool; walls?: WallTool; formulas?: FormulaTool },
    compareHost: HTMLElement, private readonly makeReport: (set: ProbeSet) => Promise<void>) {
    // A change still waiting for its quiet moment is stored before the page goes away (reload, close, another
    // address), so a probe made just before is not lost.
    window.addEventListener('pagehide', () => { if (this.saveTimer !== undefined) this.persist(); });
    const f: GUI = v.gui.addFolder('Probe set');
    f.add({ save: () => this.save() }, 'save').name('save probe set (JSON)');
    f.add({ open: () => this.input.click() }, 'open').name('open probe set…');
    f.add({ clear: () => this.removeAll() }, 'clear').name('remove all probes (undo: Ctrl+Z)');
    f.add({ keep: () => void this.keepBaseline() }, 'keep').name('keep results as baseline');
    f.add({ report: () => void this.v.track(this.makeReport(this.currentSet())).catch((e) => v.banner.error(`Report: ${(e as Error).message}`)) }, 'report').name('save report (.zip)');
    this.input = document.createElement('input');
    this.input.type = 'file';
    this.input.accept = '.json,application/json';
    this.input.id = 'probe-set-input';
    this.input.hidden = true;
    this.input.addEventListener('change', () => {
      const file = this.input.files?.[0];
      this.input.value = '';
      if (file) void this.open(file);
    });
    document.body.append(this.input);
    this.comparison = new ComparisonTable(compareHost, () => this.clearBaseline());

    const r = this.store.recover();
    if (r.kind === 'set') {
      this.carry = r.set;
      this.message = { kind: 'notice', text: `Restored the probe set kept from your last visit: ${r.set.probes.length} probe${r.set.probes.length === 1 ? '' : 's'}${r.file ? ` (last used on ${r.file})` : ''}.` };
    } else if (r.kind === 'corrupt') {
      this.message = {
        kind: 'error',
        text: `The probe set kept from your last visit could not be read (${r.message}). ${r.keptAs ? `Its text was kept aside in this browser's storage under "${r.keptAs}"` : 'Its text was left where it was'}; the probes start empty.`,
      };
    }
    v.onBeforeDataset(() => {
      this.carry ??= this.currentSet();
      this.applying = true;
    });
    v.onDataset(() => void this.afterDataset());
    v.onResultsChanged(() => this.changed());
    v.onResultRemoved((id) => {
      if (this.applying) return;
      this.extras = this.extras.filter((p) => p.id !== id);
    });
    v.onRename((id, label) => { const p = this.extras.find((x) => x.id === id); if (p) p.label = label; });
    // a surface group relabelled is a change of the set (an undo step)
    v.groupLabels.onChange(() => this.changed());
    // a formula defined or removed is a change of the set (an undo step)
    tools.formulas?.onChange(() => this.changed());
    // the set's other probes use the reference conditions too
    tools.refs.onChange(() => { if (!this.applying) void this.evaluateExtras(this.generation); this.changed(); });
  }

  /** The probe set as it stands: the tools' probes and the set's other probes, in the set's order. */
  currentSet(): ProbeSet {
    const { refs, planes, lines, force, losses, splits, walls, formulas } = this.tools;
    const fp = force.probe();
    const formulaDocs = formulas?.docs() ?? [];
    const groupLabels = this.v.groupLabels.doc();
    // a pin placed by hand is kept with its probe
    const probes = [...planes.probes(), ...lines.probes(), ...(fp ? [fp] : []), ...losses.probes(), ...splits.probes(), ...(this.tools.iso?.probes() ?? []), ...(walls?.probes() ?? []), ...this.extras].map((p) => {
      const off = this.v.pinOffsets.get(p.id);
      const { pin: _pin, ...rest } = p;
      void _pin;
      return off ? { ...rest, pin: { offset: [off[0], off[1]] as [number, number] } } : rest;
    });
    const rank = (p: Probe) => { const i = this.order.indexOf(p.id); return i < 0 ? this.order.length : i; };
    probes.sort((a, b) => rank(a) - rank(b));
    return {
      format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION,
      ...(this.meta.title ? { title: this.meta.title } : {}), ...(this.meta.description ? { description: this.meta.description } : {}),
      ...(this.meta.units ? { units: this.meta.units } : {}), reference: refs.doc(), ...(formulaDocs.length ? { formulas: formulaDocs } : {}),
      ...(groupLabels ? { groupLabels } : {}), probes,
    };
  }

  private async afterDataset(): Promise<void> {
    const set = this.carry;
    this.carry = undefined;
    // the same probes re-evaluated on another file are no step of their own
    this.quietStep = true;
    if (set) await this.apply(set);
    else { this.applying = false; this.changed(); }
    if (this.message) {
      const m = this.message;
      this.message = undefined;
      if (m.kind === 'error') this.v.banner.error(m.text); else this.v.banner.notice(m.text);
    }
    if (this.baseline) await this.refreshComparison();
  }

  /**
   * Replaces every probe by those of `set`: editable ones go to the view's tools (which compute them),
   * the others are evaluated by the worker as a set.
   */
  async apply(set: ProbeSet): Promise<void> {
    const gen = ++this.generation;
    this.applying = true;
    try {
      const { refs, planes, lines, force, losses, splits, walls, formulas } = this.tools;
      this.clearTools();
      // first: the formulas reach the worker before any probe's request that may name them
      void formulas?.setFrom(set.formulas ?? []);
      this.meta = {
        ...(set.title ? { title: set.title } : {}), ...(set.description ? { description: set.description } : {}),
        ...(set.units ? { units: set.units } : {}),
      };
      this.order = set.probes.map((p) => p.id);
      this.v.pinOffsets.clear();
      for (const p of set.probes) if (p.pin) this.v.pinOffsets.set(p.id, [...p.pin.offset]);
      // before the probes: every tool evaluates on the set's reference conditions
      refs.setFromDoc(set.reference, false);
      // the set's group labels (none: every group shows its file name), before the probes name groups in results
      this.v.groupLabels.setFrom(set.groupLabels);
      // the tools compute in the file's units; a set in other units is evaluated as a whole by the worker
      const f = siFactors(set.units);
      const si = f.length === 1 && Object.keys(f.fields).length === 0;
      let forceTaken = false;
      const composite: Probe[] = [], isoProbes: Probe[] = [];
      for (const p of set.probes) {
        if (si && planes.accepts(p)) planes.addFrom(p);
        else if (si && lines.accepts(p)) lines.addFrom(p);
        else if (si && !forceTaken && force.accepts(p)) { force.setFrom(p); forceTaken = true; }
        else if (si && (losses.accepts(p) || splits.accepts(p))) composite.push(p);
        else if (si && this.tools.iso?.accepts(p)) isoProbes.push(p);
        else if (si && walls?.accepts(p)) walls.addFrom(p);
        else this.extras.push(p);
      }
      // after the planes, so they link to the view's planes
      for (const p of composite) if (losses.accepts(p)) losses.addFrom(p); else splits.addFrom(p);
      await Promise.all([this.evaluateExtras(gen), ...isoProbes.map((p) => this.tools.iso!.addFrom(p))]);
    } finally {
      if (gen === this.generation) { this.applying = false; this.changed(); }
    }
  }

  private clearTools(): void {
    const { planes, lines, force, losses, splits, walls } = this.tools;
    walls?.removeAll();
    losses.removeAll();
    splits.removeAll();
    planes.removeAll();
    lines.removeAll();
    force.clear();
    this.tools.iso?.removeAll();
    for (const p of this.extras) this.v.removeResult(p.id, false);
    this.extras = [];
  }

  private async evaluateExtras(gen: number): Promise<void> {
    if (this.extras.length === 0 || !this.v.description) return;
    const set: ProbeSet = { ...this.currentSetMeta(), probes: this.extras };
    try {
      const ev = await this.v.track(this.v.compute.evaluateProbeSet(set));
      if (gen !== this.generation) return;
      const b = this.v.bounds, centre: [number, number, number] = [(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2];
      // the probe set reports in SI: the mesh's field magnitudes are converted by the set's units
      const noise = { fields: meshMagnitudes(this.v.description.report, siFactors(this.meta.units).fields), density: this.tools.refs.density };
      for (const o of ev.probes) this.v.setResult(outcomeResult(o, centre, { noise }));
    } catch (e) {
      this.v.banner.error(`Probe set: ${(e as Error).message}`);
    }
  }

  private currentSetMeta(): Omit<ProbeSet, 'probes'> {
    const { probes: _p, ...meta } = this.currentSet();
    void _p;
    return meta;
  }

  /** Something changed: store the set (after a quiet moment) and refresh the comparison. */
  private changed(): void {
    if (this.applying) return;
    clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => this.persist(), SAVE_DELAY_MS);
  }

  /** Takes the undo step of the last changes and stores the set (the quiet moment's work, or at once before an undo). */
  private persist(): void {
    clearTimeout(this.saveTimer);
    this.saveTimer = undefined;
    if (this.applying) return;
    const set = this.currentSet();
    const snap = writeProbeSet(set);
    if (this.quietStep) { this.history.reset(snap); this.quietStep = false; } else this.history.record(snap);
    document.body.dataset['undoSteps'] = String(this.history.depth);
    const err = this.store.save(set, this.v.description?.report.source ?? null);
    if (err) this.v.banner.error(`The probe set could not be kept in this browser's storage (${err}); save it as a file to keep it.`);
    else document.body.dataset['probeSetKept'] = String(Date.now());
    if (this.baseline) void this.refreshComparison();
  }

  private save(): void {
    const set = this.currentSet();
    const base = (set.title ?? this.v.description?.report.source.replace(/\.[^.]+$/, '') ?? 'fieldtally').replace(/[^\w.-]+/g, '-');
    download(`${base}-probes.json`, writeProbeSet(set), 'application/json');
  }

  /** Reads a probe-set file; on success replaces the probes, on error reports it and changes nothing. */
  async open(file: File): Promise<void> {
    let set: ProbeSet, fromVersion: number;
    try {
      ({ set, fromVersion } = readProbeSet(await file.text(), file.name));
    } catch (e) {
      this.v.banner.error(`Could not open the probe set: ${(e as Error).message}`);
      return;
    }
    await this.v.track(this.apply(set));
    this.v.banner.notice(`Opened the probe set ${set.title ? `"${set.title}" ` : ''}from ${file.name}: ${set.probes.length} probe${set.probes.length === 1 ? '' : 's'}` +
      `${fromVersion < PROBE_SET_VERSION ? ` (a version ${fromVersion} file, upgraded)` : ''}${this.extras.length ? `; ${this.extras.length} evaluated as a set (${this.extras.map(probeLabel).join(', ')})` : ''}.`);
  }

  /** Goes back one step of probes, labels and reference conditions (re-evaluating the probes). */
  async undo(): Promise<void> {
    // a change still waiting for its quiet moment is a step of its own
    if (this.saveTimer !== undefined) this.persist();
    await this.restore(this.history.undo(), 'undo');
  }

  /** Goes forward one undone step. */
  async redo(): Promise<void> {
    if (this.saveTimer !== undefined) this.persist();
    await this.restore(this.history.redo(), 'redo');
  }

  private async restore(snap: string | undefined, what: string): Promise<void> {
    if (snap === undefined) { this.v.banner.notice(`Nothing to ${what}.`); return; }
    let set: ProbeSet;
    try { ({ set } = readProbeSet(snap, `${what} step`)); } catch (e) { this.v.banner.error(`Could not ${what}: ${(e as Error).message}`); return; }
    this.quietStep = true;
    await this.v.track(this.apply(set));
  }

  /** Removes every probe (one step: undo brings them back). */
  removeAll(): void {
    this.clearTools();
    this.order = [];
    this.changed();
  }

  private async keepBaseline(): Promise<void> {
    if (!this.v.description) return;
    try {
      const evaluation = await this.v.track(this.v.compute.evaluateProbeSet(this.currentSet()));
      this.baseline = { file: this.v.description.report.source, evaluation };
      this.tools.lines.keepBaseline(this.baseline.file);
      this.comparison.set(null, `Baseline kept: ${this.baseline.file}, ${evaluation.probes.length} probe${evaluation.probes.length === 1 ? '' : 's'}. Open the variant file: every probe is evaluated on it and compared here.`);
      document.body.dataset['baseline'] = this.baseline.file;
    } catch (e) {
      this.v.banner.error(`Baseline: ${(e as Error).message}`);
    }
  }

  private clearBaseline(): void {
    this.baseline = undefined;
    this.tools.lines.clearBaseline();
    this.comparison.set(null);
    delete document.body.dataset['baseline'];
  }

  private async refreshComparison(): Promise<void> {
    const b = this.baseline;
    if (!b || !this.v.description) return;
    const file = this.v.description.report.source;
    try {
      const ev = await this.v.track(this.v.compute.evaluateProbeSet(this.currentSet()));
      if (this.baseline !== b) return;
      this.comparison.set(compareEvaluations(b.evaluation, ev, { baseline: b.file, variant: file }));
      document.body.dataset['compared'] = file;
    } catch (e) {
      this.v.banner.error(`Comparison: ${(e as Error).message}`);
    }
  }
}
