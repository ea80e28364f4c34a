/**
 * Line probes: a segment with draggable end points (or typed ones), sampled in the worker as it moves
 * (latest request wins), drawn as a chart with a field choice and downloadable as CSV. Each line's
 * numbers (length inside the mesh, means along it) go to the pins and the table.
 */
import type GUI from 'lil-gui';
import type * as THREE from 'three';
import type { LineReply, Vec3 } from '../../workers/api.ts';
import type { LineProbe, Probe } from '../study/probeSet.ts';
import { download } from '../ui/download.ts';
import { formatVec, roundToScale } from '../ui/format.ts';
import { CAUTION } from '../study/caution.ts';
import { lineSamplesCsv } from '../ui/lineCsv.ts';
import { profileSvg } from '../ui/profileSvg.ts';
import { LineChart, type ChartData } from '../ui/lineChart.ts';
import { classifyNotes } from '../ui/notes.ts';
import type { ProbeResult, Quantity } from '../ui/results.ts';
import { UNITS, fieldUnit } from '../ui/units.ts';
import { assignNoiseScales, sampleScale } from '../ui/roundingNoise.ts';
import { LineProbeWidget } from '../view/lineProbeWidget.ts';
import { markDrawn, timedCall } from './callTiming.ts';
import { latestWinsPerKey } from './latestWins.ts';
import type { Viewer } from './viewer.ts';

/** Samples per line at first (evenly spaced, both ends included). */
export const DEFAULT_SAMPLES = 201;

/** Most samples the panel offers. */
const MAX_SAMPLES = 5000;

interface Line {
  id: string;
  number: number;
  label: string;
  widget: LineProbeWidget;
  ax: number; ay: number; az: number;
  bx: number; by: number; bz: number;
  samples: number;
  reply?: LineReply;
}

export class LineTool {
  private lines: Line[] = [];
  private current: Line | undefined;
  private readonly folder: GUI;
  private readonly request;
  private dragged: Line | undefined;
  /** The baseline file's samples of each line, by geometry and sample count. */
  private baselines: { file: string; lines: Map<string, LineReply> } | undefined;

  constructor(private readonly v: Viewer, private readonly chart: LineChart) {
    this.folder = v.gui.addFolder('Line probe');
    // one lane per probe: several probes computed at once never drop each other's requests
    this.request = latestWinsPerKey((x: { id: string }) => x.id,
      (l: Line) => v.track(timedCall('sample', () => v.compute.sample({ from: [l.ax, l.ay, l.az], to: [l.bx, l.by, l.bz], samples: l.samples }), true, l.id)),
      (reply, l) => this.show(l, reply),
      (e) => { v.banner.error(`Line probe: ${(e as Error).message}`); v.view.releaseFrames(); },
    );
    chart.download.onclick = () => this.downloadCsv();
    v.onDataset(() => { this.removeAll(); this.buildPanel(); });
    v.onResultRemoved((id) => this.remove(id));
    // derived or formula fields attached: every line samples them too
    v.onFields(() => { for (const l of this.lines) this.request.request(l); });
    v.onRename((id, label) => { const l = this.lines.find((x) => x.id === id); if (l) { l.label = label; this.buildPanel(); this.chart.set(this.chartData(this.current)); } });
    v.addPointerTool(this.pointer());
    this.buildPanel();
  }

  /** Removes every line. */
  removeAll(): void {
    for (const l of [...this.lines]) this.remove(l.id);
  }

  /** True when a probe-set probe is a line this tool can hold and edit (evenly spaced samples, every field, no boundary layer). */
  accepts(p: Probe): p is LineProbe {
    if (p.kind !== 'line') return false;
    const o = p.options ?? {};
    return !p.fields?.sample && (o.spacing ?? 'even') === 'even' && o.tolerance === undefined && !o.boundaryLayer && (o.samples ?? DEFAULT_SAMPLES) <= MAX_SAMPLES;
  }

  /** The lines as probe-set probes (file's length unit). */
  probes(): LineProbe[] {
    return this.lines.map((l) => ({
      id: l.id, kind: 'line', label: l.label, geometry: { from: [l.ax, l.ay, l.az], to: [l.bx, l.by, l.bz] }, options: { samples: l.samples },
    }));
  }

  /** Adds a line from a probe-set probe (see `accepts`), keeping its id and label. */
  addFrom(probe: LineProbe): void {
    const { from: a, to: b } = probe.geometry;
    const number = Math.max(0, ...this.lines.map((l) => l.number)) + 1;
    const l: Line = {
      id: probe.id, number, label: probe.label ?? probe.id, widget: new LineProbeWidget(this.v.diagonal),
      ax: a[0], ay: a[1], az: a[2], bx: b[0], by: b[1], bz: b[2], samples: probe.options?.samples ?? DEFAULT_SAMPLES,
    };
    this.lines.push(l);
    this.v.view.root.add(l.widget.group);
    this.current = l;
    this.v.select(l.id);
    this.buildPanel();
    this.changed(l);
  }

  /** Adds a line across the shown geometry's centre along its shortest side, spanning the data. */
  add(): void {
    const b = this.v.bounds, { center } = this.v.view.extent;
    const sides = [b[1] - b[0], b[3] - b[2], b[5] - b[4]];
    const axis = sides.indexOf(Math.min(...sides));
    const a: Vec3 = [center.x, center.y, center.z], e: Vec3 = [center.x, center.y, center.z];
    a[axis] = b[2 * axis]!; e[axis] = b[2 * axis + 1]!;
    // 6 significant figures of the geometry's size: the panel shows exactly what is sampled, without binary noise
    const r = (x: number) => roundToScale(x, this.v.diagonal);
    let number = Math.max(0, ...this.lines.map((l) => l.number)) + 1;
    const used = new Set(this.v.allResults.map((r) => r.id));
    while (used.has(`line-${number}`)) number++;
    const l: Line = {
      id: `line-${number}`, number, label: `Line ${number}`, widget: new LineProbeWidget(this.v.diagonal),
      ax: r(a[0]), ay: r(a[1]), az: r(a[2]), bx: r(e[0]), by: r(e[1]), bz: r(e[2]), samples: DEFAULT_SAMPLES,
    };
    // the new line is first drawn with its samples' pin
    this.v.view.holdFrames();
    this.lines.push(l);
    this.v.view.root.add(l.widget.group);
    this.current = l;
    this.v.select(l.id);
    this.buildPanel();
    this.changed(l);
  }

  private remove(id: string): void {
    const l = this.lines.find((x) => x.id === id);
    if (!l) return;
    this.v.view.root.remove(l.widget.group);
    this.lines = this.lines.filter((x) => x !== l);
    this.v.removeResult(id, false);
    if (this.current === l) { this.current = this.lines.at(-1); this.buildPanel(); this.chart.set(this.chartData(this.current)); }
    this.v.view.requestRender();
  }

  private changed(l: Line): void {
    l.widget.set([l.ax, l.ay, l.az], [l.bx, l.by, l.bz]);
    for (const c of this.folder.controllersRecursive()) c.updateDisplay();
    this.v.view.requestRender();
    this.request.request(l);
  }

  private show(l: Line, reply: LineReply): void {
    if (!this.lines.includes(l)) return;
    l.reply = reply;
    this.v.setResult(lineResult(l, reply));
    if (l === this.current) this.chart.set(this.chartData(l));
    markDrawn(reply, this.v.view.nextFrame());
    this.v.view.releaseFrames();
  }

  private chartData(l: Line | undefined): ChartData | undefined {
    const r = l?.reply;
    if (!l || !r || r.outside) return undefined;
    const b = this.baselines?.lines.get(geometryKey(l));
    return {
      key: l.id, title: l.label, s: r.s, x: r.x, y: r.y, z: r.z, series: chartSeries(r),
      ...(b ? { baseline: { file: this.baselines!.file, s: b.s, x: b.x, y: b.y, z: b.z, series: chartSeries(b) } } : {}),
    };
  }

  /**
   * Every line's samples for a report: `<id>-samples.csv` (every column, headed with units) and one SVG profile
   * per field against the arc length (`<id>-<field>.svg`: a scalar, or a vector's magnitude and components).
   */
  reportFiles(): Record<string, Uint8Array> {
    const enc = new TextEncoder(), out: Record<string, Uint8Array> = {};
    const safe = (t: string) => t.replace(/[^\w.-]+/g, '-');
    for (const l of this.lines) {
      const r = l.reply;
      if (!r || r.outside) continue;
      out[`${safe(l.id)}-samples.csv`] = enc.encode(lineSamplesCsv(l.label, [l.ax, l.ay, l.az], [l.bx, l.by, l.bz], r));
      const all = chartSeries(r);
      for (const f of r.fields) {
        const series = all.filter((x) => x.label === `|${f.name}|` || f.labels.includes(x.label));
        out[`${safe(l.id)}-${safe(f.name)}.svg`] = enc.encode(profileSvg({
          title: `${l.label}: ${f.name} along the line`, xName: 'arc length s', xUnit: 'm', x: r.s, series, caution: CAUTION,
        }));
      }
    }
    return out;
  }

  /** Keeps every line's samples on the open file as the baseline its chart overlays (the same line on a later file). */
  keepBaseline(file: string): void {
    const lines = new Map<string, LineReply>();
    for (const l of this.lines) if (l.reply && !l.reply.outside) lines.set(geometryKey(l), l.reply);
    this.baselines = { file, lines };
  }

  /** Forgets the baseline's lines. */
  clearBaseline(): void {
    this.baselines = undefined;
    this.chart.set(this.chartData(this.current));
  }

  private downloadCsv(): void {
    const l = this.current, r = l?.reply;
    if (!l || !r) return;
    download(`line-${l.number}.csv`, lineSamplesCsv(l.label, [l.ax, l.ay, l.az], [l.bx, l.by, l.bz], r), 'text/csv');
  }

  private buildPanel(): void {
    for (const c of [...this.folder.controllers]) c.destroy();
    this.folder.add({ add: () => this.add() }, 'add').name('+ new line probe');
    const l = this.current;
    if (!l) return;
    if (this.lines.length > 1) {
      const opts: Record<string, string> = {};
      for (const x of this.lines) opts[x.label] = x.id;
      this.folder.add({ which: l.id }, 'which', opts).name('editing').onChange((id: string) => {
        this.current = this.lines.find((x) => x.id === id);
        this.v.select(this.current?.id);
        this.buildPanel();
        this.chart.set(this.chartData(this.current));
      });
    }
    const num = (k: 'ax' | 'ay' | 'az' | 'bx' | 'by' | 'bz', label: string) => this.folder.add(l, k).name(label).onFinishChange(() => this.changed(l));
    num('ax', 'start x [m]'); num('ay', 'start y [m]'); num('az', 'start z [m]');
    num('bx', 'end x [m]'); num('by', 'end y [m]'); num('bz', 'end z [m]');
    this.folder.add(l, 'samples', 2, MAX_SAMPLES, 1).name('samples').onFinishChange(() => this.changed(l));
  }

  private pointer() {
    return {
      down: (_ev: PointerEvent, ray: THREE.Raycaster): boolean => {
        const l = this.lines.find((x) => x.widget.startDrag(ray, this.v.view.camera));
        if (!l) return false;
        this.dragged = l;
        if (this.current !== l) { this.current = l; this.buildPanel(); this.chart.set(this.chartData(l)); }
        this.v.select(l.id);
        return true;
      },
      move: (_ev: PointerEvent, ray: THREE.Raycaster): void => {
        const l = this.dragged;
        if (!l || !l.widget.drag(ray)) return;
        const r = (x: number) => roundToScale(x, this.v.diagonal);
        [l.ax, l.ay, l.az] = l.widget.from.map(r) as [number, number, number];
        [l.bx, l.by, l.bz] = l.widget.to.map(r) as [number, number, number];
        this.changed(l);
      },
      up: (): void => { this.dragged?.widget.endDrag(); this.dragged = undefined; },
    };
  }
}

/** A line's identity across files: its ends and sample count. */
function geometryKey(l: Line): string {
  return [l.ax, l.ay, l.az, l.bx, l.by, l.bz, l.samples].join(',');
}

/** Every sampled column for the chart: scalars, vector components and magnitudes. */
function chartSeries(r: LineReply): ChartData['series'] {
  const series: ChartData['series'] = [];
  for (const f of r.fields) {
    const unit = fieldUnit(f.name);
    if (f.components > 1) {
      const mag = new Float64Array(r.count);
      for (let i = 0; i < r.count; i++) {
        let s2 = 0;
        for (const c of f.columns) s2 += c[i]! * c[i]!;
        mag[i] = Math.sqrt(s2);
      }
      series.push({ label: `|${f.name}|`, unit, values: mag });
    }
    f.columns.forEach((c, k) => series.push({ label: f.labels[k]!, unit, values: c }));
  }
  return series;
}

/** The numbers of a line for pins, table and exports. */
function lineResult(l: Line, r: LineReply): ProbeResult {
  const definition = `${formatVec([l.ax, l.ay, l.az])} → ${formatVec([l.bx, l.by, l.bz])} m, ${l.samples} samples`;
  const mid: Vec3 = [(l.ax + l.bx) / 2, (l.ay + l.by) / 2, (l.az + l.bz) / 2];
  const base = { id: l.id, kind: 'line' as const, label: l.label, anchor: [l.bx, l.by, l.bz] as Vec3, definition, pinVisible: true };
  if (r.outside) return { ...base, anchor: mid, quantities: [], notes: classifyNotes(['the line lies wholly outside the mesh: no samples']) };
  const q: Quantity[] = [
    { key: 'length', label: 'L', value: r.length, unit: UNITS.length, pinned: false },
    { key: 'coveredLength', label: 'L inside the mesh', value: r.stats.coveredLength, unit: UNITS.length, pinned: true },
  ];
  let pinnedMeans = 0;
  for (const s of r.stats.series) {
    if (s.component >= 0 && r.fields.find((f) => f.name === s.field)!.components > 1) {
      // a component's mean has no extremes in the table: its scale is the vector's largest magnitude on the
      // line (a cross-flow component that is zero by symmetry is noise beside the flow, not beside itself)
      const magnitude = r.stats.series.find((m) => m.field === s.field && m.component === -1);
      const scale = magnitude ? sampleScale(0, magnitude.stats.max, magnitude.label, 'on the line') : sampleScale(s.stats.min, s.stats.max, s.label, 'on the line');
      q.push({ key: `${s.label}.mean`, label: `${s.label} mean`, value: s.stats.mean, unit: fieldUnit(s.field), pinned: false, ...(scale ? { scale } : {}) });
      continue;
    }
    const unit = fieldUnit(s.field);
    q.push({ key: `${s.label}.mean`, label: `${s.label} mean`, value: s.stats.mean, unit, pinned: pinnedMeans++ < 2 });
    q.push({ key: `${s.label}.min`, label: `${s.label} min`, value: s.stats.min, unit, pinned: false });
    q.push({ key: `${s.label}.max`, label: `${s.label} max`, value: s.stats.max, unit, pinned: false });
  }
  const gaps = r.stats.gaps.length ? `; ${r.stats.gaps.length} stretch(es) outside the mesh left out` : '';
  return { ...base, quantities: assignNoiseScales('line', q), ...(gaps ? { notes: classifyNotes([`${r.validCount} of ${r.count} samples inside the mesh${gaps}`]) } : {}) };
}
