/**
 * The load's progress in bytes: counted reads of the chosen files (so it only grows, whatever order the
 * reader visits the arrays in), or the reader's parse position for a single file it took whole.
 */
import { describe, expect, it } from 'vitest';
import { bytesSource } from '../../src/io/byteSource.ts';
import { STRUCTURE_STAGE } from '../../src/io/xmlSkeleton.ts';
import { ReadMeter } from '../../workers/readMeter.ts';

const source = (name: string, size: number) => {
  const s = bytesSource(name, new Uint8Array(size));
  // a Blob-like source: reads only, no in-memory shortcut
  return { name: s.name, size: s.size, read: s.read, chunkBytes: 16 };
};
const report = (done: number, total: number) => ({ stage: 'arrays', bytesDone: done, bytesTotal: total });

describe('ReadMeter', () => {
  it('counts completed reads and never goes back, whatever positions the reader reports', async () => {
    const m = new ReadMeter(1000);
    const src = m.wrap(source('a.vtu', 1000));
    await src.read(0, 100);
    expect(m.done(report(900, 1000))).toBe(100);
    // an appended file's arrays lie out of order: the reader jumps back to an earlier offset
    await src.read(600, 300);
    expect(m.done(report(200, 1000))).toBe(400);
    await src.read(100, 500);
    expect(m.done(report(50, 1000))).toBe(900);
    expect(src.name).toBe('a.vtu');
    expect(src.chunkBytes).toBe(16);
  });
  it('passes on the parse position of a single file read whole, and caps at the total', async () => {
    const m = new ReadMeter(1000);
    const src = m.wrap(source('a.vtk', 1000));
    await src.read(0, 64);
    await src.read(0, 1000);
    expect(m.done(report(250, 1000))).toBe(250);
    expect(m.done(report(700, 1000))).toBe(700);
    expect(m.done(report(600, 1000))).toBe(700);
    expect(m.done(report(5000, 1000))).toBe(1000);
  });
  it('counts the pieces of a set together', async () => {
    const m = new ReadMeter(3000);
    const set = m.wrap(source('a.pvtu', 1000));
    await set.read(0, 1000);
    const p0 = m.wrap(source('a_0.vtu', 1000)), p1 = m.wrap(source('a_1.vtu', 1000));
    await p0.read(0, 1000);
    await p1.read(0, 400);
    expect(m.done(report(10, 1000))).toBe(2400);
  });
  it('an XML file with inline data: the structure pass by its position, then the array pass from zero by bytes fetched beyond it', async () => {
    const m = new ReadMeter(1000);
    const src = m.wrap(source('a.vtu', 1000));
    const structure = (done: number) => ({ stage: STRUCTURE_STAGE, bytesDone: done, bytesTotal: 1000 });
    await src.read(0, 400);
    expect(m.done(structure(400))).toBe(400);
    await src.read(400, 600);
    expect(m.done(structure(1000))).toBe(1000);
    // the arrays: the bar starts again and counts what is fetched beyond the first pass
    await src.read(10, 300);
    expect(m.done(report(310, 1000))).toBe(300);
    await src.read(310, 500);
    expect(m.done(report(810, 1000))).toBe(800);
    expect(m.done(report(200, 1000))).toBe(800);
  });
});
