/**
 * Reader for multi-file VTK XML sets: `PUnstructuredGrid` (.pvtu) and `PPolyData` (.pvtp), whose
 * `<Piece Source="…">` entries name piece files, and `vtkMultiBlockDataSet` (.vtm) — also
 * `vtkPartitionedDataSet` (.vtpd) and `vtkPartitionedDataSetCollection` (.vtpc) — whose nested
 * `<Block>` / `<Piece>` / `<DataSet file="…">` elements are flattened: every leaf file's pieces become
 * pieces of one dataset, in file order. Leaves without a file are skipped. Leaf files may themselves
 * be sets (a .pvtu named by a .vtm). Pieces may use different encodings.
 *
 * Files are opened with `opts.resolveSource(path)` (read by ranges, see `byteSource.ts`) or fetched whole
 * with `opts.resolve(path)`, paths relative to the set file's folder, normalised (`/` separators, no `.`
 * or `x/..` segments).
 */
import type { Dataset, FieldStrings } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { bytesSource, type ByteSource } from './byteSource.ts';
import { readWhole } from './sourceArrays.ts';
import { Checkpoint, checkAborted, type LoadOptions, type ResolveSource } from './loadOptions.ts';
import { fileSettings, readVtkXmlInput, unsupportedTypeError } from './vtkXml.ts';
import { scanXmlSource } from './xmlHead.ts';
import { child, scanXml, type XmlElement } from './xmlScan.ts';
import { GHOST_ARRAY } from '../model/ghostCells.ts';

const PARALLEL: Readonly<Record<string, string>> = { PUnstructuredGrid: 'UnstructuredGrid', PPolyData: 'PolyData' };
const COMPOSITE = new Set(['vtkMultiBlockDataSet', 'vtkPartitionedDataSet', 'vtkPartitionedDataSetCollection']);
/** File names a set may give to a nested set (opened even when `LoadOptions.pieceShare` picks leaves). */
export const SET_FILE_NAME = /\.(pvtu|pvtp|vtm|vtmb|vtpd|vtpc)$/i;
/** Sets naming sets: deeper than this is taken for a cycle. */
const MAX_DEPTH = 8;

/** Joins a relative path onto a folder (`/`-separated), resolving `.` and `..`. Absolute paths pass through. */
export function joinPath(folder: string, rel: string): string {
  const r = rel.replace(/\\/g, '/');
  if (r.startsWith('/') || /^[A-Za-z]:\//.test(r)) return r;
  const parts = folder === '' ? [] : folder.split('/');
  for (const seg of r.split('/')) {
    if (seg === '' || seg === '.') continue;
    if (seg === '..' && parts.length > 0 && parts[parts.length - 1] !== '..') parts.pop();
    else parts.push(seg);
  }
  return parts.join('/');
}

/** Folder part of a `/`-separated path ('' for a bare name). */
function folderOf(path: string): string {
  const i = path.lastIndexOf('/');
  return i < 0 ? '' : path.slice(0, i);
}

/** A leaf of a set: its file path and the `/`-joined names of the blocks around it and its own ('' when none). */
interface Leaf { readonly file: string; readonly name: string }

const joinName = (outer: string, inner: string | undefined): string => (inner ? (outer ? `${outer}/${inner}` : inner) : outer);

/** Leaf files of a composite set, depth first, in file order, with the `name` attributes of their blocks. */
function compositeLeaves(el: XmlElement, out: Leaf[], outer = ''): Leaf[] {
  for (const c of el.children) {
    if (c.name === 'DataSet') {
      const f = c.attrs.get('file');
      if (f) out.push({ file: f, name: joinName(outer, c.attrs.get('name')?.trim()) });
    } else if (c.name !== 'FieldData' && c.name !== 'DataAssembly' && c.name !== 'InformationKey') {
      compositeLeaves(c, out, joinName(outer, c.attrs.get('name')?.trim()));
    }
  }
  return out;
}

/**
 * Piece labels from block paths: the innermost name where it tells the leaves apart, else the whole path
 * (`walls/floor` and `body/floor` stay apart; a lone `floor` is just `floor`).
 */
export function pieceLabels(paths: readonly string[]): string[] {
  const last = (p: string) => p.slice(p.lastIndexOf('/') + 1);
  const owners = new Map<string, Set<string>>();
  for (const p of paths) if (p) owners.set(last(p), (owners.get(last(p)) ?? new Set()).add(p));
  return paths.map((p) => (p && owners.get(last(p))!.size === 1 ? last(p) : p));
}

/** Arrays declared by `<PPointData>`/`<PCellData>`, for a warning when a piece lacks one. */
function declaredNames(el: XmlElement | undefined): string[] {
  return el ? el.children.filter((c) => c.name === 'PDataArray').map((c) => c.attrs.get('Name') ?? '').filter((n) => n !== '') : [];
}

interface Collected {
  pieces: Piece[];
  /** Block path of each piece ('' when unnamed). */
  pieceNames: string[];
  fieldStrings: FieldStrings[];
  fieldData: FieldArray[];
  warnings: string[];
  fileCellTypes: Record<number, number>;
  allPolyData: boolean;
  /** Leaf files numbered so far (for `LoadOptions.pieceShare`). */
  leaves: number;
}

async function fetchPiece(setName: string, resolve: ResolveSource, path: string): Promise<ByteSource> {
  try {
    return await resolve(path);
  } catch (e) {
    if (e instanceof Error && e.name === 'AbortError') throw e;
    const msg = e instanceof Error ? e.message : String(e);
    throw new Error(`${setName}: piece file "${path}" is missing or unreadable (${msg})`);
  }
}

/** Adds the pieces of one leaf dataset; warns about arrays the parallel set declares but the leaf lacks. */
function addLeaf(acc: Collected, d: Dataset, path: string, declared: { point: string[]; cell: string[] } | undefined, blockName: string): void {
  if (d.kind !== 'polydata') acc.allPolyData = false;
  acc.pieces.push(...d.pieces);
  for (let k = 0; k < d.pieces.length; k++) acc.pieceNames.push(blockName);
  for (const f of d.fieldStrings ?? []) if (!acc.fieldStrings.some((g) => g.name === f.name)) acc.fieldStrings.push(f);
  for (const f of d.fieldData) if (!acc.fieldData.some((g) => g.name === f.name)) acc.fieldData.push(f);
  acc.warnings.push(...d.warnings.map((w) => `${path}: ${w}`));
  for (const [t, n] of Object.entries(d.fileCellTypes)) acc.fileCellTypes[Number(t)] = (acc.fileCellTypes[Number(t)] ?? 0) + n;
  if (!declared) return;
  for (const p of d.pieces) {
    for (const [assoc, names] of [['point', declared.point], ['cell', declared.cell]] as const) {
      const have = (assoc === 'point' ? p.pointData : p.cellData).map((f) => f.name);
      // the ghost flags are read and dropped with the ghost cells (src/model/ghostCells.ts)
      const missing = names.filter((n) => n !== GHOST_ARRAY && !have.includes(n));
      if (missing.length) acc.warnings.push(`${path}: ${assoc} arrays declared by the set are missing: ${missing.map((n) => `"${n}"`).join(', ')}`);
    }
  }
}

/** Leaf paths of a set file, the leaf type a parallel set requires, and the arrays it declares. */
function setLeaves(setName: string, type: string, body: XmlElement) {
  if (PARALLEL[type]) {
    const leaves = body.children.filter((c) => c.name === 'Piece').map((c, k) => {
      const src = c.attrs.get('Source');
      if (!src) throw new Error(`${setName}: <Piece> ${k} has no Source attribute`);
      return src;
    });
    const declared = { point: declaredNames(child(body, 'PPointData')), cell: declaredNames(child(body, 'PCellData')) };
    return { leaves: leaves.map((file): Leaf => ({ file, name: '' })), expectLeafType: PARALLEL[type], declared };
  }
  if (COMPOSITE.has(type)) return { leaves: compositeLeaves(body, []), expectLeafType: undefined, declared: undefined };
  throw unsupportedTypeError(setName, type);
}

async function collect(setName: string, bytes: Uint8Array, resolve: ResolveSource, opts: LoadOptions, depth: number, acc: Collected, outerName = ''): Promise<void> {
  const doc = scanXml(bytes, setName);
  const { type } = fileSettings(doc, setName);
  const body = child(doc.root, type);
  if (!body) throw new Error(`${setName}: <VTKFile type="${type}"> has no <${type}> element`);
  const { leaves, expectLeafType, declared } = setLeaves(setName, type, body);
  for (let i = 0; i < leaves.length; i++) {
    checkAborted(opts.signal, setName);
    const path = joinPath('', leaves[i]!.file);
    const blockName = joinName(outerName, leaves[i]!.name);
    const namedSet = SET_FILE_NAME.test(path);
    if (opts.pieceShare && !namedSet && !opts.pieceShare(acc.leaves++, path)) continue;
    const leaf = await fetchPiece(setName, resolve, path);
    try {
      const leafName = `${setName}: ${path}`;
      const progress = opts.onProgress;
      const leafOpts: LoadOptions = {
        ...(opts.signal ? { signal: opts.signal } : {}),
        ...(opts.inflate ? { inflate: opts.inflate } : {}),
        ...(opts.sharedArrays ? { sharedArrays: true } : {}),
        ...(progress ? { onProgress: (p) => progress({ ...p, stage: `piece ${i + 1} of ${leaves.length}: ${p.stage}` }) } : {}),
      };
      const input = await scanXmlSource(leaf, leafName, new Checkpoint(leafName, leafOpts, leaf.size));
      const leafType = fileSettings(input.doc, leafName).type;
      if (expectLeafType && leafType !== expectLeafType) {
        throw new Error(`${leafName}: piece file holds "${leafType}", but a ${type} set needs "${expectLeafType}" pieces`);
      }
      const isSet = PARALLEL[leafType] !== undefined || COMPOSITE.has(leafType);
      if (opts.pieceShare && isSet !== namedSet) {
        throw new Error(`${leafName}: ${isSet ? `holds a ${leafType} set but is not named like one` : `is named like a set but holds "${leafType}"`}; reading a share of the pieces needs nested sets named .pvtu, .pvtp, .vtm, .vtpd or .vtpc and pieces named otherwise`);
      }
      if (isSet) {
        if (depth >= MAX_DEPTH) throw new Error(`${leafName}: sets nested more than ${MAX_DEPTH} deep (does a set name itself?)`);
        const folder = folderOf(path);
        const setBytes = input.whole ? input.bytes : await readWhole(leaf);
        await collect(leafName, setBytes, (p) => resolve(joinPath(folder, p)), opts, depth + 1, acc, blockName);
        continue;
      }
      addLeaf(acc, await readVtkXmlInput(leafName, input, leafOpts), path, declared, blockName);
    } finally {
      await leaf.close?.();
    }
  }
  if (leaves.length === 0) acc.warnings.push(`${setName}: the set names no piece files (empty dataset)`);
}

/**
 * Reads a multi-file set (.pvtu, .pvtp, .vtm, .vtpd, .vtpc) from the set file's bytes, fetching pieces
 * with `opts.resolveSource` or `opts.resolve` (one is required). Errors name the set file and the piece
 * file. Mixed unstructured and polygonal leaves give an 'unstructured' dataset; coordinates and fields
 * are in the files' units.
 */
export async function readVtkSet(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  const fetchBytes = opts.resolve;
  const resolve: ResolveSource | undefined = opts.resolveSource
    ?? (fetchBytes && (async (rel) => bytesSource(rel.split('/').pop() ?? rel, await fetchBytes(rel))));
  if (!resolve) throw new Error(`${name}: a multi-file set needs its piece files, but no way to fetch them was given (LoadOptions.resolve)`);
  const acc: Collected = { pieces: [], pieceNames: [], fieldStrings: [], fieldData: [], warnings: [], fileCellTypes: {}, allPolyData: true, leaves: 0 };
  await collect(name, bytes, resolve, opts, 0, acc);
  return {
    source: name,
    kind: acc.allPolyData && acc.pieces.length > 0 ? 'polydata' : 'unstructured',
    pieces: acc.pieces, fieldData: acc.fieldData, warnings: acc.warnings, fileCellTypes: acc.fileCellTypes,
    ...(acc.pieceNames.some((n) => n !== '') ? { pieceNames: pieceLabels(acc.pieceNames) } : {}),
    ...(acc.fieldStrings.length ? { fieldStrings: acc.fieldStrings } : {}),
  };
}
