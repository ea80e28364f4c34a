/**
 * Test helper: two report folders of one set — `report` on the whole set and `reduce` of its `partial`
 * results — hold the same numbers (to rounding), notes, messages, inputs, tables and picture.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';

export type Quantity = { key: string; value: number; unit: string };
export type ProbeResult = { id: string; ok: boolean; error: string | null; definition: string; anchor: number[] | null; notes: string[]; quantities: Quantity[] };
export type Results = { failed: number; inputs: { name: string; sha256: string; bytes: number; role: string }[]; files: { file: string; source: string; probes: ProbeResult[] }[] };

export const readJson = (p: string): Results => JSON.parse(readFileSync(p, 'utf8')) as Results;
const close = (a: number, b: number) => Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b)) + 1e-300;

/** Every number, note and message of the two folders agree (numbers to rounding); the picture is the same. */
export function expectSameReport(whole: string, reduced: string): Results {
  const a = readJson(join(whole, 'results.json')), b = readJson(join(reduced, 'results.json'));
  expect(b.failed).toBe(a.failed);
  expect(b.inputs).toEqual(a.inputs);
  expect(b.files.map((f) => [f.file, f.source])).toEqual(a.files.map((f) => [f.file, f.source]));
  const pa = a.files[0]!.probes, pb = b.files[0]!.probes;
  expect(pb.map((p) => p.id)).toEqual(pa.map((p) => p.id));
  pa.forEach((p, i) => {
    const q = pb[i]!;
    expect([q.ok, q.error, q.notes, q.definition]).toEqual([p.ok, p.error, p.notes, p.definition]);
    expect(q.quantities.map((x) => `${x.key} [${x.unit}]`)).toEqual(p.quantities.map((x) => `${x.key} [${x.unit}]`));
    p.quantities.forEach((x, k) => { if (!close(x.value, q.quantities[k]!.value)) expect.fail(`${p.id}.${x.key}: report ${x.value}, reduce ${q.quantities[k]!.value}`); });
  });
  const rows = (f: string) => readFileSync(f, 'utf8').split('\n').filter((l) => !l.startsWith('#'));
  for (const csv of ['results.csv', 'results-long.csv']) {
    const ra = rows(join(whole, csv)), rb = rows(join(reduced, csv));
    expect(rb[0]).toBe(ra[0]);
    expect(rb.length).toBe(ra.length);
  }
  expect(readFileSync(join(reduced, 'probe-set.json'), 'utf8')).toBe(readFileSync(join(whole, 'probe-set.json'), 'utf8'));
  expect(Buffer.compare(readFileSync(join(reduced, 'view-1.png')), readFileSync(join(whole, 'view-1.png')))).toBe(0);
  return b;
}
