/**
 * Reader for legacy `.vtk` files (versions 2.0 to 5.1, ASCII and big-endian BINARY), our own
 * typed-array parser. Reads `DATASET UNSTRUCTURED_GRID` and `DATASET POLYDATA`; other dataset kinds
 * (structured points/grids, rectilinear grids, field-only files) are refused with a clear error.
 *
 * Layout of a file: `# vtk DataFile Version x.y`, a title line, `ASCII` or `BINARY`, `DATASET <kind>`,
 * then keyword sections in any order: an optional dataset-level `FIELD`, `POINTS n type`, the cell
 * lists (`CELLS` + `CELL_TYPES`, or `VERTICES`/`LINES`/`POLYGONS`/`TRIANGLE_STRIPS`), and the
 * attribute sections `POINT_DATA n` / `CELL_DATA n`. `METADATA` blocks are skipped. Polygonal data
 * keep VTK's cell order (verts, lines, polys, strips), which cell data follow. Higher-order cells are
 * read by their corner nodes (with a warning); polyhedra keep their faces.
 */
import type { Dataset, DatasetKind, FieldStrings } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';
import { countsWithoutGhosts, ghostNote, withoutGhostCells } from '../model/ghostCells.ts';
import { bytesSource, inMemoryBytes, type ByteSource } from './byteSource.ts';
import { readWhole } from './sourceArrays.ts';
import { linearizeCells, polyDataCells, unreadCellType, type PolySection } from './cellAssembly.ts';
import { ATTRIBUTE_KEYWORDS, readAttribute, readFieldBlock, type ArrayContext, type AttributeSection } from './legacyAttributes.ts';
import { checkPointIds, readCellList, type LegacyCellList } from './legacyCells.ts';
import { LegacyCursor, WINDOW_BYTES, WINDOW_EXHAUSTED, quoted } from './legacyCursor.ts';
import { splitPolyhedra } from './legacyPolyhedra.ts';
import { numericType } from './legacyTypes.ts';
import { readCellTypeBytes, readValues } from './legacyValues.ts';
import { Checkpoint, checkAborted, type LoadOptions } from './loadOptions.ts';

const POLY_KEYWORDS: Readonly<Record<string, PolySection['kind']>> = {
  VERTICES: 'verts', LINES: 'lines', POLYGONS: 'polys', TRIANGLE_STRIPS: 'strips',
};

const REFUSED_KINDS = ['STRUCTURED_POINTS', 'STRUCTURED_GRID', 'RECTILINEAR_GRID'];

/** What the header says. */
interface Header { version: number; binary: boolean; kind: DatasetKind }

function readHeader(cur: LegacyCursor): Header {
  const file = cur.file;
  const first = cur.line() ?? '';
  const m = /^\s*#\s*vtk\s+DataFile\s+Version\s*(\d+(?:\.\d+)?)?/i.exec(first);
  if (!m) throw new Error(`${file}: line 1 is ${quoted(first)}, expected "# vtk DataFile Version x.y"`);
  const version = m[1] ? Number(m[1]) : 2;
  if (cur.line() === undefined) throw new Error(`${file}: the file ends after line 1, expected a title line`);
  const formatLine = cur.line();
  const format = (formatLine ?? '').trim().toUpperCase();
  if (format !== 'ASCII' && format !== 'BINARY') {
    throw new Error(`${file}: line 3 is ${formatLine === undefined ? 'missing' : quoted(formatLine)}, expected ASCII or BINARY`);
  }
  const kwWhere = `${file}: line 4`;
  const kw = cur.word();
  if (kw === undefined) throw new Error(`${kwWhere}: the file ends, expected DATASET UNSTRUCTURED_GRID or DATASET POLYDATA`);
  const supported = 'fieldtally reads DATASET UNSTRUCTURED_GRID and DATASET POLYDATA';
  if (kw.toUpperCase() === 'FIELD') {
    throw new Error(`${file}: found FIELD at ${cur.at()} (a field-only file, no mesh); ${supported}`);
  }
  if (kw.toUpperCase() !== 'DATASET') throw new Error(`${file}: found ${quoted(kw)} at ${cur.at()}, expected DATASET; ${supported}`);
  const kind = cur.need('the dataset type', cur.where('DATASET')).toUpperCase();
  if (kind === 'UNSTRUCTURED_GRID') return { version, binary: format === 'BINARY', kind: 'unstructured' };
  if (kind === 'POLYDATA') return { version, binary: format === 'BINARY', kind: 'polydata' };
  const what = REFUSED_KINDS.includes(kind) ? `DATASET ${kind} at ${cur.at()} is not supported` : `unknown dataset type ${quoted(kind)} at ${cur.at()}`;
  throw new Error(`${file}: ${what}; ${supported} (convert structured or image data to an unstructured grid first)`);
}

/** Everything collected while walking the sections. */
interface Parts {
  points?: Float64Array;
  cells?: LegacyCellList;
  cellTypes?: ArrayLike<number>;
  cellTypesWhere?: string;
  poly: (LegacyCellList & { kind: PolySection['kind'] })[];
  pointData?: AttributeSection;
  cellData?: AttributeSection;
  fieldData: FieldArray[];
  /** String arrays of the dataset-level FIELD block (name tables of group arrays). */
  fieldStrings: FieldStrings[];
}

/**
 * Reads a legacy `.vtk` file into a one-piece dataset. `name` prefixes every error message; errors say
 * the section, the line (ASCII) or byte offset (BINARY), and what was expected versus found. Coordinates
 * and fields are in the file's units.
 */
export async function readLegacyVtk(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  return readLegacyVtkFrom(bytesSource(name, bytes), name, opts);
}

/**
 * Reads a legacy `.vtk` file from a source (see `readLegacyVtk`). A binary file is read section by
 * section, each array straight into its final form; a text file through a window that moves forward.
 */
export async function readLegacyVtkFrom(src: ByteSource, name: string = src.name, opts: LoadOptions = {}): Promise<Dataset> {
  checkAborted(opts.signal, name);
  const mem = inMemoryBytes(src);
  if (mem) return readWith(new LegacyCursor(src, mem, name), opts);
  try {
    return await readWith(new LegacyCursor(src, await src.read(0, WINDOW_BYTES), name), opts);
  } catch (e) {
    if (e !== WINDOW_EXHAUSTED) throw e;
    // Text longer than the window between two arrays: read the file whole instead.
    return readWith(new LegacyCursor(src, await readWhole(src), name), opts);
  }
}

async function readWith(cur: LegacyCursor, opts: LoadOptions): Promise<Dataset> {
  let d: Dataset;
  try {
    d = await readBody(cur, opts);
  } catch (e) {
    if (e instanceof Error) {
      const [message, stack] = await cur.resolve([e.message, e.stack ?? '']);
      e.message = message!;
      if (e.stack) e.stack = stack!;
    }
    throw e;
  }
  return { ...d, warnings: await cur.resolve(d.warnings) };
}

async function readBody(cur: LegacyCursor, opts: LoadOptions): Promise<Dataset> {
  const name = cur.file;
  const header = readHeader(cur);
  // Binary arrays are read one by one from the source; text is parsed from a window that moves forward.
  cur.binary = header.binary;
  cur.shared = opts.sharedArrays === true;
  const warnings: string[] = [];
  if (header.version > 5.1) warnings.push(`${name}: file version ${header.version} is newer than 5.1, the newest this reader knows; read as 5.1`);
  const ctx: ArrayContext = { cur, cp: new Checkpoint(name, opts, cur.source.size), warnings };
  const parts: Parts = { poly: [], fieldData: [], fieldStrings: [] };
  let section: AttributeSection | undefined;
  // whether the open section has had an item (a section of skipped string arrays holds no arrays)
  let sectionItems = false;

  for (let kw = cur.word(); kw !== undefined; kw = cur.word()) {
    const key = kw.toUpperCase(), kwPos = cur.wordStart;
    if (section && (await readAttribute(key, section, ctx))) { sectionItems = true; continue; }
    if (key === 'POINT_DATA' || key === 'CELL_DATA') {
      section = openSection(cur, key, parts, header.kind);
      sectionItems = false;
    } else if (key === 'FIELD') {
      parts.fieldData.push(...await readFieldBlock(ctx, 'FIELD', 'dataset', undefined, parts.fieldStrings));
    } else if (key === 'POINTS') {
      if (parts.points) throw new Error(`${cur.where('POINTS')}: a second POINTS section; expected one`);
      const where = cur.where('POINTS');
      const n = cur.count('the point count', where);
      const type = numericType(cur.need('the data type', where), where);
      parts.points = await readValues(cur, 3 * n, type, where, ctx.cp, true) as Float64Array;
      cur.skipMetadata();
    } else if (key === 'METADATA') {
      cur.pos = kwPos;
      cur.skipMetadata();
    } else if (header.kind === 'unstructured' && key === 'CELLS') {
      if (parts.cells) throw new Error(`${cur.where('CELLS')}: a second CELLS section; expected one`);
      parts.cells = await readCellList(cur, 'CELLS', ctx.cp);
    } else if (header.kind === 'unstructured' && key === 'CELL_TYPES') {
      if (parts.cellTypes) throw new Error(`${cur.where('CELL_TYPES')}: a second CELL_TYPES section; expected one`);
      const where = cur.where('CELL_TYPES');
      const n = cur.count('the cell count', where);
      parts.cellTypes = cur.binary
        ? await readCellTypeBytes(cur, n, 'Int32', where, ctx.cp, (c, t) => unreadCellType(where, c, t))
        : await readValues(cur, n, 'Int32', where, ctx.cp);
      parts.cellTypesWhere = where;
      cur.skipMetadata();
    } else if (header.kind === 'polydata' && POLY_KEYWORDS[key]) {
      const kind = POLY_KEYWORDS[key]!;
      if (parts.poly.some((s) => s.kind === kind)) throw new Error(`${cur.where(key)}: a second ${key} section; expected at most one`);
      parts.poly.push({ ...(await readCellList(cur, key, ctx.cp)), kind });
    } else {
      throw unexpected(cur, kw, header.kind, section);
    }
    await ctx.cp.at('reading legacy .vtk', cur.base + cur.pos);
  }
  if (section && !sectionItems && section.tuples > 0) {
    throw new Error(`${name}: the file ends right after ${section.keyword} ${section.tuples}; expected its arrays (is the file truncated?)`);
  }
  const nPoints = parts.points ? parts.points.length / 3 : 0;
  const noCells = header.kind === 'unstructured' ? !parts.cells && !parts.cellTypes : parts.poly.length === 0 && !parts.pointData;
  if (nPoints > 0 && noCells) {
    const lists = header.kind === 'unstructured' ? 'CELLS and CELL_TYPES' : 'VERTICES, LINES, POLYGONS or TRIANGLE_STRIPS';
    warnings.push(`${name}: the file has ${nPoints} points and no cell list (${lists}); if the file was cut short, its cells are missing`);
  }
  return assemble(name, header.kind, parts, warnings);
}

function unexpected(cur: LegacyCursor, kw: string, kind: DatasetKind, section: AttributeSection | undefined): Error {
  const top = ['FIELD', 'POINTS', ...(kind === 'unstructured' ? ['CELLS', 'CELL_TYPES'] : Object.keys(POLY_KEYWORDS)), 'POINT_DATA', 'CELL_DATA', 'METADATA'];
  const expected = section ? [...ATTRIBUTE_KEYWORDS, ...top.filter((k) => k !== 'FIELD')] : top;
  const inWhat = section ? ` in ${section.keyword}` : ` in a DATASET ${kind === 'unstructured' ? 'UNSTRUCTURED_GRID' : 'POLYDATA'}`;
  return new Error(`${cur.file}: unexpected ${quoted(kw)} at ${cur.at()}${inWhat}; expected one of ${expected.join(', ')}`);
}

/** Starts a POINT_DATA / CELL_DATA section, checking its count against what has been read. */
function openSection(cur: LegacyCursor, key: 'POINT_DATA' | 'CELL_DATA', parts: Parts, kind: DatasetKind): AttributeSection {
  const where = cur.where(key);
  const n = cur.count('the tuple count', where);
  const prev = key === 'POINT_DATA' ? parts.pointData : parts.cellData;
  if (prev) throw new Error(`${where}: a second ${key} section; expected one`);
  if (key === 'POINT_DATA' && parts.points && n !== parts.points.length / 3) {
    throw new Error(`${where}: declares ${n} tuples, but POINTS declares ${parts.points.length / 3} points; expected equal counts`);
  }
  const nCells = kind === 'unstructured'
    ? parts.cellTypes?.length
    : parts.poly.length ? parts.poly.reduce((s, p) => s + p.offsets.length - 1, 0) : undefined;
  if (key === 'CELL_DATA' && nCells !== undefined && n !== nCells) {
    throw new Error(`${where}: declares ${n} tuples, but the file has ${nCells} cells; expected equal counts`);
  }
  const s: AttributeSection = key === 'POINT_DATA'
    ? { keyword: key, association: 'point', tuples: n, arrays: [] }
    : { keyword: key, association: 'cell', tuples: n, arrays: [] };
  if (key === 'POINT_DATA') parts.pointData = s; else parts.cellData = s;
  return s;
}

/** Builds and validates the piece. */
function assemble(name: string, kind: DatasetKind, parts: Parts, warnings: string[]): Dataset {
  if (!parts.points) throw new Error(`${name}: no POINTS section; expected POINTS <count> <type> after DATASET`);
  const points = parts.points, nPoints = points.length / 3;
  let cellTypes: Uint8Array, offsets: Int32Array, connectivity: Int32Array, fileCellTypes: Record<number, number>;
  let polyFaces: Piece['polyFaces'];
  if (kind === 'unstructured') {
    const { cells, cellTypes: raw } = parts;
    if (cells && !raw) throw new Error(`${cells.where}: CELLS without CELL_TYPES; expected a CELL_TYPES section with ${cells.offsets.length - 1} types`);
    if (raw && !cells) throw new Error(`${parts.cellTypesWhere}: CELL_TYPES without CELLS; expected a CELLS section`);
    if (cells && raw) {
      const n = cells.offsets.length - 1;
      if (raw.length !== n) throw new Error(`${parts.cellTypesWhere}: declares ${raw.length} cell types, but CELLS holds ${n} cells; expected equal counts`);
      const split = splitPolyhedra(raw, cells.offsets, cells.connectivity, cells.where);
      checkPointIds({ ...split, where: cells.where }, nPoints);
      const lin = linearizeCells(raw, split.offsets, split.connectivity, parts.cellTypesWhere!);
      ({ cellTypes, offsets, connectivity, fileCellTypes } = lin);
      polyFaces = split.polyFaces;
      warnings.push(...lin.warnings.map((w) => `${name}: ${w}`));
    } else {
      ({ cellTypes, offsets, connectivity, fileCellTypes } = { cellTypes: new Uint8Array(0), offsets: new Int32Array(1), connectivity: new Int32Array(0), fileCellTypes: {} });
    }
  } else {
    for (const s of parts.poly) checkPointIds(s, nPoints);
    ({ cellTypes, offsets, connectivity } = polyDataCells(parts.poly));
    fileCellTypes = linearizeCells(cellTypes, offsets, connectivity, name).fileCellTypes;
  }
  const nCells = cellTypes.length;
  if (parts.pointData && parts.pointData.tuples !== nPoints) {
    throw new Error(`${name}: POINT_DATA declares ${parts.pointData.tuples} tuples, but POINTS declares ${nPoints} points; expected equal counts`);
  }
  if (parts.cellData && parts.cellData.tuples !== nCells) {
    throw new Error(`${name}: CELL_DATA declares ${parts.cellData.tuples} tuples, but the file has ${nCells} cells; expected equal counts`);
  }
  const piece: Piece = {
    points, cellTypes, offsets, connectivity,
    ...(polyFaces ? { polyFaces } : {}),
    pointData: parts.pointData?.arrays ?? [],
    cellData: parts.cellData?.arrays ?? [],
  };
  validatePiece(piece, name);
  const ghostFree = withoutGhostCells(piece, name);
  if (ghostFree.leftOut) warnings.push(ghostNote(name, ghostFree.leftOut));
  const strings = parts.fieldStrings.length ? { fieldStrings: parts.fieldStrings } : {};
  return { source: name, kind, pieces: [ghostFree.piece], fieldData: parts.fieldData, warnings, fileCellTypes: countsWithoutGhosts(fileCellTypes, ghostFree), ...strings };
}
