/**
 * The committed files in sample-fields/ are exactly what the generator makes now (regenerated in memory
 * and compared byte for byte), so they never drift from src/samples. After a deliberate change to the
 * samples, run `npm run make-fields` and commit the result.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sampleReadme } from '../../src/samples/sampleReadme.ts';
import { committedSamples } from '../../src/samples/sampleSet.ts';
import { VORTEX_NUMBERED_DIR, VORTEX_PVD_DIR, vortexSeriesFiles } from '../../src/samples/vortexSeries.ts';

const DIR = resolve(__dirname, '../../sample-fields');
const HINT = 'run `npm run make-fields` to regenerate sample-fields/';

/** Index of the first differing byte, or −1. */
function firstDifference(a: Uint8Array, b: Uint8Array): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return i;
  return a.length === b.length ? -1 : n;
}

describe('committed sample files match the generator', () => {
  const entries = committedSamples();
  const made: { name: string; bytes: number; entry: (typeof entries)[number]; dataset: ReturnType<(typeof entries)[number]['dataset']> }[] = [];

  for (const entry of entries) {
    it(entry.name, () => {
      const dataset = entry.dataset();
      const bytes = entry.encode(dataset);
      const onDisk = new Uint8Array(readFileSync(join(DIR, entry.name)));
      const at = firstDifference(bytes, onDisk);
      expect(at, `${entry.name}: differs from the generator at byte ${at} (generator ${bytes.length} bytes, file ${onDisk.length}); ${HINT}`).toBe(-1);
      made.push({ name: entry.name, bytes: bytes.length, entry, dataset });
    });
  }

  it('README.md', () => {
    expect(made.length, 'every sample file must match first').toBe(entries.length);
    const text = sampleReadme(made.map((m) => ({ entry: m.entry, dataset: m.dataset, bytes: m.bytes })));
    expect(readFileSync(join(DIR, 'README.md'), 'utf8'), HINT).toBe(text);
  });

  it('the sample series (vortex cell) match the generator', () => {
    const files = vortexSeriesFiles();
    for (const dir of [VORTEX_PVD_DIR, VORTEX_NUMBERED_DIR]) {
      expect(readdirSync(join(DIR, dir)).sort(), HINT).toEqual(Object.keys(files).filter((n) => n.startsWith(`${dir}/`)).map((n) => n.slice(dir.length + 1)).sort());
    }
    for (const [name, bytes] of Object.entries(files)) {
      const at = firstDifference(bytes, new Uint8Array(readFileSync(join(DIR, name))));
      expect(at, `${name}: differs from the generator at byte ${at}; ${HINT}`).toBe(-1);
    }
  });

  it('sample-fields/ holds nothing else (besides the git-ignored large/), under 10 MB in total', () => {
    const names = readdirSync(DIR).filter((n) => n !== 'large').sort();
    expect(names).toEqual([...entries.map((e) => e.name), 'README.md', VORTEX_PVD_DIR, VORTEX_NUMBERED_DIR].sort());
    const series = Object.keys(vortexSeriesFiles());
    const total = names.filter((n) => !n.startsWith('vortex-cell')).reduce((s, n) => s + statSync(join(DIR, n)).size, 0)
      + series.reduce((s, n) => s + statSync(join(DIR, n)).size, 0);
    expect(total).toBeLessThan(10 * 1024 * 1024);
  });
});
