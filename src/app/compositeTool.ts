/**
 * What the pressure-loss and flow-split tools share: a list of probes built on the view's cut-planes
 * (`planeLinks.ts`), each evaluated by the study layer's evaluator in the worker — all of a tool's probes
 * in one set per request, on the reference conditions, so the numbers are the command line's — and
 * re-evaluated when a plane they follow moves, the reference conditions change or a probe is edited.
 */
import type GUI from 'lil-gui';
import type { ProbeOutcome } from '../study/evaluate.ts';
import { PROBE_SET_FORMAT, PROBE_SET_VERSION, type Probe } from '../study/probeSet.ts';
import type { ProbeResult } from '../ui/results.ts';
import { latestWins } from './latestWins.ts';
import { NEW_PLANE, OWN_POSITION, planeOptions, refreshLink, type PlaneLink } from './planeLinks.ts';
import type { PlaneTool } from './planeTool.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

/** What every composite probe of the app has. */
export interface CompositeItem {
  id: string;
  number: number;
  label: string;
}

export abstract class CompositeTool<T extends CompositeItem> {
  protected items: T[] = [];
  protected current: T | undefined;
  protected readonly folder: GUI;
  private readonly request;
  /** Keeps a plane link's select in step when the planes change. */
  private planeCount = -1;

  constructor(protected readonly v: Viewer, protected readonly planes: PlaneTool, protected readonly refs: ReferenceTool,
    title: string, private readonly idPrefix: string, private readonly labelPrefix: string) {
    this.folder = v.gui.addFolder(title);
    this.request = latestWins(
      (probes: Probe[]) => v.track(v.compute.evaluateProbeSet({ format: PROBE_SET_FORMAT, version: PROBE_SET_VERSION, reference: refs.doc(), probes })),
      (ev) => {
        for (const o of ev.probes) {
          const item = this.items.find((x) => x.id === o.id);
          if (item) v.setResult(this.resultOf(o, item));
        }
      },
      (e) => v.banner.error(`${title}: ${(e as Error).message}`),
    );
    v.onDataset(() => { this.removeAll(); this.buildPanel(); });
    v.onResultRemoved((id) => this.remove(id));
    v.onRename((id, label) => { const x = this.items.find((i) => i.id === id); if (x) { x.label = label; this.buildPanel(); } });
    planes.onPlanesChanged(() => {
      if (this.items.length === 0) return;
      for (const x of this.items) this.refreshLinks(x);
      // a plane added or removed changes the choices offered
      if (this.planes.list().length !== this.planeCount) this.buildPanel();
      this.evaluate();
    });
    refs.onChange(() => this.evaluate());
  }

  /** The probe-set probe of an item (geometry from its planes as they are now). */
  protected abstract probeOf(item: T): Probe;
  /** The table row and pin of an item's outcome. */
  protected abstract resultOf(o: ProbeOutcome, item: T): ProbeResult;
  /** The panel rows of the current item. */
  protected abstract buildItemPanel(item: T): void;
  /** Takes the linked planes' geometry into the item. */
  protected abstract refreshLinks(item: T): void;
  /** A new item, or undefined (with a message) when it cannot be made. */
  protected abstract newItem(id: string, number: number, label: string): T | undefined;
  /** True when a probe-set probe is one this tool holds. */
  abstract accepts(p: Probe): boolean;
  /** Adds an item from a probe-set probe (see `accepts`). */
  abstract addFrom(p: Probe): void;

  /** The items as probe-set probes. */
  probes(): Probe[] { return this.items.map((x) => this.probeOf(x)); }

  /** Removes every item. */
  removeAll(): void { for (const x of [...this.items]) this.remove(x.id); }

  /** Adds a new item and selects it. */
  add(): void {
    const number = Math.max(0, ...this.items.map((x) => x.number)) + 1;
    const used = new Set(this.v.allResults.map((r) => r.id));
    let n = number;
    while (used.has(`${this.idPrefix}-${n}`)) n++;
    const item = this.newItem(`${this.idPrefix}-${n}`, number, `${this.labelPrefix} ${number}`);
    if (!item) return;
    this.push(item);
  }

  protected push(item: T): void {
    this.items.push(item);
    this.current = item;
    this.v.select(item.id);
    this.buildPanel();
    this.evaluate();
  }

  protected remove(id: string): void {
    const x = this.items.find((i) => i.id === id);
    if (!x) return;
    this.items = this.items.filter((i) => i !== x);
    this.v.removeResult(id, false);
    if (this.current === x) { this.current = this.items.at(-1); this.buildPanel(); }
  }

  /** Evaluates every item (one worker call; the latest request wins). */
  protected evaluate(): void {
    if (this.items.length === 0 || !this.v.description) return;
    this.request.request(this.items.map((x) => this.probeOf(x)));
  }

  /** A plane choice row: follows the chosen cut-plane; "+ new cut-plane" makes one at `fraction` of the data. */
  protected planeChoice(label: string, get: () => PlaneLink, set: (l: PlaneLink) => void, fraction: number): void {
    const link = get();
    const o = { which: link.planeId ?? OWN_POSITION };
    this.folder.add(o, 'which', planeOptions(this.planes.list(), link)).name(label).onChange((id: string) => {
      if (id === OWN_POSITION) return;
      const planeId = id === NEW_PLANE ? this.planes.addAt(fraction) : id;
      set(refreshLink({ planeId, plane: get().plane }, this.planes.list()));
      this.buildPanel();
      this.evaluate();
    });
  }

  /** Rebuilds the folder: the add button, the item choice, the current item's rows. */
  protected buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    for (const f of [...this.folder.folders]) f.destroy();
    this.folder.domElement.querySelectorAll('.panel-note').forEach((n) => n.remove());
    this.planeCount = this.planes.list().length;
    this.folder.add({ add: () => this.add() }, 'add').name(`+ new ${this.labelPrefix.toLowerCase()}`);
    const x = this.current;
    if (!x) return;
    if (this.items.length > 1) {
      const opts: Record<string, string> = {};
      for (const i of this.items) opts[i.label] = i.id;
      this.folder.add({ which: x.id }, 'which', opts).name('editing').onChange((id: string) => {
        this.current = this.items.find((i) => i.id === id);
        this.v.select(this.current?.id);
        this.buildPanel();
      });
    }
    this.buildItemPanel(x);
  }

  /** A short explanation under the folder's rows. */
  protected note(text: string): void {
    const n = document.createElement('div');
    n.className = 'panel-note';
    n.textContent = text;
    this.folder.domElement.querySelector('.lil-children')?.append(n);
  }
}
