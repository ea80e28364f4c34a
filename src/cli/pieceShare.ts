/**
 * Reads one task's share of a piece set from disk (`fieldtally partial`): first the set file and any
 * nested set files, to number the leaf files over the whole set, then only the leaf files of the task's
 * share (`taskShare`: contiguous, in file order). Every file read is recorded, with its size, SHA-256 and
 * place in the whole set's reading order, for the report's list of inputs (as `loadInput` records a
 * whole set). Node only.
 */
import { createHash } from 'node:crypto';
import { basename, dirname, relative, resolve as resolvePath } from 'node:path';
import { readBytes } from '../io/nodeFiles.ts';
import { readDataset, xmlFileType } from '../io/readDataset.ts';
import type { Dataset } from '../model/dataset.ts';
import { taskShare, type OrderedInput } from '../pieces/partialDoc.ts';

const sha256 = (b: Uint8Array): string => createHash('sha256').update(b).digest('hex');

const SET_TYPES = new Set(['PUnstructuredGrid', 'PPolyData', 'vtkMultiBlockDataSet', 'vtkPartitionedDataSet', 'vtkPartitionedDataSetCollection']);

/** One task's share of a set. */
export interface ShareRead {
  dataset: Dataset;
  /** Leaf files of the whole set, and the task's `[firstLeaf, endLeaf)`. */
  leaves: number;
  firstLeaf: number;
  endLeaf: number;
  /** Paths of the leaf files read (relative to the set file's folder). */
  read: string[];
  inputs: OrderedInput[];
  setSha256: string;
}

/** Reads task `task` of `tasks`'s share of the set at `path` (see the file comment). */
export async function readShare(path: string, task: number, tasks: number): Promise<ShareRead> {
  const name = basename(path), folder = dirname(resolvePath(path));
  const bytes = await readBytes(path);
  const type = xmlFileType(bytes);
  if (!type || !SET_TYPES.has(type)) {
    throw new Error(`${name}: not a piece set (expected a .pvtu, .pvtp, .vtm, .vtpd or .vtpc file${type ? `, found a "${type}" file` : ''}); \`fieldtally report\` reads a single file`);
  }
  const setSha256 = sha256(bytes);
  const fetch = async (rel: string): Promise<{ full: string; b: Uint8Array }> => {
    const full = resolvePath(folder, rel);
    const b = await readBytes(full).catch(() => { throw new Error(`no such file ${full}`); });
    return { full, b };
  };
  // Pass 1: number the leaves (only set files are opened).
  let leaves = 0;
  await readDataset(name, bytes, { resolve: async (rel) => (await fetch(rel)).b, pieceShare: () => { leaves++; return false; } });
  const { firstLeaf, endLeaf } = taskShare(task, tasks, leaves);
  // Pass 2: read the share, recording every file in the whole set's reading order.
  const inputs: OrderedInput[] = [{ name, bytes: bytes.length, sha256: setSha256, role: 'result file', order: -1 }];
  const read: string[] = [];
  let seen = 0, current = -1;
  const dataset = await readDataset(name, bytes, {
    pieceShare: (leaf) => {
      const mine = leaf >= firstLeaf && leaf < endLeaf;
      seen = leaf + 1; current = mine ? leaf : -1;
      return mine;
    },
    resolve: async (rel) => {
      const { full, b } = await fetch(rel);
      const isLeaf = current >= 0;
      const order = isLeaf ? 2 * current + 1 : 2 * seen;
      if (isLeaf) { read.push(rel); current = -1; }
      inputs.push({ name: relative(folder, full) || rel, bytes: b.length, sha256: sha256(b), role: `piece of ${name}`, order });
      return b;
    },
  });
  return { dataset, leaves, firstLeaf, endLeaf, read, inputs, setSha256 };
}
