/**
 * The run checks of ids and floats (src/io/elementConvert.ts `narrowIds`, `finishDirect`; src/io/partReads.ts
 * `ChunkScan`): a run is summed up without a branch per value, and only a run that fails is searched for its first
 * bad value. Each case is set against a reference written here, one value at a time through DataView (ECMAScript's
 * byte-order-explicit reader): the same arrays, the same first bad entry in the same message, the same noted range
 * and first non-finite index — for Int64, UInt64, Int32 and UInt32 ids in both byte orders, with the bad value in
 * the middle of a chunk, at a chunk's end, at the next chunk's start and at the array's end.
 */
import { describe, expect, it } from 'vitest';
import { SCRATCH_BYTES, allocateTarget, convertChunk, finishDirect, isDirect, lastIdRun, type ArrayPlan } from '../../src/io/elementConvert.ts';
import { ELEMENT_SIZE, type ElementType } from '../../src/io/elementTypes.ts';
import { readArray } from '../../src/io/sourceArrays.ts';
import { notedFirstNonFinite, notedWithin } from '../../src/model/arrayScans.ts';
import { copyingSource } from '../helpers/sources.ts';

type IdType = 'Int64' | 'UInt64' | 'Int32' | 'UInt32';

/** `values` as `type` in the given byte order (DataView). */
function encode(type: IdType, values: bigint[], le: boolean): Uint8Array {
  const size = ELEMENT_SIZE[type], out = new Uint8Array(values.length * size), dv = new DataView(out.buffer);
  values.forEach((v, i) => {
    if (type === 'Int64') dv.setBigInt64(i * size, v, le);
    else if (type === 'UInt64') dv.setBigUint64(i * size, v, le);
    else if (type === 'Int32') dv.setInt32(i * size, Number(v), le);
    else dv.setUint32(i * size, Number(v), le);
  });
  return out;
}

/** What a value-by-value check says: the ids (lead slot first), or the message for the first value outside [min, max]. */
function reference(bytes: Uint8Array, type: IdType, le: boolean, lead: number, min: number, max: number, where: string): number[] | string {
  const size = ELEMENT_SIZE[type], dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.length), out: number[] = new Array(lead).fill(0);
  for (let i = 0; i < bytes.length / size; i++) {
    const v = type === 'Int64' ? dv.getBigInt64(i * size, le) : type === 'UInt64' ? dv.getBigUint64(i * size, le)
      : BigInt(type === 'Int32' ? dv.getInt32(i * size, le) : dv.getUint32(i * size, le));
    if (v < BigInt(min) || v > BigInt(max)) return `${where}: value ${v} at index ${i} is not an id in ${min}..${max}`;
    out.push(Number(v));
  }
  return out;
}

/** What the readers make of it: by `readArray` from a source read in chunks, and chunk by chunk as the part readers do. */
async function viaReaders(bytes: Uint8Array, plan: ArrayPlan, count: number, chunk: number): Promise<{ read: number[] | string; chunks: number[] | string; noted: boolean }> {
  const size = ELEMENT_SIZE[plan.type];
  let read: number[] | string, noted = false;
  try {
    const a = await readArray(copyingSource('f', bytes, { chunkBytes: chunk * size }), 0, count, plan);
    read = Array.from(a);
    noted = notedWithin(a, Math.min(...read.slice(plan.lead ?? 0)), Math.max(...read.slice(plan.lead ?? 0)))
      && !notedWithin(a, Math.min(...read.slice(plan.lead ?? 0)) + 1, Infinity) && !notedWithin(a, -Infinity, Math.max(...read.slice(plan.lead ?? 0)) - 1);
  } catch (e) {
    read = (e as Error).message;
  }
  let chunks: number[] | string;
  const out = allocateTarget(plan, count);
  try {
    for (let i = 0; i < count; i += chunk) {
      const k = Math.min(chunk, count - i), part = bytes.slice(i * size, (i + k) * size);
      if (isDirect(plan)) {
        new Uint8Array(out.buffer, out.byteOffset + ((plan.lead ?? 0) + i) * size, part.length).set(part);
        finishDirect(plan, out, i, k);
      } else {
        convertChunk(plan, part, k, out, i);
      }
      // The run was summed up, not searched value by value: its range is noted (the fast path did the work).
      expect([lastIdRun.out?.deref() === out, lastIdRun.from, lastIdRun.count]).toEqual([true, i, k]);
      const ids = Array.from(out.subarray((plan.lead ?? 0) + i, (plan.lead ?? 0) + i + k));
      expect([lastIdRun.min, lastIdRun.max]).toEqual([Math.min(...ids), Math.max(...ids)]);
    }
    chunks = Array.from(out);
  } catch (e) {
    chunks = (e as Error).message;
  }
  return { read, chunks, noted };
}

const TYPES: IdType[] = ['Int64', 'UInt64', 'Int32', 'UInt32'];
const CHUNK = 1000, COUNT = 2500;

/** Bad values to plant, by what they break (the check of 64-bit values looks at both words). */
function badValues(type: IdType, max: number): [string, bigint][] {
  const out: [string, bigint][] = [['past max', BigInt(max) + 1n]];
  if (type === 'Int64' || type === 'Int32') out.push(['negative', -1n], ['least Int32', -(2n ** 31n)]);
  if (type === 'Int64') out.push(['low word in range, high word not', 2n ** 32n + 5n], ['negative, high word −1 only', -(2n ** 32n) + 7n]);
  if (type === 'UInt64') out.push(['2^31', 2n ** 31n], ['2^64 − 1 (both words all ones)', 2n ** 64n - 1n], ['low word in range, high word not', 2n ** 33n + 3n]);
  if (type === 'UInt32') out.push(['2^31', 2n ** 31n], ['2^32 − 1', 2n ** 32n - 1n]);
  return out;
}

describe('ids checked per run give the value-by-value arrays and messages', () => {
  for (const type of TYPES) {
    for (const le of [true, false]) {
      it(`${type}, ${le ? 'little' : 'big'}-endian`, async () => {
        const min = 0, max = 4_000_000, where = 'f: DataArray "connectivity"';
        const good = Array.from({ length: COUNT }, (_, i) => BigInt((i * 7919) % (max + 1)));
        for (const lead of [0, 1]) {
          const plan: ArrayPlan = { type, littleEndian: le, target: 'ids', max, where, ...(lead ? { lead } : {}) };
          // Clean arrays: every value, and the range noted for the piece checks.
          const clean = encode(type, good, le);
          const want = reference(clean, type, le, lead, min, max, where);
          const r = await viaReaders(clean, plan, COUNT, CHUNK);
          expect(r.read).toEqual(want);
          expect(r.chunks).toEqual(want);
          expect(r.noted, 'noted range is the least and greatest id').toBe(true);
          // One bad value: in the middle of a chunk, at a chunk's end, at the next chunk's start, the array's last.
          for (const at of [CHUNK / 2, CHUNK - 1, CHUNK, COUNT - 1]) {
            for (const [what, v] of badValues(type, max)) {
              const values = good.slice();
              values[at] = v;
              // A second bad value later on: the message still names the first.
              if (at + 3 < COUNT) values[at + 3] = BigInt(max) + 9n;
              const bytes = encode(type, values, le);
              const msg = reference(bytes, type, le, lead, min, max, where);
              expect(msg, `${what} at ${at}`).toMatch(new RegExp(`at index ${at} is not an id`));
              const got = await viaReaders(bytes, plan, COUNT, CHUNK);
              expect(got.read, `${what} at ${at}, read`).toBe(msg);
              expect(got.chunks, `${what} at ${at}, chunk by chunk`).toBe(msg);
            }
          }
        }
      });
    }
  }

  it('a range that is not 0..2^31 − 1: min and max of the plan, ids below the least refused', async () => {
    for (const type of ['Int64', 'Int32'] as const) {
      for (const le of [true, false]) {
        const plan: ArrayPlan = { type, littleEndian: le, target: 'ids', min: 5, max: 900, where: 'f: faces' };
        const values = Array.from({ length: COUNT }, (_, i) => BigInt(5 + (i % 896)));
        expect((await viaReaders(encode(type, values, le), plan, COUNT, CHUNK)).read).toEqual(values.map(Number));
        values[1700] = 4n;
        const msg = 'f: faces: value 4 at index 1700 is not an id in 5..900';
        const got = await viaReaders(encode(type, values, le), plan, COUNT, CHUNK);
        expect([got.read, got.chunks]).toEqual([msg, msg]);
      }
    }
  });

  it('arrays of more than one scratch (the readers\' own chunks): values, messages and the noted range', async () => {
    const n = Math.ceil((2.5 * SCRATCH_BYTES) / 8), step = SCRATCH_BYTES / 8;
    for (const le of [true, false]) {
      const values = Array.from({ length: n }, (_, i) => BigInt((i * 2654435761) % 2147483647));
      const plan: ArrayPlan = { type: 'Int64', littleEndian: le, target: 'ids', where: 'f: c' };
      const a = await readArray(copyingSource('f', encode('Int64', values, le)), 0, n, plan);
      expect(Array.from(a)).toEqual(values.map(Number));
      for (const at of [step - 1, step, n - 1]) {
        const bad = values.slice();
        bad[at] = -5n;
        await expect(readArray(copyingSource('f', encode('Int64', bad, le)), 0, n, plan)).rejects.toThrow(`f: c: value -5 at index ${at} is not an id in 0..2147483647`);
      }
    }
  });
});

describe('floats scanned per run note the first non-finite value', () => {
  for (const type of ['Float32', 'Float64'] as const) {
    it(`${type}: the index of the first NaN or infinity, wherever it lies, and −1 for finite arrays`, async () => {
      const size = ELEMENT_SIZE[type as ElementType];
      const enc = (values: number[]) => {
        const b = new Uint8Array(values.length * size), dv = new DataView(b.buffer);
        values.forEach((v, i) => (type === 'Float32' ? dv.setFloat32(i * size, v, true) : dv.setFloat64(i * size, v, true)));
        return b;
      };
      const base = Array.from({ length: COUNT }, (_, i) => Math.sin(i) * 1e30 * (i % 2 ? -1 : 1));
      const plan: ArrayPlan = { type, littleEndian: true, target: 'values', where: 'f: p' };
      const clean = await readArray(copyingSource('f', enc(base), { chunkBytes: CHUNK * size }), 0, COUNT, plan);
      expect(notedFirstNonFinite(clean)).toBe(-1);
      for (const at of [0, CHUNK / 2, CHUNK - 1, CHUNK, COUNT - 1]) {
        for (const bad of [NaN, Infinity, -Infinity]) {
          const values = base.slice();
          values[at] = bad;
          if (at + 2 < COUNT) values[at + 2] = NaN;
          const a = await readArray(copyingSource('f', enc(values), { chunkBytes: CHUNK * size }), 0, COUNT, plan);
          expect(notedFirstNonFinite(a), `${bad} at ${at}`).toBe(at);
        }
      }
    });
  }
});
