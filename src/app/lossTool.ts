/**
 * Pressure loss between two cut-planes: the static and total pressure drop and the loss coefficient
 * K = Δp₀/(½ρV²), with the plane whose dynamic pressure K was made with said on the pin. Evaluated by the
 * study layer's `evaluateLoss` (the `loss` verb's path); the pin points between the two planes' centroids.
 * The planes are the view's cut-planes (existing or new), followed as they move.
 */
import type { ProbeOutcome } from '../study/evaluate.ts';
import type { PressureLossProbe, Probe } from '../study/probeSet.ts';
import type { ProbeResult } from '../ui/results.ts';
import { CompositeTool, type CompositeItem } from './compositeTool.ts';
import { outcomeResult } from './outcomeResult.ts';
import { linkFor, refreshLink, type PlaneLink } from './planeLinks.ts';
import type { PlaneTool } from './planeTool.ts';
import type { ReferenceTool } from './referenceTool.ts';
import type { Viewer } from './viewer.ts';

interface Loss extends CompositeItem {
  upstream: PlaneLink;
  downstream: PlaneLink;
  /** The plane whose ½ρV² K is made with. */
  dynamicFrom: 'upstream' | 'downstream';
  /** Field roles and options as a loaded set gave them (kept as they are), or the cut-plane tool's field choice at creation. */
  fields: PressureLossProbe['fields'];
  options: PressureLossProbe['options'];
}

/** Pin rows of a loss, in order. */
const PINNED = ['totalPressureLoss', 'staticPressureDrop.massFlowWeighted', 'lossCoefficient', 'dynamicPressure'];

export class LossTool extends CompositeTool<Loss> {
  constructor(v: Viewer, planes: PlaneTool, refs: ReferenceTool) {
    super(v, planes, refs, 'Pressure loss', 'loss', 'Pressure loss');
    this.buildPanel();
  }

  /** A new loss on the first two cut-planes; missing ones are made at a quarter and three quarters of the data. */
  protected newItem(id: string, number: number, label: string): Loss {
    while (this.planes.list().length < 2) this.planes.addAt(this.planes.list().length === 0 ? 0.25 : 0.75);
    const [a, b] = this.planes.list();
    const f = this.planes.fieldChoice();
    return {
      id, number, label, upstream: { planeId: a!.id, plane: a!.plane }, downstream: { planeId: b!.id, plane: b!.plane }, dynamicFrom: 'upstream',
      fields: Object.keys(f).length ? f : undefined, options: undefined,
    };
  }

  accepts(p: Probe): p is PressureLossProbe {
    return p.kind === 'pressure-loss';
  }

  addFrom(p: Probe): void {
    if (!this.accepts(p)) return;
    const list = this.planes.list();
    const number = Math.max(0, ...this.items.map((x) => x.number)) + 1;
    this.push({
      id: p.id, number, label: p.label ?? p.id, upstream: linkFor(p.geometry.upstream, list), downstream: linkFor(p.geometry.downstream, list),
      dynamicFrom: p.options?.dynamicPressureFrom ?? 'upstream', fields: p.fields, options: p.options,
    });
  }

  protected refreshLinks(x: Loss): void {
    const list = this.planes.list();
    x.upstream = refreshLink(x.upstream, list);
    x.downstream = refreshLink(x.downstream, list);
  }

  protected probeOf(x: Loss): PressureLossProbe {
    return {
      id: x.id, kind: 'pressure-loss', label: x.label, geometry: { upstream: x.upstream.plane, downstream: x.downstream.plane },
      ...(x.fields ? { fields: x.fields } : {}), options: { ...x.options, dynamicPressureFrom: x.dynamicFrom },
    };
  }

  protected resultOf(o: ProbeOutcome, x: Loss): ProbeResult {
    const name = (l: PlaneLink) => this.planes.list().find((p) => p.id === l.planeId)?.label ?? 'its own plane';
    const which = x.dynamicFrom === 'upstream' ? x.upstream : x.downstream;
    const q = `½ρV² ${x.dynamicFrom} (${name(which)})`;
    return outcomeResult(o, [0, 0, 0], {
      pinned: PINNED, origin: ` — ${name(x.upstream)} → ${name(x.downstream)}`,
      labels: { lossCoefficient: `K on ½ρV² ${x.dynamicFrom}`, dynamicPressure: q },
    });
  }

  protected buildItemPanel(x: Loss): void {
    this.planeChoice('upstream plane', () => x.upstream, (l) => { x.upstream = l; }, 0.25);
    this.planeChoice('downstream plane', () => x.downstream, (l) => { x.downstream = l; }, 0.75);
    this.folder.add(x, 'dynamicFrom', { 'upstream plane': 'upstream', 'downstream plane': 'downstream' }).name('K made with ½ρV² of')
      .onChange(() => this.evaluate());
    this.folder.add(x, 'label').name('label').onFinishChange(() => { this.buildPanel(); this.evaluate(); });
    this.note('Δp₀ = mass-flow-weighted total pressure upstream − downstream (positive: a loss); K = Δp₀/(½ρV²), V = |Q|/A on the chosen plane; ρ from the reference conditions unless the file has a density field. Move the planes with the cut-plane tool.');
  }
}
