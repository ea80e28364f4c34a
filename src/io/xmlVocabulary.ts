/**
 * The elements a VTK XML file may hold inside the elements this reader reads, so that a misspelled or
 * unknown element where a known one belongs (`<DataArry>` in `<PointData>`, `<Dataset>` in a `<Block>`)
 * is an error instead of an array or block silently left out. Elements inside parts the reader does not
 * interpret (`<InformationKey>` contents, a collection's `<DataAssembly>`) are not checked.
 */
import type { XmlElement } from './xmlScan.ts';

const ARRAYS = ['DataArray', 'Array'];
const PIECE_SECTIONS = ['PointData', 'CellData', 'Points', 'Cells', 'Verts', 'Lines', 'Strips', 'Polys', 'FieldData'];
const COMPOSITE_CHILDREN = ['Block', 'Piece', 'DataSet', 'Partitions', 'FieldData', 'DataAssembly', 'InformationKey'];

/** Element name → the child elements it may hold (elements not listed here are not checked). */
const ALLOWED: Readonly<Record<string, readonly string[]>> = {
  UnstructuredGrid: ['Piece', 'FieldData'],
  PolyData: ['Piece', 'FieldData'],
  PUnstructuredGrid: ['PPointData', 'PCellData', 'PPoints', 'PCells', 'Piece', 'FieldData', 'PFieldData'],
  PPolyData: ['PPointData', 'PCellData', 'PPoints', 'PVerts', 'PLines', 'PStrips', 'PPolys', 'Piece', 'FieldData', 'PFieldData'],
  PointData: ARRAYS, CellData: ARRAYS, FieldData: ARRAYS, Points: ARRAYS, Cells: ARRAYS,
  Verts: ARRAYS, Lines: ARRAYS, Strips: ARRAYS, Polys: ARRAYS,
  PPointData: ['PDataArray', 'PArray'], PCellData: ['PDataArray', 'PArray'], PPoints: ['PDataArray', 'PArray'],
  PCells: ['PDataArray', 'PArray'], PFieldData: ['PDataArray', 'PArray', 'DataArray', 'Array'],
  DataArray: ['InformationKey'], Array: ['InformationKey'], PDataArray: ['InformationKey'], PArray: ['InformationKey'],
  vtkMultiBlockDataSet: COMPOSITE_CHILDREN, vtkPartitionedDataSet: COMPOSITE_CHILDREN,
  vtkPartitionedDataSetCollection: COMPOSITE_CHILDREN, Block: COMPOSITE_CHILDREN, Partitions: COMPOSITE_CHILDREN,
};

/** Children allowed in a `<Piece>`: sections of a dataset piece, or composite entries inside a set. */
const PIECE_IN_DATASET = PIECE_SECTIONS;

/** The closest allowed name to `name` (same letters ignoring case, or one edit away), for the message. */
function closest(name: string, allowed: readonly string[]): string | undefined {
  const lower = name.toLowerCase();
  const same = allowed.find((a) => a.toLowerCase() === lower);
  if (same) return same;
  return allowed.find((a) => editDistance(a.toLowerCase(), lower) <= 2);
}

function editDistance(a: string, b: string): number {
  if (Math.abs(a.length - b.length) > 2) return 3;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) cur[j] = Math.min(prev[j]! + 1, cur[j - 1]! + 1, prev[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = cur;
  }
  return prev[b.length]!;
}

/**
 * Checks the element names below `body` (the `<UnstructuredGrid>`, `<PolyData>` or set element of a
 * file named `where`): an element the reader would not read where a known one belongs throws, naming it,
 * its byte offset, its parent and what was expected. Walks without recursion.
 */
export function checkElementNames(body: XmlElement, where: string): void {
  const composite = /^vtk/.test(body.name);
  const stack: XmlElement[] = [body];
  while (stack.length > 0) {
    const el = stack.pop()!;
    const allowed = el.name === 'Piece' ? (composite ? COMPOSITE_CHILDREN : PIECE_IN_DATASET) : ALLOWED[el.name];
    if (!allowed) continue;
    for (const c of el.children) {
      if (!allowed.includes(c.name)) {
        const hint = closest(c.name, allowed);
        throw new Error(`${where}: unknown element <${c.name.slice(0, 40)}> at byte ${c.at} inside <${el.name}>${hint ? ` (did you mean <${hint}>?)` : ''}; expected ${allowed.map((a) => `<${a}>`).join(', ')}`);
      }
      // Information keys and a collection's assembly hold free-form content.
      if (c.name !== 'InformationKey' && c.name !== 'DataAssembly') stack.push(c);
    }
  }
}
