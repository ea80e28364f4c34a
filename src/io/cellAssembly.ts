/**
 * Turning a file's cell lists into the model's cells, shared by the legacy and XML readers:
 * polygonal-data sections (verts, lines, polys, strips) become typed cells, and higher-order cells
 * are reduced to their corner nodes with a warning.
 */
import { notedCounts } from '../model/arrayScans.ts';
import { CELL_TYPE_NAMES, CellType, HIGHER_ORDER_TO_LINEAR, QUADRATIC_POLYGON, cellDimension } from '../model/cellTypes.ts';

/** Cells as three flat arrays (see `src/model/piece.ts` for the layout). */
export interface CellArrays {
  cellTypes: Uint8Array;
  offsets: Int32Array;
  connectivity: Int32Array;
}

/** One section of polygonal data: its cells' offsets (length n+1) and connectivity. */
export interface PolySection {
  kind: 'verts' | 'lines' | 'polys' | 'strips';
  offsets: Int32Array;
  connectivity: Int32Array;
}

/** Cell type of a polygonal-data cell with `n` nodes in section `kind` (VTK's rule). */
function polyCellType(kind: PolySection['kind'], n: number): number {
  switch (kind) {
    case 'verts': return n === 1 ? CellType.VERTEX : CellType.POLY_VERTEX;
    case 'lines': return n === 2 ? CellType.LINE : CellType.POLY_LINE;
    case 'polys': return n === 3 ? CellType.TRIANGLE : n === 4 ? CellType.QUAD : CellType.POLYGON;
    case 'strips': return CellType.TRIANGLE_STRIP;
  }
}

/** Concatenates polygonal-data sections in VTK's order (verts, lines, polys, strips) into one cell list. */
export function polyDataCells(sections: PolySection[]): CellArrays {
  const order = ['verts', 'lines', 'polys', 'strips'] as const;
  const sorted = order.flatMap((k) => sections.filter((s) => s.kind === k));
  let nCells = 0, nConn = 0;
  for (const s of sorted) { nCells += s.offsets.length - 1; nConn += s.connectivity.length; }
  const cellTypes = new Uint8Array(nCells), offsets = new Int32Array(nCells + 1), connectivity = new Int32Array(nConn);
  let c = 0, base = 0;
  for (const s of sorted) {
    connectivity.set(s.connectivity, base);
    for (let i = 0; i + 1 < s.offsets.length; i++, c++) {
      cellTypes[c] = polyCellType(s.kind, s.offsets[i + 1]! - s.offsets[i]!);
      offsets[c + 1] = base + s.offsets[i + 1]!;
    }
    base += s.connectivity.length;
  }
  return { cellTypes, offsets, connectivity };
}

/** The error for cell `c` of a type fieldtally does not read (`where` names the cell-type section). */
export function unreadCellType(where: string, c: number, t: number): Error {
  return new Error(`${where}: cell ${c} has cell type ${t}${CELL_TYPE_NAMES[t] ? ` (${CELL_TYPE_NAMES[t]})` : ''}, which fieldtally does not read (expected a linear, quadratic or higher-order Lagrange/Bezier type, or 42 polyhedron)`);
}

/** Result of `linearizeCells`: model cells, the per-type counts as declared, and warnings. */
export interface LinearizedCells extends CellArrays {
  fileCellTypes: Record<number, number>;
  warnings: string[];
}

/** Per-type counts of any type list; throws at the first cell of a type fieldtally does not read. */
function countTypes(rawTypes: ArrayLike<number>, where: string): { fileCellTypes: Record<number, number>; higher: number } {
  const fileCellTypes: Record<number, number> = {};
  let higher = 0;
  for (let c = 0; c < rawTypes.length; c++) {
    const t = rawTypes[c]!;
    fileCellTypes[t] = (fileCellTypes[t] ?? 0) + 1;
    if (t === QUADRATIC_POLYGON || HIGHER_ORDER_TO_LINEAR[t]) { higher++; continue; }
    if (t !== 0 && cellDimension(t) < 0) throw unreadCellType(where, c, t);
  }
  return { fileCellTypes, higher };
}

/**
 * `countTypes` for byte types: a histogram first (no object lookup per cell), the per-cell walk only to name a
 * bad cell. The histogram counts runs of one type (a mesh of one type is one run), not cells one by one, whose
 * increments of one slot wait on each other (1M hexahedra: 6–16 ms against 1.4–1.8 ms). A reader that counted the
 * types while reading them (the chunk kernel, src/io/partReads.ts `ChunkScan`) leaves the counts to take instead.
 */
function countBytes(rawTypes: Uint8Array, where: string): { fileCellTypes: Record<number, number>; higher: number } {
  const noted = notedCounts(rawTypes);
  return countsToTypes(noted ?? histogram(rawTypes), rawTypes, where);
}

/** How many of each byte value `rawTypes` holds, counted by runs (see `countBytes`). */
function histogram(rawTypes: Uint8Array): Float64Array {
  const hist = new Float64Array(256), n = rawTypes.length;
  let c = 0;
  if (n > 0 && rawTypes.byteOffset % 4 === 0) {
    // The first run four bytes at a time (a mesh of one type: the whole array in a quarter of the steps).
    const t = rawTypes[0]!, word = t * 0x01010101 | 0, w = new Int32Array(rawTypes.buffer, rawTypes.byteOffset, n >> 2);
    let j = 0;
    while (j < w.length && w[j] === word) j++;
    c = 4 * j;
    hist[t] = c;
  }
  while (c < n) {
    const t = rawTypes[c]!;
    let e = c + 1;
    while (e < n && rawTypes[e] === t) e++;
    hist[t]! += e - c;
    c = e;
  }
  return hist;
}

/** `countTypes`' answer from the counts of each type. */
function countsToTypes(hist: Float64Array, rawTypes: Uint8Array, where: string): { fileCellTypes: Record<number, number>; higher: number } {
  const fileCellTypes: Record<number, number> = {};
  let higher = 0;
  for (let t = 0; t < 256; t++) {
    if (hist[t] === 0) continue;
    if (t === QUADRATIC_POLYGON || HIGHER_ORDER_TO_LINEAR[t]) higher += hist[t]!;
    else if (t !== 0 && cellDimension(t) < 0) return countTypes(rawTypes, where);
    // Integer keys enumerate in ascending order whatever the insertion order, as in `countTypes`.
    fileCellTypes[t] = hist[t]!;
  }
  return { fileCellTypes, higher };
}

/**
 * Counts declared cell types and reduces higher-order cells (quadratic, Lagrange, Bezier …) to their
 * corner nodes. Unknown type numbers are an error naming the first such cell. `rawTypes` may hold any
 * integer type; a cell's node count must be at least its corner count.
 */
export function linearizeCells(rawTypes: ArrayLike<number>, offsets: Int32Array, connectivity: Int32Array, where: string): LinearizedCells {
  const n = rawTypes.length;
  const { fileCellTypes, higher } = rawTypes instanceof Uint8Array ? countBytes(rawTypes, where) : countTypes(rawTypes, where);
  if (higher === 0) {
    return { cellTypes: rawTypes instanceof Uint8Array ? rawTypes : Uint8Array.from(rawTypes), offsets, connectivity, fileCellTypes, warnings: [] };
  }
  const cellTypes = new Uint8Array(n), newOffsets = new Int32Array(n + 1);
  let total = 0;
  for (let c = 0; c < n; c++) {
    const t = rawTypes[c]!, size = offsets[c + 1]! - offsets[c]!;
    const lin = HIGHER_ORDER_TO_LINEAR[t];
    const keep = t === QUADRATIC_POLYGON ? size >> 1 : lin ? lin[1] : size;
    if (keep > size) throw new Error(`${where}: cell ${c} (${CELL_TYPE_NAMES[t]}) has ${size} nodes, fewer than its ${keep} corners`);
    cellTypes[c] = t === QUADRATIC_POLYGON ? CellType.POLYGON : lin ? lin[0] : t;
    total += keep;
    newOffsets[c + 1] = total;
  }
  const newConn = new Int32Array(total);
  for (let c = 0; c < n; c++) newConn.set(connectivity.subarray(offsets[c]!, offsets[c]! + (newOffsets[c + 1]! - newOffsets[c]!)), newOffsets[c]!);
  const kinds = Object.keys(fileCellTypes).map(Number).filter((t) => t === QUADRATIC_POLYGON || HIGHER_ORDER_TO_LINEAR[t]);
  const warnings = kinds.map((t) => `${fileCellTypes[t]} ${CELL_TYPE_NAMES[t] ?? `type ${t}`} cell(s) (type ${t}) read by their corner nodes only; mid-side nodes are ignored, so curved edges become straight`);
  return { cellTypes, offsets: newOffsets, connectivity: newConn, fileCellTypes, warnings };
}
