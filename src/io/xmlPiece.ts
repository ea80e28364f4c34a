/**
 * One `<Piece>` of a VTK XML UnstructuredGrid or PolyData file → a validated model piece.
 *
 * Unstructured: `<Points>`, `<Cells>` (`connectivity`, `offsets` holding each cell's end, `types`, and
 * polyhedron faces in either VTK layout), `<PointData>`, `<CellData>`. Polygonal data: `<Verts>`,
 * `<Lines>`, `<Strips>`, `<Polys>` (each `connectivity` + `offsets`), stored as typed cells in VTK's
 * order (verts, lines, polys, strips), which is also the order of its cell data.
 *
 * Given the same piece of a dataset read before (`LoadOptions.geometryBefore`), points and unstructured
 * cell arrays whose raw bytes equal that piece's are taken from it, not decoded again (`sameBlock.ts`).
 */
import type { Piece, PolyFaces } from '../model/piece.ts';
import { validateFields, validatePiece } from '../model/validate.ts';
import { linearizeCells, polyDataCells, type PolySection } from './cellAssembly.ts';
import { arrayLabel, componentsOf, intAttr, readCellTypesArray, readDataArray, readIdDataArray, type XmlFileContext } from './xmlArrays.ts';
import { readSectionFields } from './xmlFields.ts';
import { facesFromStream, facesFromTables } from './xmlPolyhedra.ts';
import { appendedMatches } from './sameBlock.ts';
import { child, type XmlElement } from './xmlScan.ts';
import { countsWithoutGhosts, ghostNote, withoutGhostCells } from '../model/ghostCells.ts';

/** A piece with what the file declared about its cells. */
export interface PieceResult {
  piece: Piece;
  /** Cell-type counts as declared (before higher-order cells were linearised). */
  fileCellTypes: Record<number, number>;
  warnings: string[];
}

const MAX_COUNT = 0x7fffffff;

function countAttr(el: XmlElement, attr: string, where: string, required: boolean): number {
  const v = intAttr(el, attr, where);
  if (v === undefined) {
    if (required) throw new Error(`${where}: <Piece> has no ${attr} attribute`);
    return 0;
  }
  if (v > MAX_COUNT) throw new Error(`${where}: ${attr}="${v}" exceeds the ${MAX_COUNT} items a piece can hold`);
  return v;
}

/** The DataArray child of `sec` named one of `names` (first match). */
function namedArray(sec: XmlElement, names: readonly string[]): XmlElement | undefined {
  return sec.children.find((c) => c.name === 'DataArray' && names.includes(c.attrs.get('Name') ?? ''));
}

async function readIdArray(ctx: XmlFileContext, sec: XmlElement, names: readonly string[], where: string, expected: number | undefined, min = 0, lead = 0): Promise<Int32Array> {
  const el = namedArray(sec, names);
  if (!el) throw new Error(`${where}: <${sec.name}> has no DataArray named "${names[0]}"`);
  return readIdDataArray(ctx, el, `${where}: ${arrayLabel(el, names[0]!)}`, expected, min, lead);
}

/**
 * Cell end offsets as in the file, read after a leading zero slot → model offsets (leading 0), checking
 * in place that they never decrease.
 */
async function readStartOffsets(ctx: XmlFileContext, sec: XmlElement, where: string, n: number): Promise<Int32Array> {
  const out = await readIdArray(ctx, sec, ['offsets'], where, n, 0, 1);
  const label = `${where}: DataArray "offsets"`;
  let prev = 0;
  for (let i = 1; i < out.length; i++) {
    const e = out[i]!;
    if (e < prev) throw new Error(`${label}: offsets entry ${i - 1} is ${e}, less than the previous end ${prev}`);
    prev = e;
  }
  return out;
}

async function readPoints(ctx: XmlFileContext, pieceEl: XmlElement, nPts: number, where: string, before?: Piece): Promise<Float64Array> {
  const sec = child(pieceEl, 'Points');
  const da = sec && child(sec, 'DataArray');
  if (!da) {
    if (nPts === 0) return new Float64Array(0);
    throw new Error(`${where}: NumberOfPoints="${nPts}" but the piece has no <Points> DataArray`);
  }
  const label = `${where}: ${arrayLabel(da, 'Points')}`;
  const nc = componentsOf(da, label);
  if (nc !== 3) throw new Error(`${label}: points have ${nc} components, expected 3`);
  if (before && before.points.length === nPts * 3 && await appendedMatches(ctx, da, before.points)) return before.points;
  return (await readDataArray(ctx, da, label, nPts * 3, true)).values as Float64Array;
}

const SNAKE = {
  faceConnectivity: ['face_connectivity', 'FaceConnectivity'],
  faceOffsets: ['face_offsets', 'FaceOffsets'],
  polyhedronToFaces: ['polyhedron_to_faces', 'PolyhedronToFaces'],
  polyhedronOffsets: ['polyhedron_offsets', 'PolyhedronOffsets'],
} as const;

async function readPolyFaces(ctx: XmlFileContext, cells: XmlElement, types: ArrayLike<number>, where: string): Promise<PolyFaces> {
  const nCells = types.length;
  if (namedArray(cells, ['faceoffsets'])) {
    const ends = await readIdArray(ctx, cells, ['faceoffsets'], where, nCells, -1);
    let max = 0;
    for (let i = 0; i < ends.length; i++) if (ends[i]! > max) max = ends[i]!;
    const faces = await readIdArray(ctx, cells, ['faces'], where, max, -1);
    return facesFromStream(types, faces, ends, where);
  }
  if (namedArray(cells, SNAKE.polyhedronOffsets)) {
    const polyhedronEnds = await readIdArray(ctx, cells, SNAKE.polyhedronOffsets, where, nCells);
    const polyhedronToFaces = await readIdArray(ctx, cells, SNAKE.polyhedronToFaces, where, nCells > 0 ? polyhedronEnds[nCells - 1]! : 0);
    const faceEnds = await readIdArray(ctx, cells, SNAKE.faceOffsets, where, undefined);
    const faceConnectivity = await readIdArray(ctx, cells, SNAKE.faceConnectivity, where, faceEnds.length > 0 ? faceEnds[faceEnds.length - 1]! : 0);
    return facesFromTables(types, { faceConnectivity, faceEnds, polyhedronToFaces, polyhedronEnds }, where);
  }
  throw new Error(`${where}: the piece has polyhedron cells (type 42) but <Cells> holds no "faces"/"faceoffsets" or "polyhedron_offsets" arrays`);
}

/**
 * The cell arrays of `before` when the file's types, offsets and connectivity hold exactly their bytes (cells
 * that were linear in the file, so nothing was converted), else undefined.
 */
async function sameCells(ctx: XmlFileContext, cells: XmlElement, nCells: number, before: Piece | undefined) {
  if (!before || before.polyFaces || before.cellTypes.length !== nCells) return undefined;
  const types = namedArray(cells, ['types']), offsets = namedArray(cells, ['offsets']), conn = namedArray(cells, ['connectivity']);
  if (!types || !offsets || !conn) return undefined;
  const same = await appendedMatches(ctx, types, before.cellTypes) && await appendedMatches(ctx, offsets, before.offsets, 1)
    && await appendedMatches(ctx, conn, before.connectivity);
  return same ? before : undefined;
}

async function readUnstructuredCells(ctx: XmlFileContext, pieceEl: XmlElement, nCells: number, where: string, before?: Piece) {
  const cells = child(pieceEl, 'Cells');
  if (!cells) {
    if (nCells === 0) return { lin: linearizeCells(new Uint8Array(0), new Int32Array(1), new Int32Array(0), where), polyFaces: undefined };
    throw new Error(`${where}: NumberOfCells="${nCells}" but the piece has no <Cells> section`);
  }
  const same = await sameCells(ctx, cells, nCells, before);
  if (same) {
    const count = new Int32Array(256), fileCellTypes: Record<number, number> = {};
    for (let c = 0; c < same.cellTypes.length; c++) count[same.cellTypes[c]!]!++;
    for (let t = 0; t < 256; t++) if (count[t]) fileCellTypes[t] = count[t]!;
    return { lin: { cellTypes: same.cellTypes, offsets: same.offsets, connectivity: same.connectivity, fileCellTypes, warnings: [] as string[] }, polyFaces: undefined };
  }
  const typesEl = namedArray(cells, ['types']);
  if (!typesEl) throw new Error(`${where}: <Cells> has no DataArray named "types"`);
  const { values: types } = await readCellTypesArray(ctx, typesEl, `${where}: ${arrayLabel(typesEl, 'types')}`, nCells);
  const offsets = await readStartOffsets(ctx, cells, where, nCells);
  const connectivity = await readIdArray(ctx, cells, ['connectivity'], where, offsets[nCells]!);
  const lin = linearizeCells(types, offsets, connectivity, where);
  let polyFaces: PolyFaces | undefined;
  if (lin.fileCellTypes[42]) polyFaces = await readPolyFaces(ctx, cells, types, where);
  return { lin, polyFaces };
}

const POLY_SECTIONS = [['Verts', 'verts'], ['Lines', 'lines'], ['Strips', 'strips'], ['Polys', 'polys']] as const;

async function readPolyDataCells(ctx: XmlFileContext, pieceEl: XmlElement, where: string) {
  const sections: PolySection[] = [];
  for (const [tag, kind] of POLY_SECTIONS) {
    const n = countAttr(pieceEl, `NumberOf${tag}`, where, false);
    if (n === 0) continue;
    const sec = child(pieceEl, tag);
    if (!sec) throw new Error(`${where}: NumberOf${tag}="${n}" but the piece has no <${tag}> section`);
    const sw = `${where}: ${tag}`;
    const offsets = await readStartOffsets(ctx, sec, sw, n);
    const connectivity = await readIdArray(ctx, sec, ['connectivity'], sw, offsets[n]!);
    sections.push({ kind, offsets, connectivity });
  }
  const cells = polyDataCells(sections);
  return linearizeCells(cells.cellTypes, cells.offsets, cells.connectivity, where);
}

/**
 * Reads piece number `index` (`pieceEl`) of an UnstructuredGrid (`kind` 'unstructured') or PolyData
 * ('polydata') file and validates it. Messages start with `file: piece k`.
 */
export async function readXmlPiece(ctx: XmlFileContext, pieceEl: XmlElement, kind: 'unstructured' | 'polydata', index: number, before?: Piece): Promise<PieceResult> {
  const where = `${ctx.name}: piece ${index}`;
  const nPts = countAttr(pieceEl, 'NumberOfPoints', where, true);
  const points = await readPoints(ctx, pieceEl, nPts, where, before);
  let lin, polyFaces: PolyFaces | undefined;
  if (kind === 'unstructured') {
    const nCells = countAttr(pieceEl, 'NumberOfCells', where, true);
    ({ lin, polyFaces } = await readUnstructuredCells(ctx, pieceEl, nCells, where, before));
  } else {
    lin = await readPolyDataCells(ctx, pieceEl, where);
  }
  const nCells = lin.cellTypes.length;
  const pointData = await readSectionFields(ctx, child(pieceEl, 'PointData'), 'point', nPts, where);
  const cellData = await readSectionFields(ctx, child(pieceEl, 'CellData'), 'cell', nCells, where);
  const piece: Piece = {
    points, cellTypes: lin.cellTypes, offsets: lin.offsets, connectivity: lin.connectivity,
    ...(polyFaces ? { polyFaces } : {}),
    pointData, cellData,
  };
  // geometry that is wholly the piece read before was checked then: only the fields are new
  const checked = before && !polyFaces && points === before.points && lin.connectivity === before.connectivity && lin.offsets === before.offsets && lin.cellTypes === before.cellTypes;
  if (checked) validateFields(piece, where); else validatePiece(piece, where);
  const warnings = lin.warnings.map((w) => `piece ${index}: ${w}`);
  const ghostFree = withoutGhostCells(piece, where);
  if (ghostFree.leftOut) warnings.push(ghostNote(`piece ${index}`, ghostFree.leftOut));
  return { piece: ghostFree.piece, fileCellTypes: countsWithoutGhosts(lin.fileCellTypes, ghostFree), warnings };
}
