/**
 * `npm run bench` with no names runs the light set; heavy benchmarks (big files, GBs of memory, a browser,
 * VTK) run only when named. The heavy list must name real benchmark files of bench/.
 */
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { HEAVY, chooseBenchmarks } from '../../bench/benchSets.ts';

const names = readdirSync('bench').filter((f) => f.endsWith('.bench.ts')).map((f) => f.slice(0, -'.bench.ts'.length)).sort();

describe('benchmark sets', () => {
  it('every heavy name is a benchmark file; the 10M, VTK-versus and browser ones are heavy', () => {
    for (const n of Object.keys(HEAVY)) expect(names).toContain(n);
    for (const n of ['versus', 'scale', 'growth', 'viewer']) expect(HEAVY[n]).toBeDefined();
  });

  it('no names: every benchmark but the heavy ones, each heavy one left out with its reason', () => {
    const c = chooseBenchmarks(names, []);
    expect(c.run).toEqual(names.filter((n) => !(n in HEAVY)));
    expect(c.run.length).toBeGreaterThan(0);
    expect(c.leftOut).toEqual(HEAVY);
    expect(c.unknown).toEqual([]);
  });

  it('names run exactly those; "heavy" adds the heavy set, "all" runs everything; unknown words are reported', () => {
    const toy = ['cut', 'load', 'scale', 'stats'], heavy = (n: string) => n in HEAVY;
    expect(chooseBenchmarks(toy, ['stats', 'scale']).run).toEqual(['scale', 'stats']);
    expect(chooseBenchmarks(toy, ['stats', 'scale']).leftOut).toEqual({ cut: 'not named', load: `heavy, not named: ${HEAVY.load}` });
    expect(chooseBenchmarks(toy, ['heavy']).run).toEqual(toy.filter(heavy));
    expect(chooseBenchmarks(toy, ['heavy', 'cut']).run).toEqual(['cut', 'load', 'scale']);
    expect(chooseBenchmarks(toy, ['all']).run).toEqual(toy);
    expect(chooseBenchmarks(toy, ['cutt', 'all']).unknown).toEqual(['cutt']);
  });
});
