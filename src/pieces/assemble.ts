/**
 * Puts the partial results of every task of one piece set back together: checks that the parts belong to
 * one run (same set file, same probe set, same number of tasks, every task exactly once, each with the share
 * `taskShare` gives it), then builds one dataset from their pieces in task order — which is the whole set's
 * piece and cell order, since shares are contiguous — carrying the whole set's bounds and the tasks'
 * boundary faces (`Dataset.assembled`). Evaluating the probe set on it gives the whole set's numbers.
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { InputFileInfo } from '../study/reportHtml.ts';
import { taskShare } from './partialDoc.ts';
import type { PartialRead } from './readPartial.ts';

/** The whole set again, as far as its probes need it. */
export interface Assembled {
  dataset: Dataset;
  /** The set path as the tasks were given it (the report's file name). */
  file: string;
  /** Inputs of the whole set in reading order (set files, then pieces). */
  inputs: InputFileInfo[];
  /** The probe set's text, name and input record (as every task read it). */
  probeSet: { text: string; name: string; fromVersion: number; input: InputFileInfo };
  /** Parts in task order. */
  parts: PartialRead[];
}

const short = (sha: string): string => `${sha.slice(0, 12)}…`;

/** Checks the parts against each other and assembles them (see the file comment). */
export function assembleParts(given: readonly PartialRead[]): Assembled {
  if (given.length === 0) throw new Error('reduce: no partial-results files given');
  const first = given[0]!, s0 = first.doc.set, n = first.doc.task.count;
  const byTask = new Map<number, PartialRead>();
  for (const part of given) {
    const { set: s, task: t, probeSet: p } = part.doc;
    if (s.sha256 !== s0.sha256 || s.leaves !== s0.leaves) {
      throw new Error(`${part.file}: made for the set ${s.source} (SHA-256 ${short(s.sha256)}, ${s.leaves} leaf files), but ${first.file} for ${s0.source} (SHA-256 ${short(s0.sha256)}, ${s0.leaves} leaf files)`);
    }
    if (p.sha256 !== first.doc.probeSet.sha256) {
      throw new Error(`${part.file}: made with the probe set ${p.name} (SHA-256 ${short(p.sha256)}), but ${first.file} with ${first.doc.probeSet.name} (SHA-256 ${short(first.doc.probeSet.sha256)})`);
    }
    if (t.count !== n) throw new Error(`${part.file}: task ${t.index} of ${t.count} tasks, but ${first.file} is of ${n} tasks`);
    const share = taskShare(t.index, t.count, s.leaves);
    if (share.firstLeaf !== t.firstLeaf || share.endLeaf !== t.endLeaf) {
      throw new Error(`${part.file}: task ${t.index} of ${n} read leaf files ${t.firstLeaf}…${t.endLeaf - 1}, but its share is ${share.firstLeaf}…${share.endLeaf - 1}`);
    }
    const twin = byTask.get(t.index);
    if (twin) throw new Error(`${part.file}: task ${t.index} of ${n} is given twice (also ${twin.file})`);
    byTask.set(t.index, part);
  }
  const missing: number[] = [];
  for (let i = 0; i < n; i++) if (!byTask.has(i)) missing.push(i);
  if (missing.length) {
    throw new Error(`reduce: task${missing.length > 1 ? 's' : ''} ${missing.join(', ')} of ${n} missing (given: ${given.map((g) => g.file).join(', ')})`);
  }
  const parts = [...byTask.keys()].sort((a, b) => a - b).map((i) => byTask.get(i)!);
  const bounds: [number, number, number, number, number, number] = [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity];
  const fieldData: FieldArray[] = [], warnings: string[] = [], fileCellTypes: Record<number, number> = {};
  const inputs = new Map<string, { order: number; info: InputFileInfo }>();
  let polydata = 0, unstructured = 0;
  for (const part of parts) {
    const d = part.doc.dataset, b = d.bounds;
    if (b) for (let j = 0; j < 6; j += 2) { bounds[j] = Math.min(bounds[j]!, b[j]!); bounds[j + 1] = Math.max(bounds[j + 1]!, b[j + 1]!); }
    for (const f of part.fieldData) if (!fieldData.some((g) => g.name === f.name)) fieldData.push(f);
    warnings.push(...d.warnings);
    for (const [t, c] of Object.entries(d.fileCellTypes)) fileCellTypes[Number(t)] = (fileCellTypes[Number(t)] ?? 0) + c;
    if (d.kind === 'polydata') polydata++;
    else if (d.kind === 'unstructured') unstructured++;
    for (const x of part.doc.inputs) {
      const { order, ...info } = x;
      if (!inputs.has(info.name)) inputs.set(info.name, { order, info });
    }
  }
  const pieces = parts.flatMap((p) => p.pieces);
  const dataset: Dataset = {
    source: s0.source,
    kind: polydata > 0 && unstructured === 0 ? 'polydata' : 'unstructured',
    pieces, fieldData, warnings, fileCellTypes,
    ...(pieces.length ? { assembled: { bounds, boundary: parts.flatMap((p) => p.boundary) } } : {}),
  };
  const p0 = first.doc.probeSet;
  return {
    dataset, file: s0.file, parts,
    inputs: [...inputs.values()].sort((a, b) => a.order - b.order).map((x) => x.info),
    probeSet: {
      text: p0.text, name: p0.name, fromVersion: p0.fromVersion,
      input: { name: p0.name, bytes: p0.bytes, sha256: p0.sha256, role: p0.role },
    },
  };
}
