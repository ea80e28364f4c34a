/**
 * The one contract between the viewer (main thread) and the compute worker. A few coarse calls; the
 * dataset stays in the worker. Every typed array in a reply is freshly allocated for that reply and is
 * transferred (not copied); the worker never transfers a buffer it still uses.
 *
 * Units: the file's units throughout (the viewer labels them as SI). Vectors are `[x, y, z]`.
 */
import type { LoadProgress } from '../src/io/loadOptions.ts';
import type { SurfaceIntegrals } from '../src/cut/integrals.ts';
import type { LineStats } from '../src/locate/lineStats.ts';
import type { LoadReport } from '../src/model/loadReport.ts';
import type { ForceResult } from '../src/surface/forces.ts';
import type { SetEvaluation } from '../src/study/evaluate.ts';
import type { ProbeSet } from '../src/study/probeSet.ts';
import type { GroupOutline } from '../src/surface/groupOutline.ts';

export type { GroupOutline, ProbeSet, SetEvaluation };

export type Vec3 = [number, number, number];

/**
 * When the worker started and finished a call, in ms since the epoch (`performance.timeOrigin +
 * performance.now()`, comparable between the page and the worker); the viewer benchmark splits a call's
 * time into worker compute and transfer with it.
 */
export interface WorkerStamps {
  startedAt: number;
  finishedAt: number;
  /** Parts of the call (ms each), for the viewer benchmark: e.g. a load's `read`, `decode`, `boundary`. */
  phases?: Record<string, number>;
}

/** One input file: its path relative to the set file's folder (`/`-separated) and its bytes. */
export interface InputFile {
  path: string;
  data: Blob | Uint8Array;
}

/**
 * What to load: the file to open (a single result file, or the set file of a `.pvtu`/`.vtm`), the
 * other chosen files a set may refer to, or a same-origin URL (the bundled sample field).
 */
export type LoadRequest =
  | { kind: 'files'; main: InputFile; others: InputFile[] }
  | { kind: 'url'; url: string; name: string };

/** Progress callback, throttled by the worker (at most ~10 calls per second). */
export type ProgressCallback = (p: LoadProgress) => void;

/** A surface group: a part of the mesh boundary (a wall, an inlet …) that can be shown, hidden and selected. */
export interface GroupInfo {
  /** Index of the group (0 … n−1): what drawings carry per vertex and what force requests name. */
  id: number;
  /** The group's stable id in the file (its group-array value, or a number after them for feature parts). */
  fileId: number;
  name: string;
  /** Where it came from: 'cell-array', 'surface-file', 'feature-angle', or 'surface-cells' (a file without volume cells). */
  source: string;
  /** m² (file length unit squared). */
  area: number;
  faces: number;
  centroid: Vec3;
  /** [xmin, xmax, ymin, ymax, zmin, zmax] (m). */
  bounds: [number, number, number, number, number, number];
}

/** What the worker holds after a load. */
export interface Description {
  report: LoadReport;
  /** Bytes of every file read. */
  fileBytes: number;
  /** Seconds the read took in the worker. */
  loadSeconds: number;
  groups: GroupInfo[];
  /** When the worker ran the call that returned this description. */
  timing?: WorkerStamps;
}

import type { DrawingValues, FieldChoice, SurfaceDrawing, TriangleDrawing } from '../src/surface/surfaceDrawing.ts';

export type { DrawingValues, FieldChoice, SurfaceDrawing, TriangleDrawing };

/**
 * The boundary surface for drawing (`drawFaces` of src/surface/surfaceDrawing.ts) and the outline of each
 * group (`groupOutline.ts`: segments where a group ends, drawn around a selected group; none for a file
 * without volume cells).
 */
/** An iso-surface probe's evaluation and its triangles for the view (`isoSurface`). */
export interface IsoReply {
  evaluation: SetEvaluation;
  drawing: (TriangleDrawing & DrawingValues) | null;
}

/** Options of `surface()`. */
export interface SurfaceOptions {
  /** Compute the groups' outline with the surface (default true). */
  groupOutline?: boolean;
}

export interface SurfaceReply extends SurfaceDrawing {
  outline: GroupOutline;
  timing?: WorkerStamps;
}

/** A field's values on the boundary surface (`faceValues` of src/surface/surfaceDrawing.ts). */
export interface SurfaceValuesReply extends DrawingValues {
  timing?: WorkerStamps;
}

/** A cut-plane request. `rho` is a constant density (kg/m³) or the name of a density field. */
export interface CutRequest {
  origin: Vec3;
  /** Need not be unit length; positive flow is along it. */
  normal: Vec3;
  /** Restricts the cut to the connected part that contains this point. */
  seed?: Vec3;
  color?: FieldChoice;
  velocity?: string;
  pressure?: string;
  rho: number | string;
}

/**
 * A cut's reply: the drawn part of the cut (the region when a seed restricts it) and its integrals
 * (`integratePlane` of src/cut/planeIntegrals.ts, the same path as the command line). An empty cut or
 * region has `integrals.empty` and a reason, never zeros.
 */
export interface CutReply {
  drawing: (TriangleDrawing & DrawingValues) | null;
  integrals: SurfaceIntegrals;
  /** Unit normal used (fluxes are positive along it). */
  normal: Vec3;
  /** Region filters applied, as text (empty: the whole cut). */
  region: string[];
  /** Cells the plane cut. */
  cellsCut: number;
  timing?: WorkerStamps;
}

/**
 * A cut's picture only (`cutDrawing`): the drawn part of the cut, exactly as `cut` draws it, without the
 * integrals, for the steps of a drag (the numbers follow with `cut`).
 */
export interface CutDrawingReply {
  drawing: (TriangleDrawing & DrawingValues) | null;
  /** Unit normal used. */
  normal: Vec3;
  cellsCut: number;
  timing?: WorkerStamps;
}

export interface LineRequest {
  from: Vec3;
  to: Vec3;
  /** Evenly spaced samples including both ends (2 … 100 000). */
  samples: number;
}

/** One sampled field along a line: a column per component, NaN where a sample lies outside the mesh. */
export interface LineField {
  name: string;
  association: 'point' | 'cell';
  components: number;
  /** Column labels: `name`, or `name_x, name_y, name_z`. */
  labels: string[];
  columns: Float64Array[];
}

/**
 * A line probe's samples (`probeLine` of src/locate/lineProbe.ts) and their statistics (`lineStats`).
 * A line wholly outside the mesh has `outside` and no samples.
 */
export interface LineReply {
  /** |to − from| (m). */
  length: number;
  count: number;
  validCount: number;
  outside: boolean;
  /** Arc length from `from` per sample (m). */
  s: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** 1 where the sample lies in the mesh. */
  valid: Uint8Array;
  fields: LineField[];
  stats: LineStats;
  timing?: WorkerStamps;
}

/** Reference values and choices for a force total (SI). */
export interface ForceRequest {
  /** Group ids (indices, see `GroupInfo.id`). */
  groups: number[];
  rho: number;
  speed: number;
  area: number;
  /** Reference length for moment coefficients (m); 0 leaves them out. */
  length: number;
  /** Drag direction (any length, normalised by the worker). */
  dragDirection: Vec3;
  /** Lift direction (its drag-direction part is removed). */
  liftDirection: Vec3;
  momentPoint: Vec3;
  /** Dynamic viscosity (Pa·s) for the velocity-gradient traction when the file has no wall-shear array; 0: none. */
  mu: number;
  /** Reference pressure (Pa), subtracted from the pressure array. */
  referencePressure: number;
}

/** A force total (`forceTotals` of src/surface/forces.ts) with the centroid of the selected faces (pin anchor) and whether they close. */
export interface ForceReply {
  result: ForceResult;
  centroid: Vec3;
  groupNames: string[];
  /** Edge counts of the selected faces (`surfaceQuality` of src/surface/surfaceQuality.ts): closed when every edge joins two faces that agree. */
  surface: { closed: boolean; openEdges: number; nonManifoldEdges: number; inconsistentEdges: number };
}

import type { HistoryColumn, HistoryTable } from '../src/series/historyTable.ts';
import type { TimeSource } from '../src/series/seriesIndex.ts';

export type { HistoryColumn, HistoryTable, TimeSource };

/** A series as the time control shows it (`openSeries`). */
export interface SeriesDescription {
  /** The collection file, folder or pattern. */
  name: string;
  timeSource: TimeSource;
  /** Sentence saying where the times came from, for the UI. */
  timeSourceStatement: string;
  /** `s`, or `step` when the times are step indices. */
  timeUnit: string;
  /** Time of each step (time unit), strictly increasing. */
  times: number[];
  /** The files of each step (paths as chosen). */
  stepFiles: string[][];
}

/** A step shown (`showStep`): what `load` returns, plus the step, its time and whether its mesh was reused. */
export interface StepDescription extends Description {
  step: number;
  time: number;
  /** True when the step's geometry equals the step shown before: surfaces and cell tree were not rebuilt (the view may keep its mesh and only recolour). */
  meshReused: boolean;
}

/** Progress of a series evaluation: steps done of the steps to do, and the time of the last step done. */
export interface SeriesProgress {
  done: number;
  total: number;
  time: number;
}

/**
 * Derived fields to attach to the held dataset (src/derive/derivedFields.ts): after the call they are
 * fields like the file's own for colouring, cuts, line probes and probe sets. Reference values are SI.
 */
export interface DeriveRequest {
  /** Derived field names, e.g. `vorticity`, `q-criterion`, `cp`. */
  names: string[];
  /** Velocity / pressure field names (default: by the naming rule). */
  velocity?: string;
  pressure?: string;
  /** Constant density (kg/m³) or a density field's name, for total pressure. */
  density?: number | string;
  /** For cp: reference density (kg/m³), speed (m/s) and pressure (Pa). */
  reference?: { density?: number; speed?: number; pressure?: number };
}

/**
 * Fields the app attaches to the held dataset (`attachFields`): derived fields and user formulas, always
 * made afresh from the file's own arrays, so a changed reference value (cp) or a removed formula takes effect.
 */
export interface FieldsRequest {
  /** Derived field names (src/derive/derivedFields.ts), e.g. `vorticity-magnitude`, `cp`. */
  derived: string[];
  /** User formulas in order (src/derive/formulaFields.ts); `unit` an optional SI label. */
  formulas: { name: string; expression: string; unit?: string }[];
  /** Reference values (SI): density kg/m³, viscosity Pa·s, speed m/s, pressure Pa, area m², length m. */
  reference: { density?: number; viscosity?: number; speed?: number; pressure?: number; area?: number; length?: number };
}

/** The description with the attached fields, and what could not be made (one line each, the core's message). */
export interface FieldsReply {
  description: Description;
  /** SI unit of each formula made (`undeclared` when an input's unit is unknown). */
  formulaUnits: Record<string, string>;
  failed: { name: string; message: string }[];
}

/** Wall quantities on surface groups for colouring and statistics (`wallSurface`; src/surface/wallQuantities.ts). */
export interface WallRequest {
  /** Group indices (`GroupInfo.id`). */
  groups: number[];
  /** What the per-vertex values hold: |τ_w| (Pa), c_f, or y⁺. */
  quantity: 'shear' | 'cf' | 'yplus';
  /** ρ (kg/m³), U (m/s), μ (Pa·s) of the reference conditions. */
  density: number;
  speed: number;
  viscosity: number;
  /** y⁺ thresholds for the area shares. */
  thresholds: number[];
  /** Histogram bins of y⁺. */
  bins: number;
  wallDistance: 'cell-centroid' | 'first-node';
  /** τ_w from the file's wall-shear array, the velocity gradient, or auto (the array when present). */
  shearFrom: 'auto' | 'wall-shear' | 'gradient';
}

/** Per-vertex values of the chosen quantity (`NO_VALUE` of src/surface/wallDrawing.ts off the groups) and the statistics. */
export interface WallReply {
  values: DrawingValues;
  /** How τ_w was found, in words (array name, or the velocity gradient, its order and μ). */
  shearSource: string;
  wallDistanceDefinition: string;
  faces: number;
  /** m². */
  area: number;
  stats: { shear: WallStatTriple; cf: WallStatTriple | null; yPlus: WallStatTriple | null };
  yPlusAbove: { threshold: number; areaShare: number }[];
  yPlusHistogram: { edges: number[]; areaShare: number[] } | null;
  notes: string[];
}

/** Area-weighted mean, min and max. */
export interface WallStatTriple { mean: number; min: number; max: number }

/** The worker's API. */
export interface ComputeApi {
  /** Reads a file or set; replaces the held dataset only on success. Rejects with the reader's error. */
  load(request: LoadRequest, onProgress?: ProgressCallback): Promise<Description>;
  /** Aborts a running load at the reader's next checkpoint (the load rejects with an AbortError). */
  cancelLoad(): void;
  /** The held dataset's description; rejects when nothing is loaded. */
  describe(): Promise<Description>;
  /**
   * The boundary surface for drawing, with the groups' outlines; with `{ groupOutline: false }` the outline is
   * left empty (a first picture does not show it: it is drawn around selected groups) and comes from `groupOutline()`.
   */
  surface(options?: SurfaceOptions): Promise<SurfaceReply>;
  /** The held surface's group outline (segments where a group ends), for a surface drawn without it. */
  groupOutline(): Promise<GroupOutline>;
  /** A field's values on the boundary surface, in `surface()`'s vertex order. */
  surfaceValues(field: FieldChoice): Promise<SurfaceValuesReply>;
  /** Cuts the dataset by a plane: triangles coloured by `request.color`, and integrals. */
  cut(request: CutRequest): Promise<CutReply>;
  /** The same cut's drawing only (only the colouring field carried onto the cut, no integrals): a drag step's picture. */
  cutDrawing(request: CutRequest): Promise<CutDrawingReply>;
  /** Samples every field along a line (point fields, then cell fields with other names). */
  sample(request: LineRequest): Promise<LineReply>;
  /** Force total over surface groups. */
  forces(request: ForceRequest): Promise<ForceReply>;
  /**
   * Evaluates every probe of a probe set on the held dataset (`evaluateProbeSet` of src/study/evaluate.ts,
   * the same path as `fieldtally report`): numbers in SI with units, failed probes flagged with a message.
   * The set is checked first (src/study/probeSetCheck.ts); a malformed set rejects with the checker's message.
   */
  evaluateProbeSet(set: ProbeSet): Promise<SetEvaluation>;
  /**
   * Evaluates a set of one iso-surface probe (kind `iso`) like `evaluateProbeSet` and returns, beside the
   * evaluation, its triangles for drawing (file length unit) coloured by the probe's `fields.colourBy`
   * (null when the surface is empty). Arrays arrive by transfer.
   */
  isoSurface(set: ProbeSet): Promise<IsoReply>;
  /**
   * Opens a series from the chosen files: one `.pvd` among them (its steps' files chosen with it), or
   * numbered result files (`flow_0001.vtu` …; per-step `.pvtu`/`.vtm` sets with their pieces). Times come
   * from the collection, else each file's `TimeValue`, else the step index (`timeSource` says which).
   * Replaces the open series; the held dataset stays until `showStep`. Rejects with a one-line error
   * naming the file (or `.pvd` line) on bad input.
   */
  openSeries(files: InputFile[]): Promise<SeriesDescription>;
  /**
   * Reads step `step` of the open series and holds it like `load` does (surface, cut, sample, forces and
   * evaluateProbeSet then work on it). Consecutive steps on one mesh share the geometry, boundary faces
   * and cell tree. Only one step is held; a newer call supersedes an older one still reading.
   */
  showStep(step: number, onProgress?: ProgressCallback): Promise<StepDescription>;
  /**
   * Evaluates a probe set at every step of the open series within [from, to] (time unit; default all),
   * streaming (at most about two steps resident), and returns the history table: time plus one column per
   * probe quantity named as results.csv names it (`<probe id>.<quantity> [unit]`), NaN where a probe
   * failed at a step (listed in `failures`). Progress after every step; `cancelSeries` rejects it with an
   * AbortError. Columns' arrays arrive by transfer.
   */
  evaluateSeries(set: ProbeSet, window?: { from?: number; to?: number }, onProgress?: (p: SeriesProgress) => void): Promise<HistoryTable>;
  /** Stops a running `evaluateSeries` (and a `showStep` still reading) at the next step. */
  cancelSeries(): void;
  /** Attaches derived fields to the held dataset; resolves to the updated description (its arrays list them). */
  deriveFields(request: DeriveRequest): Promise<Description>;
  /**
   * Replaces the app's derived and formula fields on the held dataset by those of `request`, made from the
   * file's own arrays; a field that cannot be made is left out and listed in `failed`.
   */
  attachFields(request: FieldsRequest): Promise<FieldsReply>;
  /** Wall quantities on surface groups: values for colouring the drawn surface and the groups' statistics. */
  wallSurface(request: WallRequest): Promise<WallReply>;
}
