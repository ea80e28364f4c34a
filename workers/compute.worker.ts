/**
 * The compute worker: holds the dataset and answers the viewer through the `ComputeApi` contract
 * (workers/api.ts). In a browser it exposes itself with comlink on load; under Node the test
 * bootstrap imports `createComputeApi` and exposes it on a worker_threads port.
 */
import * as Comlink from 'comlink';
import { integratePlane } from '../src/cut/planeIntegrals.ts';
import { cutPlane } from '../src/cut/cutPlane.ts';
import { selectRegion } from '../src/cut/region.ts';
import { warmUpCutKernels } from '../src/cut/warmUp.ts';
import { warmUpSurfaceKernels } from '../src/surface/warmUp.ts';
import { warmUpLocateKernels } from '../src/locate/warmUp.ts';
import { getCellTree, hasCellTree } from '../src/locate/cellTree.ts';
import type { RegionSpec } from '../src/cut/region.ts';
import { readDatasetFrom } from '../src/io/readDataset.ts';
import { readAheadSource, type ReadAheadSource } from '../src/io/readAheadSource.ts';
import { bytesSource, type ByteSource } from '../src/io/byteSource.ts';
import { probeLine } from '../src/locate/lineProbe.ts';
import { lineStats } from '../src/locate/lineStats.ts';
import { forceTotals } from '../src/surface/forces.ts';
import { evaluateProbeSet } from '../src/study/evaluate.ts';
import type { ProbeSet } from '../src/study/probeSet.ts';
import { checkProbeSet } from '../src/study/probeSetCheck.ts';
import { surfaceLoads } from '../src/surface/surfaceLoads.ts';
import { surfaceQuality } from '../src/surface/surfaceQuality.ts';
import { checkAborted, type InflateBlock, type LoadProgress } from '../src/io/loadOptions.ts';
import { helperInflate } from './inflateHelpers.ts';
import { loadReport } from '../src/model/loadReport.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { datasetBounds } from '../src/model/bounds.ts';
import type { BoundaryFaces } from '../src/surface/boundaryFaces.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../src/surface/surfaceCache.ts';
import { facesOfGroups, type SurfaceGroups } from '../src/surface/surfaceGroups.ts';
import { withDerivedFields } from '../src/derive/derivedFields.ts';
import { isoDrawing } from '../src/iso/isoDrawing.ts';
import { attachFields, wallSurface } from './fieldCalls.ts';
import type { FieldsReply, FieldsRequest, GroupOutline, SurfaceOptions, WallReply, WallRequest } from './api.ts';
import type {
  ComputeApi, CutDrawingReply, CutReply, DeriveRequest, DrawingValues, TriangleDrawing, CutRequest, Description, FieldChoice, SurfaceValuesReply, ForceReply, ForceRequest, IsoReply, SetEvaluation,
  LineReply, LineRequest, LoadRequest, ProgressCallback, SurfaceReply,
} from './api.ts';
import { groupOutline } from '../src/surface/groupOutline.ts';
import { ReadMeter } from './readMeter.ts';
import { chosenFiles, describeSeries, openChosenSeries, OpenSeries } from './seriesCalls.ts';
import type { HistoryTable, SeriesDescription, SeriesProgress, StepDescription } from './api.ts';
import type { InputFile } from './api.ts';
import { drawFaces, drawTriangleSet, faceValues, surfaceCellFaces, type FaceList } from '../src/surface/surfaceDrawing.ts';
import { planPool, POOL_MIN_CELLS, workersFromName, type PoolPlan } from '../src/parallel/poolPlan.ts';
import { MAX_WORKERS } from '../src/parallel/pool.ts';
import type { ComputePool } from '../src/parallel/pool.ts';
import { primeDerivedGradients } from '../src/parallel/deriveShares.ts';
import { totalCells } from '../src/model/dataset.ts';
import { openBrowserPool } from './sharePool.ts';

/** Smallest interval between two progress calls to the main thread (ms). */
const PROGRESS_INTERVAL_MS = 100;

/** Everything derived from one loaded dataset; replaced as a whole by the next successful load. */
interface Held {
  dataset: Dataset;
  description: Description;
  /** Faces drawn as the surface: the boundary faces, or the 2D cells of a file without volume cells. */
  faces: FaceList;
  /** The boundary faces and their groups (absent for a file without volume cells). */
  boundary?: { faces: BoundaryFaces; groups: SurfaceGroups };
  /** Share workers holding the dataset (src/parallel/), when the plan uses more than one worker. */
  pool?: ComputePool;
  /** The dataset as read, before `attachFields` added the app's derived and formula fields. */
  base?: Dataset;
}

/** This worker's pool plan: from its own isolation, the core count and the page's `?workers=N` (passed in the worker's name). */
function poolPlan(): PoolPlan {
  const g = globalThis as { crossOriginIsolated?: boolean; navigator?: { hardwareConcurrency?: number }; name?: string };
  const requested = workersFromName(g.name ?? '');
  return planPool({
    isolated: g.crossOriginIsolated === true && typeof SharedArrayBuffer !== 'undefined',
    cores: g.navigator?.hardwareConcurrency ?? 1, ...(requested ? { requested } : {}),
  });
}

/**
 * The inflater of zlib blocks, made once: while a file loads the page waits, so one helper worker per core
 * besides this one (at most the pool's limit; `?workers=N` asks for N threads in all), workers/inflateHelpers.ts.
 */
let inflater: InflateBlock | undefined;
function loadInflater(): InflateBlock {
  const g = globalThis as { navigator?: { hardwareConcurrency?: number }; name?: string };
  const threads = workersFromName(g.name ?? '') ?? Math.min(MAX_WORKERS, Math.max(1, Math.floor(g.navigator?.hardwareConcurrency ?? 1)));
  return (inflater ??= helperInflate(threads - 1));
}

/**
 * A chosen file as a byte source: a Blob is read ahead in file order while the reader decodes what has
 * arrived (src/io/readAheadSource.ts; its source is added to `opened`, to be closed after the load), and
 * counted by the meter.
 */
function sourceOf(data: Blob | Uint8Array, name: string, meter: ReadMeter | undefined, opened: ReadAheadSource[]): ByteSource {
  if (data instanceof Uint8Array) return bytesSource(name, data);
  const src = readAheadSource(data, name);
  opened.push(src);
  return meter ? meter.wrap(src) : src;
}

/** Reads a same-origin URL with byte progress. */
async function fetchBytes(url: string, report: (done: number, total: number) => void, signal: AbortSignal): Promise<Uint8Array> {
  const res = await fetch(url, { signal });
  if (!res.ok) throw new Error(`${url}: could not fetch (HTTP ${res.status})`);
  const total = Number(res.headers.get('content-length') ?? 0);
  if (!res.body) return new Uint8Array(await res.arrayBuffer());
  const parts: Uint8Array[] = [];
  let done = 0;
  const reader = res.body.getReader();
  for (;;) {
    const { value, done: end } = await reader.read();
    if (end) break;
    parts.push(value);
    done += value.length;
    report(done, total);
  }
  const out = new Uint8Array(done);
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}

/**
 * Rate-limits progress calls (`send`); `now` always goes through, so a long step that follows (such as
 * finding the boundary surfaces) shows its own name.
 */
function throttle(cb: ProgressCallback | undefined): { send: (p: LoadProgress) => void; now: (p: LoadProgress) => void } {
  let last = 0;
  const now = (p: LoadProgress) => { last = performance.now(); void cb?.(p); };
  return {
    send(p) { if (performance.now() - last >= PROGRESS_INTERVAL_MS) now(p); },
    now,
  };
}

/**
 * Delay (ms) after the first coloured picture's values are sent before the cut kernels are warmed (see
 * src/cut/warmUp.ts): long enough for the page's follow-up requests, short against a user's first click.
 */
const WARM_UP_DELAY_MS = 150;

/** The pending warm-up (recolouring asks for values again: the last request schedules it). */
let warmUpTimer: ReturnType<typeof setTimeout> | undefined;

/**
 * Readies the held dataset for its first cut-plane, line probe and force total while the user looks at the
 * picture: the cut and surface kernels' compiled code (once per worker) and the dataset's cell tree (once per
 * mesh; `crossingCells.ts` uses it for cuts once built, `lineProbe.ts` always). With share workers, they hold their own.
 */
async function warmUp(h: Held | undefined, superseded: () => boolean): Promise<void> {
  await Promise.all([warmUpCutKernels(), warmUpSurfaceKernels(), warmUpLocateKernels()]);
  // a file chosen meanwhile is read first: this dataset's tree would only delay it
  await yieldToMessages();
  if (superseded()) return;
  if (h && !h.pool && h.boundary && !hasCellTree(h.dataset)) getCellTree(h.dataset);
}

/** The clock of `WorkerStamps` (ms since the epoch, comparable with the page's). */
const epochNow = (): number => performance.timeOrigin + performance.now();

/** Lets queued messages (a cancel) run before the load commits. */
const yieldToMessages = (): Promise<void> => new Promise((r) => setTimeout(r, 0));

/** Builds the API over a fresh, empty state. */
export function createComputeApi(): ComputeApi {
  let held: Held | undefined;
  let loading: AbortController | undefined;
  let series: OpenSeries | undefined;
  let seriesRun: AbortController | undefined;

  const need = (): Held => {
    if (!held) throw new Error('no result file is loaded');
    return held;
  };

  const facesOf = (h: Held): FaceList => h.faces;

  return {
    async load(request: LoadRequest, onProgress?: ProgressCallback): Promise<Description> {
      loading?.abort();
      const controller = new AbortController();
      loading = controller;
      const progress = throttle(onProgress);
      const t0 = performance.now(), startedAt = epochNow();
      const opened: ReadAheadSource[] = [];
      const phases: Record<string, number> = {};
      try {
        let name: string, main: ByteSource, fileBytes: number;
        let resolveSource: ((rel: string) => Promise<ByteSource>) | undefined;
        let meter: ReadMeter | undefined;
        if (request.kind === 'url') {
          name = request.name;
          const bytes = await fetchBytes(request.url, (done, total) => progress.send({ stage: 'fetching', bytesDone: done, bytesTotal: total }), controller.signal);
          main = bytesSource(name, bytes);
          fileBytes = bytes.length;
        } else {
          name = request.main.path.split('/').pop()!;
          const files = [request.main, ...request.others];
          // in-memory bytes are not counted as read (readers view them whole): their positions are reported as given
          if (files.every((f) => !(f.data instanceof Uint8Array))) meter = new ReadMeter(files.reduce((n, f) => n + (f.data as Blob).size, 0));
          const m = meter;
          main = sourceOf(request.main.data, name, m, opened);
          fileBytes = main.size;
          const folder = request.main.path.includes('/') ? request.main.path.slice(0, request.main.path.lastIndexOf('/') + 1) : '';
          const byPath = new Map(request.others.map((f) => [normalisePath(f.path), f]));
          resolveSource = async (rel) => {
            const want = normalisePath(folder + rel);
            // files chosen one by one carry no folder: fall back to a unique match of the file name
            const base = want.split('/').pop()!;
            const sameName = [...byPath.entries()].filter(([p]) => p.split('/').pop() === base);
            const f = byPath.get(want) ?? byPath.get(normalisePath(rel)) ?? (sameName.length === 1 ? sameName[0]![1] : undefined);
            if (!f) throw new Error(`${name}: piece "${rel}" is missing: choose it together with the set file (or open the folder)`);
            const src = sourceOf(f.data, base, m, opened);
            fileBytes += src.size;
            return src;
          };
        }
        const total = meter?.total ?? fileBytes;
        const dataset = await readDatasetFrom(main, {
          onProgress: (p) => progress.send(meter ? { stage: p.stage, bytesDone: meter.done(p), bytesTotal: total } : p),
          signal: controller.signal,
          inflate: loadInflater(),
          ...(resolveSource ? { resolveSource } : {}),
        });
        readPhases(phases, t0, opened);
        progress.now({ stage: 'finding boundary surfaces', bytesDone: total, bytesTotal: total });
        // Large files go to share workers; they extract the boundary faces (priming the dataset's cache).
        const plan = poolPlan();
        const pool = plan.workers > 1 && totalCells(dataset) >= POOL_MIN_CELLS ? await openBrowserPool(dataset, plan.workers) : undefined;
        let found: Held;
        try {
          if (pool) await pool.boundary();
          found = { ...describe(pool ? pool.dataset : dataset, fileBytes, t0, phases), ...(pool ? { pool } : {}) };
          // a cancel that arrived while the surfaces were found still wins: the previous dataset stays
          await yieldToMessages();
          checkAborted(controller.signal, name);
        } catch (e) {
          await pool?.close();
          throw e;
        }
        const old = held?.pool;
        held = found;
        await old?.close();
        return { ...held.description, timing: { startedAt, finishedAt: epochNow(), phases } };
      } finally {
        for (const s of opened) void s.close();
        if (loading === controller) loading = undefined;
      }
    },

    cancelLoad(): void { loading?.abort(); },

    async describe(): Promise<Description> { return need().description; },

    async surface(options?: SurfaceOptions): Promise<SurfaceReply> {
      const h = need(), startedAt = epochNow(), t0 = performance.now();
      const d = drawFaces(h.dataset, facesOf(h), h.boundary?.groups.faceGroup ?? null);
      const t1 = performance.now();
      const outline = h.boundary && options?.groupOutline !== false ? groupOutline(h.dataset, h.boundary.faces, h.boundary.groups.faceGroup) : { positions: new Float32Array(0), groups: new Int32Array(0) };
      const phases = { triangles: t1 - t0, outline: performance.now() - t1 };
      const reply: SurfaceReply = { ...d, outline, timing: { startedAt, finishedAt: epochNow(), phases } };
      return Comlink.transfer(reply, [d.positions.buffer, d.normals.buffer, d.groups.buffer, d.edges.buffer, d.edgeGroups.buffer, d.edgeShares.buffer, outline.positions.buffer, outline.groups.buffer]);
    },

    async groupOutline(): Promise<GroupOutline> {
      const h = need();
      const outline = h.boundary ? groupOutline(h.dataset, h.boundary.faces, h.boundary.groups.faceGroup) : { positions: new Float32Array(0), groups: new Int32Array(0) };
      return Comlink.transfer(outline, [outline.positions.buffer, outline.groups.buffer]);
    },

    async surfaceValues(field: FieldChoice): Promise<SurfaceValuesReply> {
      const h = need(), startedAt = epochNow();
      const v: SurfaceValuesReply = { ...faceValues(h.dataset, facesOf(h), field), timing: { startedAt, finishedAt: 0 } };
      // the picture is about to show: ready the first cut and probe while the user looks at it
      clearTimeout(warmUpTimer);
      warmUpTimer = setTimeout(() => { const now = held; void warmUp(now, () => held !== now || loading !== undefined).catch((e: unknown) => console.warn('fieldtally: warm-up failed (cuts and probes stay correct, the first is slower)', e)); }, WARM_UP_DELAY_MS);
      v.timing!.finishedAt = epochNow();
      return Comlink.transfer(v, [v.values.buffer]);
    },

    async cutDrawing(request: CutRequest): Promise<CutDrawingReply> {
      const h = need(), startedAt = epochNow();
      checkCut(request);
      const c = request.color, specs: RegionSpec[] = request.seed ? [{ kind: 'seed', point: request.seed }] : [];
      // share workers cut and merge as for `cut` (the integrals they add are left out of the reply)
      const { cut, region } = h.pool
        ? await h.pool.integratePlane({ origin: request.origin, normal: request.normal, region: specs })
        : (() => {
          const whole = cutPlane(h.dataset, request.origin, request.normal, { fields: c ? [{ name: c.name, association: c.association }] : 'none' });
          return { cut: whole, region: selectRegion(whole, specs) };
        })();
      const drawing = region.set.indices.length > 0 ? drawTriangleSet(region.set, cut.normal, c) : null;
      const reply: CutDrawingReply = { drawing, normal: [...cut.normal], cellsCut: cut.stats.cutCells, timing: { startedAt, finishedAt: epochNow() } };
      return drawing ? Comlink.transfer(reply, transfers(drawing)) : reply;
    },

    async cut(request: CutRequest): Promise<CutReply> {
      const h = need(), startedAt = epochNow();
      checkCut(request);
      const region: RegionSpec[] = request.seed ? [{ kind: 'seed', point: request.seed }] : [];
      const q = {
        origin: request.origin, normal: request.normal, region,
        integral: { velocity: request.velocity || undefined, pressure: request.pressure || undefined, density: request.rho },
      };
      const r = h.pool ? await h.pool.integratePlane(q) : integratePlane(h.dataset, q);
      const drawing = r.region.set.indices.length > 0 ? drawTriangleSet(r.region.set, r.cut.normal, request.color) : null;
      const reply: CutReply = { drawing, integrals: r.integrals, normal: [...r.cut.normal], region: r.region.applied, cellsCut: r.cut.stats.cutCells,
        timing: { startedAt, finishedAt: epochNow() } };
      return drawing ? Comlink.transfer(reply, transfers(drawing)) : reply;
    },

    async sample(request: LineRequest): Promise<LineReply> {
      const h = need(), startedAt = epochNow();
      checkVec(request.from, 'line probe start');
      checkVec(request.to, 'line probe end');
      const r = h.pool ? await h.pool.probeLine(request.from, request.to, { samples: request.samples }) : probeLine(h.dataset, request.from, request.to, { samples: request.samples });
      const reply: LineReply = {
        length: r.length, count: r.count, validCount: r.validCount, outside: r.outside,
        s: r.s, x: r.x, y: r.y, z: r.z, valid: r.valid,
        fields: r.fields.map((f) => ({ name: f.name, association: f.association, components: f.components, labels: [...f.labels], columns: f.columns })),
        stats: lineStats(r), timing: { startedAt, finishedAt: epochNow() },
      };
      return Comlink.transfer(reply, [r.s.buffer, r.x.buffer, r.y.buffer, r.z.buffer, r.valid.buffer, ...r.fields.flatMap((f) => f.columns.map((c) => c.buffer))]);
    },

    async forces(request: ForceRequest): Promise<ForceReply> {
      const h = need();
      if (!h.boundary) throw new Error('force totals need volume cells: this file holds surface cells only');
      const { faces, groups } = h.boundary;
      for (const v of [request.dragDirection, request.liftDirection, request.momentPoint]) checkVec(v, 'force reference vector');
      const picked = request.groups.filter((g) => Number.isInteger(g) && g >= 0 && g < groups.groups.length);
      if (picked.length === 0) throw new Error('choose at least one surface for the force total (click it in the view)');
      const selection = facesOfGroups(groups, picked);
      const loads = surfaceLoads(h.dataset, faces, selection, { pRef: request.referencePressure, ...(request.mu > 0 ? { mu: request.mu } : {}) }, groups.faceSurfaceCell);
      const result = forceTotals(h.dataset, faces, loads, {
        momentPoint: request.momentPoint, dragDirection: request.dragDirection, liftDirection: request.liftDirection,
        reference: { rho: request.rho, speed: request.speed, area: request.area, ...(request.length > 0 ? { length: request.length } : {}) },
      });
      let cx = 0, cy = 0, cz = 0, a = 0;
      for (const i of picked) { const g = groups.groups[i]!; cx += g.area * g.centroid[0]; cy += g.area * g.centroid[1]; cz += g.area * g.centroid[2]; a += g.area; }
      const q = surfaceQuality(faces, selection);
      return {
        result, centroid: a > 0 ? [cx / a, cy / a, cz / a] : [0, 0, 0], groupNames: picked.map((i) => groups.groups[i]!.name),
        surface: { closed: q.closed, openEdges: q.openEdges, nonManifoldEdges: q.nonManifoldEdges, inconsistentEdges: q.inconsistentEdges },
      };
    },

    async evaluateProbeSet(set: ProbeSet): Promise<SetEvaluation> {
      const h = need();
      // from the file's own arrays: the set attaches its own derived fields and formulas
      return evaluateProbeSet(h.base ?? h.dataset, checkProbeSet(set, 'probe set'));
    },

    async isoSurface(set: ProbeSet): Promise<IsoReply> {
      const h = need();
      const checked = checkProbeSet(set, 'probe set');
      const probe = checked.probes[0];
      if (checked.probes.length !== 1 || probe?.kind !== 'iso') throw new Error('isoSurface: expected a probe set of one iso probe');
      const evaluation = evaluateProbeSet(h.dataset, checked, { keepShapes: true });
      const drawing = isoDrawing(evaluation.probes[0]!, probe.fields?.colourBy);
      for (const o of evaluation.probes) delete o.shapes;
      const reply: IsoReply = { evaluation, drawing };
      return drawing ? Comlink.transfer(reply, [drawing.positions.buffer, drawing.normals.buffer, drawing.groups.buffer, drawing.values.buffer]) : reply;
    },

    async openSeries(files: InputFile[]): Promise<SeriesDescription> {
      if (!Array.isArray(files) || files.length === 0) throw new Error('openSeries: choose the series\' files (a .pvd with its files, or numbered result files)');
      const access = chosenFiles(files);
      const index = await openChosenSeries(files, access);
      series = new OpenSeries(index, access);
      return describeSeries(index);
    },

    async showStep(step: number, onProgress?: ProgressCallback): Promise<StepDescription> {
      const s = series;
      if (!s) throw new Error('no series is open');
      loading?.abort();
      const controller = new AbortController();
      loading = controller;
      const progress = throttle(onProgress);
      const t0 = performance.now();
      try {
        const { dataset, reused, time, fileBytes } = await s.step(step, controller.signal);
        const found = describe(dataset, fileBytes, t0);
        await yieldToMessages();
        checkAborted(controller.signal, dataset.source);
        held = found;
        progress.now({ stage: 'step ready', bytesDone: 1, bytesTotal: 1 });
        return { ...held.description, step, time, meshReused: reused };
      } finally {
        if (loading === controller) loading = undefined;
      }
    },

    async evaluateSeries(set: ProbeSet, window?: { from?: number; to?: number }, onProgress?: (p: SeriesProgress) => void): Promise<HistoryTable> {
      const s = series;
      if (!s) throw new Error('no series is open');
      const checked = checkProbeSet(set, 'probe set');
      for (const k of ['from', 'to'] as const) {
        const v = window?.[k];
        if (v !== undefined && (typeof v !== 'number' || !Number.isFinite(v))) throw new Error(`evaluateSeries: window.${k} must be a finite number, got ${JSON.stringify(v)}`);
      }
      seriesRun?.abort();
      const controller = new AbortController();
      seriesRun = controller;
      let last = 0, delivered: unknown;
      try {
        const table = await s.history(checked, {
          ...(window?.from !== undefined ? { from: window.from } : {}), ...(window?.to !== undefined ? { to: window.to } : {}),
          signal: controller.signal,
          onStep: (done, total, time) => {
            const now = performance.now();
            if (done === total || now - last >= PROGRESS_INTERVAL_MS) { last = now; delivered = onProgress?.({ done, total, time }); }
          },
        });
        // the callback is a proxy with a port of its own, unordered with the reply's: wait until its last call
        // has run, so the caller sees the final progress before the table (a failing callback stays ignored)
        await Promise.resolve(delivered).catch(() => undefined);
        return Comlink.transfer(table, [table.time.buffer as ArrayBuffer, ...table.columns.map((c) => c.values.buffer as ArrayBuffer)]);
      } finally {
        if (seriesRun === controller) seriesRun = undefined;
      }
    },

    cancelSeries(): void { seriesRun?.abort(); loading?.abort(); },

    async deriveFields(request: DeriveRequest): Promise<Description> {
      const h = need();
      if (!Array.isArray(request.names) || request.names.some((n) => typeof n !== 'string')) throw new Error('derived fields: expected a list of field names');
      // with share workers, they compute the velocity gradient (src/parallel/deriveShares.ts); same values
      if (h.pool) await primeDerivedGradients(h.pool, request.names, { velocity: request.velocity || undefined });
      const dataset = withDerivedFields(h.dataset, request.names, {
        velocity: request.velocity || undefined, pressure: request.pressure || undefined, density: request.density, reference: request.reference ?? {},
      });
      // same points and cells: the boundary faces and groups found at load stay valid
      held = { ...h, dataset, description: { ...h.description, report: loadReport(dataset) } };
      return held.description;
    },

    async attachFields(request: FieldsRequest): Promise<FieldsReply> {
      const h = need(), base = h.base ?? h.dataset;
      // with share workers, they compute the velocity gradient first; a field that cannot be made is reported below
      if (h.pool && Array.isArray(request.derived)) await primeDerivedGradients(h.pool, request.derived).catch(() => 0);
      const { dataset, formulaUnits, failed } = attachFields(base, request);
      // share workers hold only the file's arrays: with fields attached, cuts and lines run here
      const pool = dataset === base ? h.pool : undefined;
      held = { ...h, base, dataset, description: { ...h.description, report: loadReport(dataset) }, ...(pool ? { pool } : {}) };
      if (!pool) delete held.pool;
      if (h.pool && !pool) await h.pool.close();
      return { description: held.description, formulaUnits, failed };
    },

    async wallSurface(request: WallRequest): Promise<WallReply> {
      const h = need();
      if (!h.boundary) throw new Error('wall quantities need volume cells: this file holds surface cells only');
      const r = wallSurface(h.dataset, h.boundary.faces, h.boundary.groups, facesOf(h), request);
      return Comlink.transfer(r, [r.values.values.buffer as ArrayBuffer]);
    },
  };
}

/**
 * The load's read phases (ms) from its read-ahead sources: `decode` from the start to the dataset being
 * read, `bytesArrived` from the start to the last byte arriving, `waitedForBytes` the reader's time waiting
 * for bytes not yet arrived (the rest of `decode` is the reader's own work).
 */
function readPhases(phases: Record<string, number>, t0: number, opened: readonly ReadAheadSource[]): void {
  phases['decode'] = performance.now() - t0;
  if (opened.length === 0) return;
  phases['bytesArrived'] = Math.max(...opened.map((s) => s.stats.lastArrivedAt)) - t0;
  phases['waitedForBytes'] = opened.reduce((n, s) => n + s.stats.waitedMs, 0);
}

/** Boundary faces, their groups and the description of a freshly read dataset; `phases` (ms) gets the time of each step. */
function describe(dataset: Dataset, fileBytes: number, t0: number, phases: Record<string, number> = {}): Held {
  let t = performance.now();
  const lap = (k: string) => { const now = performance.now(); phases[k] = now - t; t = now; };
  const report = loadReport(dataset);
  lap('report');
  const faces = getBoundaryFaces(dataset);
  lap('boundary');
  if (faces.count > 0) {
    const groups = getSurfaceGroups(dataset);
    lap('groups');
    return {
      dataset, faces, boundary: { faces, groups },
      description: {
        report, fileBytes, loadSeconds: (performance.now() - t0) / 1000,
        groups: groups.groups.map((g, i) => ({
          id: i, fileId: g.id, name: g.name, source: g.source, area: g.area, faces: g.faces, centroid: [...g.centroid], bounds: [...g.bounds],
        })),
      },
    };
  }
  const cells = surfaceCellFaces(dataset);
  let area = 0;
  const A = cells.areaVector;
  for (let f = 0; f < cells.count; f++) area += Math.hypot(A[3 * f]!, A[3 * f + 1]!, A[3 * f + 2]!);
  const b = datasetBounds(dataset);
  return {
    dataset, faces: cells,
    description: {
      report, fileBytes, loadSeconds: (performance.now() - t0) / 1000,
      groups: [{ id: 0, fileId: 0, name: 'surface cells', source: 'surface-cells', area, faces: cells.count,
        centroid: [(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2], bounds: b }],
    },
  };
}

/** Validates a cut request's plane at the API edge. */
function checkCut(request: CutRequest): void {
  checkVec(request.origin, 'cut-plane origin');
  checkVec(request.normal, 'cut-plane normal');
  if (Math.hypot(...request.normal) === 0) throw new Error('cut-plane normal: (0, 0, 0) has no direction; give a non-zero vector');
}

/** The buffers of a cut's drawing, handed over with the reply. */
function transfers(d: TriangleDrawing & DrawingValues): ArrayBuffer[] {
  return [d.positions.buffer, d.normals.buffer, d.groups.buffer, d.values.buffer] as ArrayBuffer[];
}

/** Validates a vector at the API edge. */
function checkVec(v: unknown, what: string): void {
  if (!Array.isArray(v) || v.length !== 3 || v.some((x) => typeof x !== 'number' || !Number.isFinite(x))) {
    throw new Error(`${what}: expected three finite numbers, got ${JSON.stringify(v)}`);
  }
}

/** `a/./b/../c` → `a/c`, backslashes to slashes. */
function normalisePath(p: string): string {
  const out: string[] = [];
  for (const s of p.replace(/\\/g, '/').split('/')) {
    if (s === '' || s === '.') continue;
    if (s === '..') out.pop(); else out.push(s);
  }
  return out.join('/');
}

// In a browser worker, expose the API on the worker's own port.
declare const WorkerGlobalScope: unknown;
if (typeof WorkerGlobalScope !== 'undefined' && typeof self !== 'undefined') Comlink.expose(createComputeApi());
