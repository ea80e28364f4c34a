/**
 * No fluid is hard-coded in the app: property values of the presets (ρ and μ of water at 20 °C and of ISA
 * air) live only in the study layer's catalogue (src/study/units.ts), and the app's layers read them there.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const APP_LAYERS = ['src/app', 'src/ui', 'src/view', 'workers'];
const LITERALS = ['998.2', '1.0016e-3', '1.00160e-3', '0.0010016', '1.225', '1.7894e-5'];

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? files(p) : /\.ts$/.test(n) ? [p] : [];
  });
}

describe('fluid properties in the app', () => {
  it('appear in no file of the app layers', () => {
    const hits: string[] = [];
    for (const f of APP_LAYERS.flatMap((d) => files(join(ROOT, d)))) {
      const text = readFileSync(f, 'utf8');
      for (const l of LITERALS) if (text.includes(l)) hits.push(`${f.slice(ROOT.length + 1)}: ${l}`);
    }
    expect(hits).toEqual([]);
  });
});
