/**
 * `fieldtally surfaces <file> [--json] [--feature-angle deg] [--group-array name] [--surface-file f.vtp]`:
 * lists the boundary surface groups with id, name, faces, area, centroid, bounds and closedness.
 * Also exports the grouping options and their parsing, which `force` shares.
 */
import { loadDatasetFile } from '../../io/nodeFiles.ts';
import type { Dataset } from '../../model/dataset.ts';
import { boundaryFaces, type BoundaryFaces } from '../../surface/boundaryFaces.ts';
import { facesByGroup, surfaceGroups, type GroupOptions, type SurfaceGroups } from '../../surface/surfaceGroups.ts';
import { surfaceQuality } from '../../surface/surfaceQuality.ts';
import { CAUTION } from '../../study/caution.ts';
import { parseArgs, parseNumber, str, type OptionKind, type ParsedArgs } from '../args.ts';
import type { Verb } from '../verb.ts';
import { loadForCompute, WORKER_HELP, WORKER_OPTIONS, type ComputeInput } from '../workerOption.ts';

/** Options every surface verb takes. */
export const GROUPING_OPTIONS: Record<string, OptionKind> = { 'feature-angle': 'string', 'group-array': 'string', 'surface-file': 'string' };

export const GROUPING_HELP = [
  '  --feature-angle deg   split ungrouped boundary faces where neighbouring normals differ by more (default 50)',
  '  --group-array name    integer cell array on 2D cells that names groups (default: found by name, e.g. "group")',
  '  --surface-file f.vtp  polygons of a separate surface file define the groups (matched by coordinates)',
].join('\n');

/** Number formatting for reports: 6 significant digits. */
export const fmt = (v: number | null | undefined): string => v === null || v === undefined || Number.isNaN(v) ? '—'
  : (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6) || v === 0 ? String(Number(v.toPrecision(6))) : v.toExponential(5);

export const vec = (v: readonly number[] | null): string => (v ? `(${v.map(fmt).join(', ')})` : '—');

/** Loads the file, extracts boundary faces and groups them as the options say. */
export async function loadSurfaces(file: string, args: ParsedArgs): Promise<{ dataset: Dataset; faces: BoundaryFaces; groups: SurfaceGroups }> {
  const { dataset, faces, groups, close } = await openSurfaces(file, args);
  await close();
  return { dataset, faces, groups };
}

/**
 * `loadSurfaces` that keeps the compute workers (`pool`, null when the file is computed in this process) for
 * more work on the same file; the caller must `close()` it.
 */
export async function openSurfaces(file: string, args: ParsedArgs): Promise<{ dataset: Dataset; faces: BoundaryFaces; groups: SurfaceGroups; pool: ComputeInput['pool']; close: () => Promise<void> }> {
  // With workers, they extract the boundary faces (the pool merges their shares' faces); the rest runs here.
  const input = await loadForCompute(file, args);
  const dataset = input.dataset;
  try {
    const pooledFaces = input.pool ? await input.pool.boundary() : undefined;
    const angle = str(args, 'feature-angle'), array = str(args, 'group-array'), surfaceFile = str(args, 'surface-file');
    const o: Partial<GroupOptions> = {};
    if (angle !== undefined) {
      o.featureAngle = parseNumber(angle, 'feature-angle');
      if (!(o.featureAngle >= 0 && o.featureAngle <= 180)) throw new Error(`--feature-angle: expected degrees in 0…180, got ${angle}`);
    }
    if (array !== undefined) o.groupArray = array;
    if (surfaceFile !== undefined) o.surface = await loadDatasetFile(surfaceFile);
    const faces = pooledFaces ?? boundaryFaces(dataset);
    if (faces.count === 0) throw new Error(`${file}: no boundary faces (the file has ${faces.cells3d} 3D cells; surfaces need a volume mesh)`);
    return { dataset, faces, groups: surfaceGroups(dataset, faces, o), pool: input.pool, close: input.close };
  } catch (e) {
    await input.close();
    throw e;
  }
}

const surfaces: Verb = {
  summary: 'boundary surface groups: id, name, faces, area, centroid, bounds, closedness',
  usage: [
    'fieldtally surfaces <file> [--json] [--feature-angle deg] [--group-array name] [--surface-file f.vtp]',
    '  Lists the groups of boundary faces (faces of one 3D cell only). Areas in length unit², positions in the',
    '  file\'s length unit. Faces are oriented out of the fluid; "closed" means every edge is shared by two faces',
    '  of the group traversed in opposite directions, and closure = |∮n dA| / area.',
    GROUPING_HELP,
    WORKER_HELP,
  ].join('\n'),
  options: { json: 'boolean', ...GROUPING_OPTIONS, ...WORKER_OPTIONS },
  async run(argv, io) {
    const args = parseArgs(argv, this.options, 'surfaces');
    const file = args.positional[0];
    if (!file || args.positional.length > 1) throw new Error('expected one result file: fieldtally surfaces <file> [--json]');
    const { faces, groups } = await loadSurfaces(file, args);
    const byGroup = facesByGroup(groups);
    const rows = groups.groups.map((g, i) => ({ g, q: surfaceQuality(faces, byGroup[i]) }));
    if (args.options.json) {
      io.out(JSON.stringify({
        file, boundaryFaces: faces.count, cells3d: faces.cells3d, facesFlipped: faces.flipped,
        pointMatching: { method: faces.merge.method, sharedPoints: faces.merge.shared },
        groupArray: groups.groupArray ?? null, featureAngle: groups.featureAngle, unmatched2dCells: groups.unmatched2d,
        groups: rows.map(({ g, q }) => ({
          id: g.id, name: g.name, nameFrom: g.nameFrom ?? null, source: g.source, faces: g.faces, area: g.area, centroid: g.centroid, bounds: g.bounds,
          closed: q.closed, closure: q.closure, openEdges: q.openEdges, nonManifoldEdges: q.nonManifoldEdges, inconsistentEdges: q.inconsistentEdges,
        })),
        units: 'areas in length unit², positions in the file\'s length unit',
        caution: CAUTION,
      }, null, 2));
      return 0;
    }
    const closedness = (q: (typeof rows)[number]['q']): string => q.closed ? `closed (|∮n dA|/area ${fmt(q.closure)})`
      : [q.openEdges ? `open: ${q.openEdges} open edges` : '', q.nonManifoldEdges ? `${q.nonManifoldEdges} non-manifold edges` : '',
        q.inconsistentEdges ? `${q.inconsistentEdges} inconsistently oriented edges` : ''].filter(Boolean).join(', ');
    io.out([
      `${file}: ${faces.count} boundary faces of ${faces.cells3d} 3D cells, ${groups.groups.length} group(s)` +
        (groups.groupArray ? ` from cell array "${groups.groupArray}"` : '') + `, feature angle ${fmt(groups.featureAngle)}°`,
      ...(faces.merge.method !== 'single-piece' ? [`pieces matched by ${faces.merge.method}: ${faces.merge.shared} shared points`] : []),
      ...(faces.flipped ? [`${faces.flipped} faces were turned to point out of their cell (inverted cells or inward polyhedron faces)`] : []),
      ...(groups.notes ?? []).map((n) => `note: ${n}`),
      ...(groups.unmatched2d ? [`${groups.unmatched2d} 2D cells lie on no boundary face (interior surfaces or a different mesh)`] : []),
      '',
      ...rows.flatMap(({ g, q }) => [
        `${String(g.id).padStart(4)}  ${g.name}  [${g.source}${g.nameFrom === 'name-table' ? '; name from the file\'s name table' : ''}]`,
        `      faces ${g.faces}   area ${fmt(g.area)}   centroid ${vec(g.centroid)}`,
        `      bounds x ${fmt(g.bounds[0])} … ${fmt(g.bounds[1])}, y ${fmt(g.bounds[2])} … ${fmt(g.bounds[3])}, z ${fmt(g.bounds[4])} … ${fmt(g.bounds[5])}`,
        `      ${closedness(q)}`,
      ]),
      '',
      `Caution: ${CAUTION}`,
    ].join('\n'));
    return 0;
  },
};
export default surfaces;
