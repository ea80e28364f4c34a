/**
 * Flow split and mass balance over a control volume bounded by cut-planes and boundary surface groups:
 * each part's flux (outward positive), the net, the imbalance as a share of the inflow, and each outlet's
 * share of the inflow. Evaluated by the study layer's `evaluateBalance` (the `balance` verb's path). Each
 * cut-plane takes part with its normal pointing out of the volume or into it (then reversed for the
 * balance, which wants outward normals); surface groups are oriented out of the fluid already. Groups are
 * ticked in a list, or added by what they are (name, box, area: `groupChoiceFolder.ts`), which the set keeps.
 */
import { describeSelector } from '../surface/groupSelect.ts';
import type { ProbeOutcome } from '../study/evaluate.ts';
import type { MassBalanceProbe, Probe, SurfaceRef } from '../study/probeSet.ts';
import type { ProbeResult } from '../ui/results.ts';
import { CompositeTool, type CompositeItem } from './compositeTool.ts';
import { addGroupChoice, emptyChoice } from './groupChoiceFolder.ts';
import { outcomeResult } from './outcomeResult.ts';
import { linkFor, refreshLink, reversed, type PlaneLink } from './planeLinks.ts';
import type { PlaneTool } from './planeTool.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

/** A plane of the split: its link and whether its normal points out of the control volume. */
interface SplitPlane {
  link: PlaneLink;
  outward: boolean;
}

interface Split extends CompositeItem {
  planes: SplitPlane[];
  /** Surface groups by name, or by file id where names repeat (as the probe set writes them). */
  surfaces: SurfaceRef[];
  /** Field roles and grouping options as a loaded set gave them (kept as they are), or the cut-plane tool's field choice at creation. */
  fields: MassBalanceProbe['fields'];
  options: MassBalanceProbe['options'];
}

/** Most surface groups listed as check boxes (more: pick them by clicking for a force total, or by a probe set). */
const MAX_GROUP_ROWS = 12;

export class SplitTool extends CompositeTool<Split> {
  /** The "by what they are" fields. */
  private readonly choice = emptyChoice();

  constructor(v: Viewer, planes: PlaneTool, refs: ReferenceTool) {
    super(v, planes, refs, 'Flow split / balance', 'split', 'Flow split');
    // the group rows and the parts' names in the result show the groups' labels
    v.groupLabels.onChange(() => { this.buildPanel(); this.evaluate(); });
    this.buildPanel();
  }

  /** A new split over every cut-plane, normals taken as pointing out of the volume. */
  protected newItem(id: string, number: number, label: string): Split | undefined {
    const list = this.planes.list();
    if (list.length === 0) this.planes.addAt(0.5);
    const f = this.planes.fieldChoice();
    return {
      id, number, label, planes: this.planes.list().map((p) => ({ link: { planeId: p.id, plane: p.plane }, outward: true })), surfaces: [],
      fields: Object.keys(f).length ? f : undefined, options: undefined,
    };
  }

  /** Any mass balance; one with its own surface grouping lists no group rows (its groups are not the view's). */
  accepts(p: Probe): p is MassBalanceProbe {
    return p.kind === 'mass-balance';
  }

  addFrom(p: Probe): void {
    if (!this.accepts(p)) return;
    const list = this.planes.list();
    const planes: SplitPlane[] = p.geometry.planes.map((pl) => {
      // a plane of the set that is a view plane reversed takes part with its normal into the volume
      const direct = linkFor(pl, list);
      if (direct.planeId !== undefined) return { link: direct, outward: true };
      const back = linkFor(reversed(pl), list);
      return back.planeId !== undefined ? { link: back, outward: false } : { link: direct, outward: true };
    });
    const number = Math.max(0, ...this.items.map((x) => x.number)) + 1;
    this.push({ id: p.id, number, label: p.label ?? p.id, planes, surfaces: [...(p.geometry.surfaces ?? [])], fields: p.fields, options: p.options });
  }

  protected refreshLinks(x: Split): void {
    const list = this.planes.list();
    for (const p of x.planes) p.link = refreshLink(p.link, list);
  }

  protected probeOf(x: Split): MassBalanceProbe {
    return {
      id: x.id, kind: 'mass-balance', label: x.label,
      geometry: { planes: x.planes.map((p) => (p.outward ? p.link.plane : reversed(p.link.plane))), ...(x.surfaces.length ? { surfaces: [...x.surfaces] } : {}) },
      ...(x.fields ? { fields: x.fields } : {}), ...(x.options ? { options: x.options } : {}),
    };
  }

  /** Names of the parts in the evaluator's order: planes, then surfaces. */
  private partNames(x: Split): string[] {
    const list = this.planes.list();
    return [
      ...x.planes.map((p) => `${list.find((q) => q.id === p.link.planeId)?.label ?? 'own plane'}${p.outward ? '' : ' (normal reversed)'}`),
      ...x.surfaces.map((s) => this.surfaceName(s)),
    ];
  }

  /** A surface reference as shown: a group's label for its name or file id; as written otherwise. */
  private surfaceName(s: SurfaceRef): string {
    if (typeof s === 'object') return describeSelector(s);
    const g = this.v.description?.groups.find((y) => y.name === String(s)) ?? (typeof s === 'number' ? this.v.description?.groups.find((y) => y.fileId === s) : undefined);
    return g ? this.v.groupLabel(g) : String(s);
  }

  protected resultOf(o: ProbeOutcome, x: Split): ProbeResult {
    const names = this.partNames(x);
    const sym = o.quantities.find((q) => q.key === 'net')?.unit === 'm³/s' ? 'Q' : 'ṁ';
    const labels: Record<string, string> = {};
    const shares: string[] = [];
    names.forEach((n, i) => {
      labels[`item${i + 1}.flux`] = `${sym} ${n} (outward)`;
      labels[`item${i + 1}.outflowShare`] = `${n} share of inflow`;
      if (o.quantities.some((q) => q.key === `item${i + 1}.outflowShare`)) shares.push(`item${i + 1}.outflowShare`);
    });
    return outcomeResult(o, [0, 0, 0], { pinned: ['imbalanceShare', 'inflow', ...shares.slice(0, 4)], labels, origin: ` — parts: ${names.join(', ')}` });
  }

  protected buildItemPanel(x: Split): void {
    const list = this.planes.list();
    for (const p of list) {
      const part = x.planes.find((q) => q.link.planeId === p.id);
      const o = { use: part ? (part.outward ? 'out' : 'in') : 'no' };
      this.folder.add(o, 'use', { 'not used': 'no', 'normal points out of the volume': 'out', 'normal points into the volume': 'in' }).name(p.label)
        .onChange((use: string) => {
          // a plane keeps its place among the parts (the item numbers of the result follow it)
          const i = x.planes.findIndex((q) => q.link.planeId === p.id);
          const entry = { link: { planeId: p.id, plane: p.plane }, outward: use === 'out' };
          if (use === 'no') { if (i >= 0) x.planes.splice(i, 1); } else if (i >= 0) x.planes[i] = entry; else x.planes.push(entry);
          this.evaluate();
        });
    }
    const own = x.planes.filter((p) => p.link.planeId === undefined).length;
    // a split with its own grouping names groups the view does not show
    const groups = x.options ? [] : this.v.description?.groups ?? [];
    for (const g of groups.slice(0, MAX_GROUP_ROWS)) {
      const ref = groups.filter((y) => y.name === g.name).length === 1 ? g.name : g.fileId;
      const o = { on: x.surfaces.some((s) => String(s) === String(ref)) };
      this.folder.add(o, 'on').name(`surface ${this.v.groupLabel(g)}`).onChange((on: boolean) => {
        x.surfaces = x.surfaces.filter((s) => String(s) !== String(ref));
        if (on) x.surfaces.push(ref);
        this.evaluate();
      });
    }
    // surfaces added by what they are: unticking one takes it out
    for (const s of x.surfaces) {
      if (typeof s !== 'object') continue;
      this.folder.add({ on: true }, 'on').name(`surfaces ${describeSelector(s)}`).onChange(() => {
        x.surfaces = x.surfaces.filter((r) => r !== s);
        this.buildPanel();
        this.evaluate();
      });
    }
    if (!x.options) {
      addGroupChoice(this.folder, this.choice, 'add matching surfaces', () => this.v.description?.groups ?? [], (sel) => {
        if (!x.surfaces.some((r) => JSON.stringify(r) === JSON.stringify(sel))) x.surfaces.push(sel);
        this.buildPanel();
        this.evaluate();
      }, (m) => this.v.banner.error(`Flow split: ${m}`));
    }
    this.folder.add(x, 'label').name('label').onFinishChange(() => { this.buildPanel(); this.evaluate(); });
    this.note(`Fluxes are outward from the volume: inflow negative. Imbalance = net / inflow; an outlet's share = its outflow / the inflow.${own ? ` ${own} plane(s) of the loaded set keep their own position.` : ''}${groups.length > MAX_GROUP_ROWS ? ` Only the first ${MAX_GROUP_ROWS} surface groups are listed.` : ''}`);
  }
}
