/**
 * Test helpers for `ByteSource` readers: sources over bytes that are NOT registered as in-memory (so the
 * readers take their by-range paths, as for a file or a Blob), a log of every range read, and an exact
 * comparison of two datasets (typed-array kinds and bytes, so −0 and NaN count).
 */
import { expect } from 'vitest';
import type { ByteSource } from '../../src/io/byteSource.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { FieldArray } from '../../src/model/fieldArray.ts';

/** One read: its offset and length (`into` for `readInto`). */
export interface ReadRecord { offset: number; length: number; into: boolean }

/**
 * A source over `bytes` that copies every range it hands out (like a file), with `readInto` (like a file
 * on disk) or without it (like a Blob), logging each read in `log`.
 */
export function copyingSource(name: string, bytes: Uint8Array, opts: { readInto?: boolean; log?: ReadRecord[]; chunkBytes?: number } = {}): ByteSource {
  const log = opts.log;
  const src: ByteSource = {
    name,
    size: bytes.length,
    ...(opts.chunkBytes !== undefined ? { chunkBytes: opts.chunkBytes } : {}),
    async read(offset, length) {
      const end = Math.min(bytes.length, offset + length);
      log?.push({ offset, length: Math.max(0, end - offset), into: false });
      return bytes.slice(offset, end);
    },
  };
  if (opts.readInto !== false) {
    src.readInto = async (offset, target) => {
      log?.push({ offset, length: target.length, into: true });
      if (offset + target.length > bytes.length) throw new Error(`${name}: read past the end`);
      target.set(bytes.subarray(offset, offset + target.length));
    };
  }
  return src;
}

const kindAndBytes = (a: ArrayBufferView) => [a.constructor.name, Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('base64')];

function fieldsOf(fs: readonly FieldArray[]) {
  return fs.map((f) => ({ name: f.name, association: f.association, components: f.components, sourceType: f.sourceType, role: f.role, values: kindAndBytes(f.values) }));
}

/** Everything a dataset holds, as plain data (typed arrays as their kind and bytes). */
export function datasetContent(d: Dataset) {
  return {
    source: d.source, kind: d.kind, warnings: d.warnings, fileCellTypes: d.fileCellTypes, fieldData: fieldsOf(d.fieldData),
    pieces: d.pieces.map((p) => ({
      points: kindAndBytes(p.points), cellTypes: kindAndBytes(p.cellTypes), offsets: kindAndBytes(p.offsets), connectivity: kindAndBytes(p.connectivity),
      polyFaces: p.polyFaces && [kindAndBytes(p.polyFaces.cellFaceStart), kindAndBytes(p.polyFaces.faceOffsets), kindAndBytes(p.polyFaces.faceConnectivity)],
      pointData: fieldsOf(p.pointData), cellData: fieldsOf(p.cellData),
    })),
  };
}

/** Expects two datasets to hold exactly the same arrays (kinds and bytes), names, warnings and counts. */
export function expectSameContent(got: Dataset, want: Dataset, where: string): void {
  expect(datasetContent(got), where).toEqual(datasetContent(want));
}

/** Runs a load and returns the dataset or the error message. */
export async function outcome(load: () => Promise<Dataset>): Promise<{ ok: Dataset } | { error: string }> {
  try {
    return { ok: await load() };
  } catch (e) {
    return { error: e instanceof Error ? e.message : String(e) };
  }
}

/** Expects two load outcomes to be the same: equal datasets, or the same error message. */
export function expectSameOutcome(got: { ok: Dataset } | { error: string }, want: { ok: Dataset } | { error: string }, where: string): void {
  if ('error' in want) {
    expect('error' in got ? got.error : 'loaded', where).toBe(want.error);
    return;
  }
  expect('error' in got ? got.error : 'loaded', where).toBe('loaded');
  expectSameContent((got as { ok: Dataset }).ok, want.ok, where);
}
