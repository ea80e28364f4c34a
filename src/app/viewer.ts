/**
 * The viewer's core: loading (with progress, cancel, memory warning and error reporting), the boundary
 * surface and its colouring, display settings, the probes' results (pins and table), and pointer
 * dispatch to the probe tools. The tools (cut-plane, line probe, force total, export) attach to it.
 */
import * as Comlink from 'comlink';
import GUI from 'lil-gui';
import * as THREE from 'three';
import type { Description, FieldChoice, LoadRequest, SurfaceReply } from '../../workers/api.ts';
import type { Bounds } from '../model/bounds.ts';
import type { LoadReport } from '../model/loadReport.ts';
import { AboutBox } from '../ui/aboutBox.ts';
import { planPool, requestedWorkers } from '../parallel/poolPlan.ts';
import { Banner } from '../ui/banner.ts';
import { TriadView } from '../ui/axisTriad.ts';
import { formatBytes, formatNumber } from '../ui/format.ts';
import { LegendView, type LegendState } from '../ui/legend.ts';
import { PinOverlay } from '../ui/pins.ts';
import { ProgressBar } from '../ui/progressBar.ts';
import type { ProbeResult } from '../ui/results.ts';
import { ResultsTable } from '../ui/resultsTable.ts';
import { fieldUnit } from '../ui/units.ts';
import { addGroupRename } from '../ui/groupRename.ts';
import { outlinesShownFor } from '../ui/viewDefaults.ts';
import { COLOR_MAPS, DEFAULT_COLOR_MAP, colorMap, type ColorMap } from '../view/colorMaps.ts';
import { CutPlaneLayer } from '../view/cutPlaneLayer.ts';
import { LineProbeWidget } from '../view/lineProbeWidget.ts';
import { SurfaceLayer } from '../view/surfaceLayer.ts';
import { ViewScene, type ViewPreset } from '../view/viewScene.ts';
import { markDrawn, timedCall } from './callTiming.ts';
import type { Compute } from './computeClient.ts';
import type { FieldSource } from './fieldSource.ts';
import { GroupLabels } from './groupLabels.ts';
import { memoryNeeded, memoryWarning, requestBytes } from './fileChoice.ts';

/** A field the panel offers: `key` is `point:name` or `cell:name`. */
export interface FieldEntry {
  key: string;
  name: string;
  association: 'point' | 'cell';
  components: number;
  range: [number, number] | null;
}

/** A tool's share of pointer input over the view; handlers return true when they took the event. */
export interface PointerTool {
  down?(ev: PointerEvent, ray: THREE.Raycaster): boolean;
  move?(ev: PointerEvent, ray: THREE.Raycaster): void;
  up?(ev: PointerEvent, ray: THREE.Raycaster): void;
  click?(ev: PointerEvent, ray: THREE.Raycaster): boolean;
}

const COMPONENTS = ['magnitude', 'x', 'y', 'z'] as const;

export class Viewer {
  readonly view: ViewScene;
  readonly gui: GUI;
  readonly banner: Banner;
  readonly legend: LegendView;
  readonly pins: PinOverlay;
  readonly table: ResultsTable;
  readonly progress: ProgressBar;
  readonly about: AboutBox;
  description: Description | undefined;
  surface: SurfaceLayer | undefined;
  fields: FieldEntry[] = [];
  /** The user's labels of surface groups (kept in the probe set; see groupLabels.ts). */
  readonly groupLabels = new GroupLabels();
  private results = new Map<string, ProbeResult>();
  private readonly datasetListeners: ((d: Description) => void)[] = [];
  private readonly beforeDatasetListeners: (() => void)[] = [];
  private readonly resultsChangedListeners: (() => void)[] = [];
  /** The request of the file now open (for a report's list of inputs). */
  openRequest: LoadRequest | undefined;
  private readonly colorListeners: (() => void)[] = [];
  private readonly colorSettingListeners: (() => void)[] = [];
  private readonly resultListeners: ((id: string) => void)[] = [];
  private readonly tools: PointerTool[] = [];
  private pending = 0;
  /** Counts loads started, so a superseded load neither reports nor hides the newer one's progress. */
  private loadGeneration = 0;
  /** Resolves when the last installed surface's first coloured picture is on screen. */
  private coloured: Promise<void> = Promise.resolve();
  private colorFolder: GUI;
  private groupFolder: GUI | undefined;
  /** Colour and display settings, edited by the panel. */
  readonly settings = {
    field: '',
    component: 'magnitude' as (typeof COMPONENTS)[number],
    map: DEFAULT_COLOR_MAP as string,
    autoRange: true,
    min: 0,
    max: 1,
    edges: true,
    opacity: 1,
    /** Keep the camera, colouring, opacity, outlines and shown groups when another file is opened (off: every file starts afresh). */
    keepView: false,
  };
  private dataRange: [number, number] = [0, 1];
  /** Tools adding colour entries beyond the file's arrays (derived fields, formulas, wall quantities). */
  private readonly fieldSources: FieldSource[] = [];
  private readonly fieldListeners: (() => void)[] = [];
  /** Legend title and unit while a source draws its own values (no field of the dataset). */
  private sourceLegend: { title: string; unit: string } | undefined;

  constructor(readonly compute: Compute, els: { canvas: HTMLCanvasElement; overlay: HTMLElement; side: HTMLElement; tools: HTMLElement;
    results: HTMLElement; progress: HTMLElement; summary: HTMLElement }) {
    this.view = new ViewScene(els.canvas);
    this.banner = new Banner(els.overlay.parentElement!, () => this.view.requestRender());
    this.legend = new LegendView(els.overlay);
    this.pins = new PinOverlay(els.overlay, (p) => this.view.project(p), (id) => this.select(id), (id) => { this.select(id); this.refreshResults(); });
    const triad = new TriadView(els.overlay.parentElement!);
    this.view.onFrame(() => { triad.update(this.view.camera); this.pins.update(); });
    this.progress = new ProgressBar(els.progress);
    this.progress.cancel.onclick = () => { this.progress.cancelling(); void this.compute.cancelLoad(); };
    const requested = requestedWorkers(location.search);
    this.about = new AboutBox(document.body, planPool({
      isolated: globalThis.crossOriginIsolated === true, cores: navigator.hardwareConcurrency ?? 1, ...(requested ? { requested } : {}),
    }).note);
    this.summary = els.summary;
    this.table = new ResultsTable(els.results, {
      onTogglePin: (id, on) => { const r = this.results.get(id); if (r) { r.pinVisible = on; this.refreshResults(); } },
      onRemove: (id) => this.removeResult(id, true),
      onCopy: () => this.emit('copy'),
      onSelect: (id) => this.select(id),
      onRename: (id, label) => this.rename(id, label),
    });
    this.table.set([]);
    // a relabelled group shows its new label in the list, the tools' panels, pins, table and exports
    this.groupLabels.onChange(() => { if (this.description) this.rebuildGroupPanel(new Set(this.shownGroups)); this.refreshResults(); });
    this.gui = new GUI({ container: els.side, title: 'Panel' });
    this.colorFolder = this.gui.addFolder('Colour');
    this.buildViewTools(els.tools);
    this.bindPointer(els.canvas);
    void this.view.warmUp(warmUpObjects(this.colorMap));
  }

  private readonly summary: HTMLElement;
  private readonly handlers = new Map<string, (() => void)[]>();

  /** Named UI events (e.g. `copy`) that tools handle. */
  on(event: string, f: () => void): void { this.handlers.set(event, [...(this.handlers.get(event) ?? []), f]); }
  private emit(event: string): void { for (const f of this.handlers.get(event) ?? []) f(); }

  onDataset(f: (d: Description) => void): void { this.datasetListeners.push(f); }
  /** Called when a new file has been read, before the old file's probes are dropped (the probe set keeps them). */
  onBeforeDataset(f: () => void): void { this.beforeDatasetListeners.push(f); }
  /** Called after any result was set or removed. */
  onResultsChanged(f: () => void): void { this.resultsChangedListeners.push(f); }
  /** The colouring field changed (values must be fetched again). */
  onColor(f: () => void): void { this.colorListeners.push(f); }
  /** Range or colour map changed (no new values needed). */
  onColorSettings(f: () => void): void { this.colorSettingListeners.push(f); }
  /** Called when a result is removed from the table (the tool drops its probe). */
  onResultRemoved(f: (id: string) => void): void { this.resultListeners.push(f); }
  addPointerTool(t: PointerTool): void { this.tools.push(t); }
  /** Adds colour-chooser entries of a tool (see fieldSource.ts). */
  addFieldSource(s: FieldSource): void { this.fieldSources.push(s); if (this.description) this.rebuildColorPanel(); }
  /** Called when the held dataset's fields changed without a new file (derived fields or formulas attached). */
  onFields(f: () => void): void { this.fieldListeners.push(f); }

  /**
   * Takes the worker's description after fields were attached or dropped: same surfaces, new field list;
   * the colouring is kept (and recomputed, its values may have changed) when its field still exists.
   */
  updateFields(d: Description): void {
    if (!this.description) return;
    this.description = { ...this.description, report: d.report };
    this.fields = fieldEntries(d.report);
    const key = this.settings.field, owned = this.fieldSources.some((x) => x.owns(key));
    const kept = owned || key === '' || this.fields.some((f) => f.key === key);
    if (!kept) this.settings.field = this.fields.find((f) => /^p$|pressure/i.test(f.name))?.key ?? this.fields[0]?.key ?? '';
    this.rebuildColorPanel();
    for (const l of this.fieldListeners) l();
    if (!owned) void this.recolor();
  }

  /** Rebuilds the colour chooser (a source's entries changed). */
  rebuildColorChooser(): void { if (this.description) this.rebuildColorPanel(); }

  /** Colours by `key` (a file field's `point:`/`cell:` key or a source's entry), as if chosen in the panel. */
  async chooseField(key: string): Promise<void> {
    this.settings.field = key;
    this.rebuildColorPanel();
    await this.recolor();
  }

  /** Marks work in progress for the page's `data-busy` attribute (tests wait on it). */
  async track<T>(p: Promise<T>): Promise<T> {
    this.pending++;
    document.body.dataset['busy'] = 'true';
    try { return await p; } finally {
      if (--this.pending === 0) document.body.dataset['busy'] = 'false';
    }
  }

  get bounds(): Bounds {
    return this.description?.report.bounds ?? [-1, 1, -1, 1, -1, 1];
  }

  /** The label shown for a surface group (the user's, else the file's name). */
  groupLabel(g: { name: string }): string { return this.groupLabels.labelOf(g.name); }

  get diagonal(): number {
    const b = this.bounds;
    return Math.max(1e-12, Math.hypot(b[1] - b[0], b[3] - b[2], b[5] - b[4]));
  }

  get colorMap(): ColorMap { return colorMap(this.settings.map); }

  /** The chosen colouring field, or undefined for plain grey. */
  get colorChoice(): FieldChoice | undefined {
    const f = this.fields.find((x) => x.key === this.settings.field);
    if (!f) return undefined;
    const component = f.components === 1 ? 0 : COMPONENTS.indexOf(this.settings.component) - 1;
    return { name: f.name, association: f.association, component };
  }

  /** The range mapped to the colour map's ends. */
  get colorRange(): [number, number] {
    if (!this.settings.autoRange) return [this.settings.min, this.settings.max];
    const [lo, hi] = this.dataRange;
    // a diverging map centres on zero when the data change sign, so its neutral colour means 0
    if (this.colorMap.diverging && lo < 0 && hi > 0) { const m = Math.max(-lo, hi); return [-m, m]; }
    return this.dataRange;
  }

  // ---- loading ----

  /**
   * Loads a request; on success replaces everything, on failure shows the reader's error and keeps
   * the previous state (the worker keeps its dataset too). A file that likely needs more memory than the
   * page may use is announced first. A newer load supersedes this one silently (the worker drops it).
   */
  async load(request: LoadRequest): Promise<boolean> {
    const bytes = requestBytes(request);
    const warn = memoryWarning(bytes, await memoryNeeded(request));
    if (warn && !(await this.banner.confirm(warn, 'Open anyway', "Don't open"))) return false;
    const gen = ++this.loadGeneration;
    const current = () => gen === this.loadGeneration;
    this.banner.clear();
    document.body.dataset['state'] = 'loading';
    this.progress.show('starting', 0, bytes);
    const onProgress = Comlink.proxy((p: { stage: string; bytesDone: number; bytesTotal: number }) => {
      if (current()) this.progress.show(p.stage, p.bytesDone, p.bytesTotal);
    });
    try {
      const d = await this.track(timedCall('load', () => this.compute.load(request, onProgress), false));
      if (!current()) return false;
      // the worker now holds the new file: a cancel could no longer bring the previous one back
      this.progress.show('drawing the surfaces', bytes, bytes, false);
      // the groups' outline (drawn only around selected groups) follows the first picture
      const drawing = await this.track(timedCall('surface', () => this.compute.surface({ groupOutline: false }), false));
      if (!current()) return false;
      this.openRequest = request;
      this.install(d, drawing, this.settings.keepView);
      this.outlineAfterPicture(this.surface!);
      document.body.dataset['state'] = 'ready';
      return true;
    } catch (e) {
      if (!current()) return false;
      const err = e as Error;
      if (err.name === 'AbortError' || /cancelled/.test(err.message)) this.banner.notice('Loading cancelled; the previous file stays open.');
      else this.banner.error(`Could not open the file: ${err.message}`);
      document.body.dataset['state'] = this.description ? 'ready' : 'empty';
      return false;
    } finally {
      if (current()) this.progress.hide();
    }
  }

  /**
   * Shows another step of an open series: `read` makes the worker hold the step (progress as in a load);
   * the camera, the colouring field and range settings and the probes stay (the tools re-evaluate them);
   * `keepView` false (the first step of a series) frames it like a newly opened file. A newer load or step
   * supersedes this one. Rejects with the worker's error (the previous step stays).
   */
  async showStep(read: (onProgress: (p: { stage: string; bytesDone: number; bytesTotal: number }) => void) => Promise<Description>, request: LoadRequest, keepView = true): Promise<boolean> {
    const gen = ++this.loadGeneration;
    const current = () => gen === this.loadGeneration;
    const onProgress = Comlink.proxy((p: { stage: string; bytesDone: number; bytesTotal: number }) => {
      if (current()) this.progress.show(p.stage, p.bytesDone, p.bytesTotal, false);
    });
    try {
      const d = await this.track(read(onProgress));
      if (!current()) return false;
      const drawing = await this.track(this.compute.surface());
      if (!current()) return false;
      this.openRequest = request;
      this.install(d, drawing, keepView);
      document.body.dataset['state'] = 'ready';
      return true;
    } finally {
      if (current()) this.progress.hide();
    }
  }

  /** Asks the worker for the groups' outline once the surface's first coloured picture is on screen. */
  private outlineAfterPicture(s: SurfaceLayer): void {
    void this.coloured.then(() => (this.surface === s ? this.track(this.compute.groupOutline()) : undefined))
      .then((o) => { if (o && this.surface === s) { s.setGroupOutline(o); this.view.requestRender(); } })
      .catch((e: unknown) => { if (this.surface === s) this.banner.error(`Could not outline the surface groups: ${(e as Error).message}`); });
  }

  private install(d: Description, drawing: SurfaceReply, keepView = false): void {
    const keepField = keepView ? this.settings.field : '';
    for (const l of this.beforeDatasetListeners) l();
    this.description = d;
    for (const id of [...this.results.keys()]) this.removeResult(id, true);
    if (this.surface) { this.view.root.remove(this.surface.group); this.surface.dispose(); }
    // a new file starts with the default colour map and part (the rest of the view state is reset below)
    if (!keepView) { this.settings.map = DEFAULT_COLOR_MAP; this.settings.component = 'magnitude'; }
    const groupCount = Math.max(1, ...d.groups.map((g) => g.id + 1));
    this.surface = new SurfaceLayer(drawing, this.colorMap, groupCount, this.view.software);
    // every file starts from the same view state: opaque surfaces, outlines only where they stay readable;
    // a step of a series keeps the view it had
    if (!keepView) {
      this.settings.opacity = 1;
      this.settings.edges = outlinesShownFor(d.groups.reduce((n, g) => n + g.faces, 0));
    }
    this.surface.setEdgesVisible(this.settings.edges);
    this.surface.setOpacity(this.settings.opacity);
    this.view.root.add(this.surface.group);
    // the surface's picture is kept between frames that change only probes (a drag, a new cut or line)
    const surface = this.surface;
    this.view.keepStill(surface.group, () => surface.stillKey());
    this.view.setBounds(this.bounds);
    this.fields = fieldEntries(d.report);
    this.summary.textContent = summaryLine(d);
    this.summary.title = d.report.warnings.join('\n');
    const pick = this.fields.find((f) => f.key === keepField) ?? this.fields.find((f) => /^p$|pressure/i.test(f.name)) ?? this.fields[0];
    this.settings.field = pick?.key ?? '';
    if (!keepView) this.settings.autoRange = true;
    this.rebuildColorPanel();
    this.rebuildGroupPanel(keepView ? new Set(this.shownGroups) : undefined);
    for (const l of this.datasetListeners) l(d);
    if (!keepView) {
      this.fitToShown();
      this.view.view('iso');
    }
    // the benchmark times "files chosen" → this mark (first coloured picture on screen, every part shown)
    const uploaded = this.uploadSurface(this.surface).then(() => { performance.mark('fieldtally:surface-uploaded'); });
    this.coloured = Promise.all([uploaded, this.recolor()]).then(() => this.view.nextFrame()).then(() => { performance.mark('fieldtally:coloured'); });
    if (d.report.warnings.length) this.banner.notice(`Opened with warnings: ${d.report.warnings.slice(0, 3).join('; ')}`);
  }

  /**
   * Uploads a large surface part by part, one task each (software rendering: an upload blocks the page for
   * its size); resolves when every part is up, with a frame requested to show them.
   */
  private async uploadSurface(s: SurfaceLayer): Promise<void> {
    while (!s.complete && this.surface === s) {
      await new Promise((r) => setTimeout(r, 0));
      if (this.surface === s) this.view.upload(s.nextParts());
    }
    this.view.requestRender();
  }

  // ---- colour ----

  /** Recolours the surface by the chosen field and tells the tools (the cut-plane recolours too). */
  async recolor(): Promise<void> {
    const s = this.surface;
    if (!s) return;
    const key = this.settings.field, source = this.fieldSources.find((x) => x.owns(key));
    this.sourceLegend = undefined;
    if (source) {
      try {
        const r = await this.track(source.resolve(key));
        if (this.surface !== s || this.settings.field !== key) return;
        if (r.kind === 'field') { await this.chooseField(r.key); return; }
        s.setValues(r.values);
        this.sourceLegend = { title: r.title, unit: r.unit };
        this.dataRange = Number.isFinite(r.values.range[0]) ? r.values.range : [0, 1];
      } catch (e) {
        if (this.settings.field !== key) return;
        this.banner.error(`Could not colour by ${key.replace(/^[a-z]+:/, '')}: ${(e as Error).message}`);
        s.setValues(null);
      }
      this.applyColorSettings();
      for (const l of this.colorListeners) l();
      return;
    }
    const choice = this.colorChoice;
    if (!choice) {
      s.setValues(null);
      this.legend.set(null);
    } else {
      try {
        const v = await this.track(timedCall('surfaceValues', () => this.compute.surfaceValues(choice), true));
        if (this.surface !== s) return;
        s.setValues(v);
        markDrawn(v, this.view.nextFrame());
        if (Number.isFinite(v.range[0])) this.dataRange = v.range;
        else {
          const f = this.fields.find((x) => x.key === this.settings.field);
          this.dataRange = f?.range ?? [0, 1];
        }
      } catch (e) {
        this.banner.error(`Could not colour by ${choice.name}: ${(e as Error).message}`);
      }
    }
    this.applyColorSettings();
    for (const l of this.colorListeners) l();
  }

  /** Range and map changes need no worker call. */
  applyColorSettings(): void {
    const [lo, hi] = this.colorRange;
    if (this.settings.autoRange) { this.settings.min = Number(lo.toPrecision(6)); this.settings.max = Number(hi.toPrecision(6)); }
    for (const c of this.colorFolder.controllersRecursive()) c.updateDisplay();
    if (this.surface) {
      this.surface.material.setRange(lo, hi);
      this.surface.material.setColorMap(this.colorMap);
    }
    this.legend.set(this.legendState());
    for (const l of this.colorSettingListeners) l();
    this.view.requestRender();
  }

  /** What the legend shows, or null without a colouring field. */
  legendState(): LegendState | null {
    const own = this.sourceLegend;
    if (own) return { title: own.title, unit: own.unit, range: this.colorRange, fixed: !this.settings.autoRange, map: this.colorMap };
    const c = this.colorChoice;
    if (!c) return null;
    const f = this.fields.find((x) => x.key === this.settings.field)!;
    const part = f.components === 1 ? '' : ` (${this.settings.component})`;
    return { title: `${c.name}${part}`, unit: fieldUnit(c.name), range: this.colorRange, fixed: !this.settings.autoRange, map: this.colorMap };
  }

  private rebuildColorPanel(): void {
    for (const c of [...this.colorFolder.controllers]) c.destroy();
    const opts: Record<string, string> = { '(none: grey)': '' };
    for (const f of this.fields) opts[`${f.name} (${f.association === 'point' ? 'points' : 'cells'})`] = f.key;
    for (const src of this.fieldSources) for (const e of src.entries()) if (!(e.label in opts)) opts[e.label] = e.key;
    // a scalar has no parts to choose: the choice shows only for a vector field
    const showPart = () => part.show((this.fields.find((f) => f.key === this.settings.field)?.components ?? 1) > 1);
    this.colorFolder.add(this.settings, 'field', opts).name('field').onChange(() => { showPart(); void this.recolor(); });
    const part = this.colorFolder.add(this.settings, 'component', [...COMPONENTS]).name('vector part').onChange(() => void this.recolor());
    showPart();
    const maps: Record<string, string> = {};
    for (const m of COLOR_MAPS) maps[m.label] = m.id;
    this.colorFolder.add(this.settings, 'map', maps).name('colour map').onChange(() => this.applyColorSettings());
    this.colorFolder.add(this.settings, 'autoRange').name('range from data').onChange(() => this.applyColorSettings());
    this.colorFolder.add(this.settings, 'min').name('range low').onFinishChange(() => { this.settings.autoRange = false; this.applyColorSettings(); });
    this.colorFolder.add(this.settings, 'max').name('range high').onFinishChange(() => { this.settings.autoRange = false; this.applyColorSettings(); });
  }

  /** Makes the surfaces see-through (so a cut or a probe inside shows). */
  setSurfaceOpacity(a: number): void {
    this.settings.opacity = a;
    this.surface?.setOpacity(a);
    this.view.requestRender();
  }

  /** Groups currently drawn. */
  readonly shownGroups = new Set<number>();

  /** Fit and presets frame the shown groups (all data when none is shown). */
  private fitToShown(): void {
    const b = SurfaceLayer.boundsOf(this.description?.groups ?? [], this.shownGroups);
    this.view.setFitBounds((b as Bounds | undefined) ?? this.bounds);
  }

  /** `shown`: the groups to show (a step of a series keeps the previous step's choice); default: all but an enclosing far field. */
  private rebuildGroupPanel(shown?: Set<number>): void {
    this.shownGroups.clear();
    this.groupFolder?.destroy();
    const d = this.description!;
    this.groupFolder = this.gui.addFolder('Surfaces');
    this.groupFolder.add(this.settings, 'edges').name('face outlines').onChange((on: boolean) => { this.surface?.setEdgesVisible(on); this.view.requestRender(); });
    this.groupFolder.add(this.settings, 'opacity', 0.1, 1, 0.05).name('surface opacity').listen()
      .onChange((a: number) => this.setSurfaceOpacity(a));
    this.groupFolder.add(this.settings, 'keepView').name('keep this view for the next file');
    const hide = enclosingGroups(d, this.bounds);
    const keep = shown && d.groups.some((g) => shown.has(g.id)) ? shown : undefined;
    for (const g of d.groups) {
      const o = { shown: keep ? keep.has(g.id) : !hide.has(g.id) };
      this.surface?.setGroupVisible(g.id, o.shown);
      if (o.shown) this.shownGroups.add(g.id); else this.shownGroups.delete(g.id);
      const label = this.groupLabel(g);
      const row = this.groupFolder.add(o, 'shown').name(`${label} (${formatNumber(g.area)} m²)`).onChange((on: boolean) => {
        this.surface?.setGroupVisible(g.id, on);
        if (on) this.shownGroups.add(g.id); else this.shownGroups.delete(g.id);
        this.fitToShown();
        this.view.requestRender();
      });
      row.domElement.dataset['group'] = g.name;
      addGroupRename(row.domElement, label, (l) => this.groupLabels.set(g.name, l));
    }
    // the surfaces folder sits right after colour
    this.gui.domElement.querySelector('.lil-children')?.insertBefore(this.groupFolder.domElement, this.colorFolder.domElement.nextSibling);
  }

  // ---- results ----

  setResult(r: ProbeResult): void {
    const prev = this.results.get(r.id);
    if (prev) r.pinVisible = prev.pinVisible;
    this.results.set(r.id, r);
    this.refreshResults();
    if (r.id === this.selectedId) this.select(r.id);
  }

  private readonly renameListeners: ((id: string, label: string) => void)[] = [];

  /** Called when the user renames a probe (each tool takes the new label for its own probe). */
  onRename(f: (id: string, label: string) => void): void { this.renameListeners.push(f); }

  /** Gives a probe a new label: the tools keep it (probe set, pins, table, CSV, reports). */
  rename(id: string, label: string): void {
    for (const f of this.renameListeners) f(id, label);
    const r = this.results.get(id);
    if (r) { r.label = label; this.refreshResults(); }
  }

  /** The probe the Delete key removes: the one last placed, edited or clicked (pin or table heading). */
  selectedId: string | undefined;

  /** Selects a probe (or none); its pin and table heading are marked. */
  select(id: string | undefined): void {
    this.selectedId = id;
    this.pins.setSelected(id);
    this.table.setSelected(id);
    if (id) document.body.dataset['selected'] = id; else delete document.body.dataset['selected'];
  }

  /** Pins placed by hand, by probe id (box corner relative to the anchor, CSS pixels); kept in the probe set. */
  get pinOffsets(): Map<string, [number, number]> { return this.pins.offsets; }

  removeResult(id: string, tellTools: boolean): void {
    if (!this.results.delete(id)) return;
    this.pins.offsets.delete(id);
    if (this.selectedId === id) this.select(undefined);
    if (tellTools) for (const l of this.resultListeners) l(id);
    this.refreshResults();
  }

  /** Every result, sorted by id, with surface groups named by their labels (what pins, table and exports show). */
  get allResults(): ProbeResult[] {
    const L = this.groupLabels;
    return [...this.results.values()].sort((a, b) => (a.id < b.id ? -1 : 1))
      .map((r) => ({ ...r, definition: L.relabel(r.definition) }));
  }

  private refreshResults(): void {
    const all = this.allResults;
    this.table.set(all);
    this.pins.setResults(all);
    this.view.requestRender();
    for (const l of this.resultsChangedListeners) l();
  }

  // ---- view tools and pointer ----

  private buildViewTools(host: HTMLElement): void {
    const presets: [ViewPreset, string, string][] = [
      ['+x', '+X', 'look from +x'], ['-x', '−X', 'look from −x'], ['+y', '+Y', 'look from +y'], ['-y', '−Y', 'look from −y'],
      ['+z', '+Z', 'look from +z'], ['-z', '−Z', 'look from −z'], ['iso', 'Iso', 'isometric view'],
    ];
    for (const [p, label, title] of presets) host.append(toolButton(label, title, () => this.view.view(p)));
    host.append(toolButton('Fit', 'fit everything in the view', () => this.view.fit()));
  }

  /**
   * While a tool drags a probe (each step recomputed and drawn) over a see-through surface, a software
   * rasteriser leaves the face outlines out: they cost about as much as the surfaces, and a drag step is
   * waited for. They come back with the frame after the drag. An opaque surface keeps them: its picture is
   * kept between the drag's frames (`ViewScene.keepStill`), outlines and all. Software frames during the
   * drag are drawn with a quarter of the pixels (`ViewScene.setDragging`).
   */
  private liveDrag(on: boolean): void {
    this.view.setDragging(on);
    if (!this.view.software || !this.surface || !this.settings.edges || this.settings.opacity >= 1) return;
    this.surface.setEdgesVisible(!on);
    this.view.requestRender();
  }

  private bindPointer(canvas: HTMLCanvasElement): void {
    const ray = new THREE.Raycaster();
    let active: PointerTool | undefined, downAt: [number, number] | undefined;
    const cast = (ev: PointerEvent) => { ray.setFromCamera(this.view.pointerNdc(ev), this.view.camera); return ray; };
    // capture phase: runs before the orbit controls, so a tool can claim the drag
    canvas.addEventListener('pointerdown', (ev) => {
      downAt = [ev.clientX, ev.clientY];
      active = this.tools.find((t) => t.down?.(ev, cast(ev)));
      if (active) { this.view.controls.enabled = false; canvas.setPointerCapture(ev.pointerId); this.liveDrag(true); }
    }, { capture: true });
    canvas.addEventListener('pointermove', (ev) => { if (active) active.move?.(ev, cast(ev)); });
    canvas.addEventListener('pointerup', (ev) => {
      const r = cast(ev);
      if (active) { active.up?.(ev, r); active = undefined; this.view.controls.enabled = true; this.liveDrag(false); }
      else if (downAt && Math.hypot(ev.clientX - downAt[0], ev.clientY - downAt[1]) < 4) this.tools.some((t) => t.click?.(ev, r));
      downAt = undefined;
    });
  }
}

/** One tiny instance of every kind of drawn object, for compiling their shaders at start. */
function warmUpObjects(map: ColorMap): THREE.Object3D[] {
  const tri = () => ({ positions: new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]), normals: new Float32Array([0, 0, 1, 0, 0, 1, 0, 0, 1]), groups: new Float32Array(3) });
  const box: [number, number, number, number, number, number] = [0, 1, 0, 1, 0, 0];
  const drawing = () => ({ ...tri(), edges: new Float32Array(6), edgeGroups: new Float32Array(2), edgeShares: new Float32Array([1, 1]), box, outline: { positions: new Float32Array(6), groups: new Int32Array(1) } });
  const surface = new SurfaceLayer(drawing(), map, 1);
  surface.setGroupSelected(0, true);
  const seeThrough = new SurfaceLayer(drawing(), map, 1);
  seeThrough.setOpacity(0.35);
  const plane = new CutPlaneLayer(map, 1);
  plane.setTriangles({ ...tri(), values: new Float32Array(3), range: [0, 1] }, true);
  plane.setSeed([0, 0, 0]);
  const line = new LineProbeWidget(1);
  line.set([0, 0, 0], [1, 1, 1]);
  return [surface.group, seeThrough.group, plane.group, line.group];
}

function toolButton(label: string, title: string, f: () => void): HTMLButtonElement {
  const b = document.createElement('button');
  b.type = 'button';
  b.textContent = label;
  b.title = title;
  b.onclick = f;
  return b;
}

/** Fields offered for colouring: every point and cell array with 1–3 components (vectors by part). */
function fieldEntries(r: LoadReport): FieldEntry[] {
  const out: FieldEntry[] = [];
  for (const a of [...r.pointData, ...r.cellData]) {
    if (a.components > 3 || a.pieces !== r.pieces) continue;
    const association = a.association === 'point' ? 'point' : 'cell';
    out.push({ key: `${association}:${a.name}`, name: a.name, association, components: a.components, range: a.range });
  }
  return out;
}

/**
 * Groups hidden at first: an outer boundary that encloses everything else (its bounds are the data's
 * bounds while another group lies wholly inside), so a body inside a far field is visible on opening.
 */
function enclosingGroups(d: Description, b: Bounds): Set<number> {
  const tol = 1e-6 * Math.hypot(b[1] - b[0], b[3] - b[2], b[5] - b[4]);
  const touchesAll = (g: Bounds) => [0, 1, 2, 3, 4, 5].every((i) => Math.abs(g[i]! - b[i]!) <= tol);
  const inside = (g: Bounds) => [0, 2, 4].every((i) => g[i]! > b[i]! + tol) && [1, 3, 5].every((i) => g[i]! < b[i]! - tol);
  const hasInner = d.groups.some((g) => inside(g.bounds));
  return new Set(hasInner ? d.groups.filter((g) => touchesAll(g.bounds)).map((g) => g.id) : []);
}

function summaryLine(d: Description): string {
  const r = d.report;
  return `${r.source} — ${r.cells.toLocaleString('en')} cells, ${r.points.toLocaleString('en')} points, ${r.pieces} piece${r.pieces === 1 ? '' : 's'} — ${formatBytes(d.fileBytes)} read in ${d.loadSeconds.toFixed(2)} s`;
}
