/**
 * File elements → final model arrays, chunk by chunk (src/io/elementConvert.ts) and from a source
 * (src/io/sourceArrays.ts): every element type in both byte orders, to the model's own type, to doubles
 * and to checked Int32 ids, with a leading zero slot, across chunk boundaries, and the messages for
 * values out of range (naming their index in the whole array). Reference: the platform's DataView
 * (ECMAScript's byte-order-explicit reader) decodes the same bytes.
 */
import { describe, expect, it } from 'vitest';
import { bytesSource } from '../../src/io/byteSource.ts';
import { SCRATCH_BYTES, allocateTarget, convertChunk, finishDirect, isDirect, swapInPlace, type ArrayPlan } from '../../src/io/elementConvert.ts';
import { ELEMENT_SIZE, type ElementType } from '../../src/io/elementTypes.ts';
import { readArray } from '../../src/io/sourceArrays.ts';
import { copyingSource } from '../helpers/sources.ts';

const TYPES: ElementType[] = ['Int8', 'UInt8', 'Int16', 'UInt16', 'Int32', 'UInt32', 'Int64', 'UInt64', 'Float32', 'Float64'];

/** Values every type holds exactly (ids among them: non-negative integers below 2^31 − 1). */
function valuesFor(t: ElementType, n: number): number[] {
  const max: Partial<Record<ElementType, number>> = { Int8: 127, UInt8: 255, Int16: 32767, UInt16: 65535 };
  const top = max[t] ?? 2147483647;
  return Array.from({ length: n }, (_, i) => (i * 7919) % (top + 1));
}

/** `values` as `t` in the given byte order, written with DataView. */
function encode(t: ElementType, values: number[], littleEndian: boolean): Uint8Array {
  const size = ELEMENT_SIZE[t], out = new Uint8Array(values.length * size), dv = new DataView(out.buffer);
  values.forEach((v, i) => {
    const o = i * size;
    switch (t) {
      case 'Int8': dv.setInt8(o, v); break;
      case 'UInt8': dv.setUint8(o, v); break;
      case 'Int16': dv.setInt16(o, v, littleEndian); break;
      case 'UInt16': dv.setUint16(o, v, littleEndian); break;
      case 'Int32': dv.setInt32(o, v, littleEndian); break;
      case 'UInt32': dv.setUint32(o, v, littleEndian); break;
      case 'Int64': dv.setBigInt64(o, BigInt(v), littleEndian); break;
      case 'UInt64': dv.setBigUint64(o, BigInt(v), littleEndian); break;
      case 'Float32': dv.setFloat32(o, v, littleEndian); break;
      case 'Float64': dv.setFloat64(o, v, littleEndian); break;
    }
  });
  return out;
}

describe('element conversion', () => {
  for (const type of TYPES) {
    for (const littleEndian of [true, false]) {
      it(`${type}, ${littleEndian ? 'little' : 'big'}-endian: to values, doubles and ids, by chunk and from a source`, async () => {
        const n = 1000, values = valuesFor(type, n);
        const bytes = encode(type, values, littleEndian);
        for (const target of ['values', 'float64', 'ids'] as const) {
          const plan: ArrayPlan = { type, littleEndian, target, where: 'f: a', ...(target === 'ids' ? { lead: 1 } : {}) };
          const out = allocateTarget(plan, n);
          // In three uneven chunks, the way readers feed the scratch.
          for (const [a, b] of [[0, 1], [1, 400], [400, n]] as const) {
            const size = ELEMENT_SIZE[type], chunk = bytes.slice(a * size, b * size);
            if (isDirect(plan)) {
              new Uint8Array(out.buffer, out.byteOffset + ((plan.lead ?? 0) + a) * size, chunk.length).set(chunk);
              finishDirect(plan, out, a, b - a);
            } else {
              convertChunk(plan, chunk, b - a, out, a);
            }
          }
          const want = target === 'ids' ? [0, ...values] : values;
          expect(Array.from(out), `${target}`).toEqual(want);
          expect(out.constructor.name).toBe(target === 'ids' ? 'Int32Array' : target === 'float64' || type.endsWith('64') ? 'Float64Array' : `${type.replace('UInt', 'Uint')}Array`);
          for (const src of [bytesSource('f', bytes), copyingSource('f', bytes), copyingSource('f', bytes, { readInto: false })]) {
            expect(Array.from(await readArray(src, 0, n, plan)), `${target} from a source`).toEqual(want);
          }
        }
      });
    }
  }

  it('swaps 2-, 4- and 8-byte elements in place', () => {
    const b = Uint8Array.from([1, 2, 3, 4, 5, 6, 7, 8]);
    swapInPlace(b, 4, 2);
    expect(Array.from(b)).toEqual([2, 1, 4, 3, 6, 5, 8, 7]);
    swapInPlace(b, 2, 4);
    expect(Array.from(b)).toEqual([3, 4, 1, 2, 7, 8, 5, 6]);
    swapInPlace(b, 1, 8);
    expect(Array.from(b)).toEqual([6, 5, 8, 7, 2, 1, 4, 3]);
  });

  it('arrays longer than the scratch, read from a source, keep every value', async () => {
    const n = Math.ceil((2.5 * SCRATCH_BYTES) / 8);
    const values = Array.from({ length: n }, (_, i) => (i * 2654435761) % 2147483647);
    for (const littleEndian of [true, false]) {
      const bytes = encode('Int64', values, littleEndian);
      const got = await readArray(copyingSource('f', bytes), 0, n, { type: 'Int64', littleEndian, target: 'ids', where: 'f' });
      expect(got.length).toBe(n);
      expect(got.every((v, i) => v === values[i])).toBe(true);
    }
  });

  it('64-bit ids and cell types read as 32-bit words (host order, aligned) equal the DataView path (unaligned), values and refusals alike', () => {
    const cases: [ElementType, 'ids' | 'cellTypes', bigint[]][] = [
      ['Int64', 'ids', [0n, 1n, 2147483647n, 42n]],
      ['UInt64', 'ids', [0n, 7n, 2147483647n]],
      ['Int64', 'cellTypes', [10n, 12n, 42n, 255n]],
      ['Int64', 'ids', [0n, 1n, -1n, 3n]],                    // negative id
      ['Int64', 'ids', [0n, 2n ** 32n + 5n, 1n]],            // low word in range, high word not
      ['UInt64', 'ids', [0n, 2n ** 31n, 1n]],                // beyond Int32
      ['Int64', 'cellTypes', [10n, 256n, 12n]],              // not a byte
    ];
    for (const [type, target, values] of cases) {
      for (const littleEndian of [true, false]) {
        const run = (misalign: number): string => {
          const raw = new Uint8Array(8 * values.length + misalign), dv = new DataView(raw.buffer, misalign);
          values.forEach((v, i) => (type === 'Int64' ? dv.setBigInt64(8 * i, v, littleEndian) : dv.setBigUint64(8 * i, v, littleEndian)));
          const plan: ArrayPlan = { type, littleEndian, target, where: 'f: a', badCellType: (c, t) => new Error(`cell ${c} has type ${t}`) };
          const out = allocateTarget(plan, values.length);
          try { convertChunk(plan, raw.subarray(misalign), values.length, out, 0); } catch (e) { return `error: ${(e as Error).message}`; }
          return Array.from(out).join(',');
        };
        const aligned = run(0), unaligned = run(2);
        expect(aligned, `${type} ${target} ${values.join(' ')}`).toBe(unaligned);
        if (values.every((v) => v >= 0n && v <= (target === 'ids' ? 2147483647n : 255n))) expect(aligned).toBe(values.join(','));
        else expect(aligned).toMatch(/^error: /);
      }
    }
  });

  it('out-of-range values are refused naming their index in the whole array', async () => {
    const ids = encode('Int64', [0, 1, 2, 3], true);
    new DataView(ids.buffer).setBigInt64(16, 3_000_000_000n, true);
    await expect(readArray(bytesSource('f', ids), 0, 4, { type: 'Int64', littleEndian: true, target: 'ids', where: 'f: DataArray "connectivity"' }))
      .rejects.toThrow('f: DataArray "connectivity": value 3000000000 at index 2 is not an id in 0..2147483647');
    const neg = encode('Int32', [0, 5, -3], false);
    const plan: ArrayPlan = { type: 'Int32', littleEndian: false, target: 'ids', where: 'f: offsets' };
    const out = allocateTarget(plan, 3);
    expect(() => {
      new Uint8Array(out.buffer).set(neg.subarray(0, 4)); finishDirect(plan, out, 0, 1);
      new Uint8Array(out.buffer, 4).set(neg.subarray(4)); finishDirect(plan, out, 1, 2);
    }).toThrow('f: offsets: value -3 at index 2 is not an id in 0..2147483647');
    const big = encode('UInt64', [1, 2], false);
    new DataView(big.buffer).setBigUint64(8, 2n ** 60n, false);
    await expect(readArray(bytesSource('f', big), 0, 2, { type: 'UInt64', littleEndian: false, target: 'values', where: 'f: p' }))
      .rejects.toThrow(`f: p: 64-bit value ${2n ** 60n} at index 1 is beyond ±2^53 and cannot be held exactly`);
    const exact = encode('Int64', [0], true);
    new DataView(exact.buffer).setBigInt64(0, -(2n ** 53n), true);
    expect(Array.from(await readArray(bytesSource('f', exact), 0, 1, { type: 'Int64', littleEndian: true, target: 'values', where: 'f' }))).toEqual([-(2 ** 53)]);
    const types = encode('Int32', [12, 10, 300], false);
    await expect(readArray(bytesSource('f', types), 0, 3, { type: 'Int32', littleEndian: false, target: 'cellTypes', where: 'f', badCellType: (c, t) => new Error(`cell ${c} has type ${t}`) }))
      .rejects.toThrow('cell 2 has type 300');
  });
});
