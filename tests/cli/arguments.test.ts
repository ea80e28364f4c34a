/**
 * Strict command-line arguments (issue 16): numbers are decimal and finite, directions can be
 * normalised, lists are not empty, physical values are positive and reference scales do not overflow;
 * every refusal is one line naming the option. Also the memory limit before a load and the streamed
 * CSV of a long line probe. Files: the committed samples (sample-fields/).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkReferenceScale, parseArgs, parseDirection, parseNumber, parseVec3 } from '../../src/cli/args.ts';
import { main } from '../../src/cli/main.ts';
import { DocumentError } from '../../src/study/checkValues.ts';
import { readProbeSet } from '../../src/study/probeSetFile.ts';

const PIPE = resolve(__dirname, '../../sample-fields/pipe-coarse.vtu');

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('number parsing', () => {
  it('accepts decimal numbers with sign, point and exponent', () => {
    expect(parseNumber('-1.5e-3', 'x')).toBe(-0.0015);
    expect(parseNumber('.5', 'x')).toBe(0.5);
    expect(parseNumber('2.', 'x')).toBe(2);
    expect(parseVec3(' 0, 0 ,1 ', 'normal')).toEqual([0, 0, 1]);
  });

  it('refuses empty parts, hex, blanks, words and overflow, naming the option', () => {
    expect(() => parseVec3(',,1', 'normal')).toThrow('--normal: expected component x of x,y,z written as a decimal number, got ",,1"');
    expect(() => parseVec3(',,', 'origin')).toThrow('--origin: expected component x of x,y,z written as a decimal number, got ",,"');
    expect(() => parseVec3('0x1,0,0', 'origin')).toThrow(/^--origin: expected component x/);
    expect(() => parseVec3('1,2', 'origin')).toThrow('--origin: expected three numbers x,y,z, got "1,2"');
    expect(() => parseNumber('0x1', 'rho')).toThrow('--rho: expected a number written as a decimal number, got "0x1"');
    expect(() => parseNumber('', 'rho')).toThrow(/^--rho: expected a number/);
    expect(() => parseNumber('Infinity', 'rho')).toThrow(/^--rho: expected a number/);
    expect(() => parseNumber('1e999', 'rho')).toThrow('--rho: "1e999" is out of range (expected a finite number of magnitude below 1.8e308)');
  });

  it('refuses directions that cannot be normalised (zero, denormal, huge)', () => {
    expect(parseDirection('0,0,2', 'normal')).toEqual([0, 0, 2]);
    expect(() => parseDirection('0,0,0', 'normal')).toThrow('--normal: the direction "0,0,0" has zero length; expected a vector such as 0,0,1');
    expect(() => parseDirection('1e-320,0,0', 'normal')).toThrow(/^--normal: the direction "1e-320,0,0" has a length too close to 0/);
    expect(() => parseDirection('1e200,0,0', 'normal')).toThrow(/too large to normalise/);
  });

  it('refuses reference scales that overflow or vanish', () => {
    expect(() => checkReferenceScale({ rho: 1.225, speed: 10, area: 0.5 })).not.toThrow();
    expect(() => checkReferenceScale({ rho: 1e300, speed: 1e10, area: 1 })).toThrow(/^reference values out of range: ½·ρ·V²·A = Infinity/);
    expect(() => checkReferenceScale({ rho: 1e-300, speed: 1e-10, area: 1e-10 })).toThrow(/^reference values out of range/);
    expect(() => checkReferenceScale({ rho: -1, speed: 1, area: 1 })).toThrow('--rho: expected a positive reference value, got -1');
  });

  it('refuses a switch given a value and an option given twice', () => {
    expect(() => parseArgs(['--json=no'], { json: 'boolean' }, 'info')).toThrow('info: option --json is a switch and takes no value (got "--json=no")');
    expect(() => parseArgs(['--out', 'a', '--out', 'b'], { out: 'string' }, 'report')).toThrow('report: option --out is given twice; give it once');
  });
});

describe('probe-set reference values', () => {
  it('an overflowing ½ρV²A is a problem of the document, like a negative density', () => {
    const doc = (reference: object) => JSON.stringify({ format: 'fieldtally-probe-set', version: 2, reference, probes: [] });
    expect(readProbeSet(doc({ density: 1.225, speed: 10, area: 0.5 }), 'ok.json').set.reference).toEqual({ density: 1.225, speed: 10, area: 0.5 });
    try {
      readProbeSet(doc({ density: 1e300, speed: 1e300, area: 1 }), 'big.json');
      throw new Error('expected a DocumentError');
    } catch (e) {
      expect(e).toBeInstanceOf(DocumentError);
      expect((e as DocumentError).issues).toEqual([{ path: 'reference', expected: 'reference values whose ½·ρ·V²·A (and ·L) is finite and non-zero', found: '"½·ρ·V²·A = Infinity"' }]);
    }
  });
});

describe('verbs refuse bad arguments with one line', () => {
  it('cut: --normal ,,1 and a denormal normal', async () => {
    const a = await run('cut', PIPE, '--origin', '0,0,0.05', '--normal', ',,1');
    expect([a.code, a.err]).toEqual([1, 'fieldtally cut: --normal: expected component x of x,y,z written as a decimal number, got ",,1"\n']);
    const b = await run('cut', PIPE, '--origin', '0,0,0.05', '--normal', '4e-324,0,0');
    expect(b.code).toBe(1);
    expect(b.err).toMatch(/^fieldtally cut: --normal: the direction "4e-324,0,0" has a length too close to 0/);
  });

  it('balance --planes ";;" is refused like an empty list', async () => {
    const r = await run('balance', PIPE, '--planes', ';;');
    expect([r.code, r.err]).toEqual([1, 'fieldtally balance: --planes: no plane in ";;"; expected "x,y,z@nx,ny,nz; …"\n']);
  });

  it('force: --mu 0 and -1 refused; overflowing reference refused', async () => {
    for (const mu of ['0', '-1']) {
      const r = await run('force', PIPE, '--groups', '1', '--mu', mu);
      expect([r.code, r.err]).toEqual([1, `fieldtally force: --mu: expected a dynamic viscosity in Pa·s (> 0), got "${mu}"\n`]);
    }
    const o = await run('force', PIPE, '--groups', '1', '--rho', '1e300', '--speed', '1e300', '--area', '1');
    expect(o.code).toBe(1);
    expect(o.err).toMatch(/^fieldtally force: reference values out of range: ½·ρ·V²·A = Infinity/);
  });

  it('report: --pictures 0 and 1.5 refused', async () => {
    for (const n of ['0', '1.5']) {
      const r = await run('report', PIPE, '--probes', 'x.json', '--out', '/tmp/never-made', '--pictures', n);
      expect([r.code, r.err]).toEqual([1, `fieldtally report: --pictures: expected a whole number of pictures, at least 1, got "${n}" (--no-pictures makes none)\n`]);
    }
  });
});

describe('memory limit', () => {
  it('line --samples above the cap is refused before loading', async () => {
    const r = await run('line', PIPE, '--from', '0,0,0', '--to', '0,0,0.1', '--samples', '1e8');
    expect([r.code, r.err]).toEqual([1, 'fieldtally line: --samples: expected a whole number from 2 to 10000000, got "1e8"\n']);
  });

  it('--allow-large is accepted by any verb; the CSV of a line is streamed in parts with the same rows', async () => {
    const parts: string[] = [];
    let err = '';
    const code = await main(['line', PIPE, '--from', '0,0,0', '--to', '0,0,0.1', '--samples', '25001', '--csv', '--fields', 'p', '--allow-large'],
      { out: () => { throw new Error('not streamed'); }, err: (t) => { err += t; }, write: async (p) => { parts.push(p); } });
    expect(code).toBe(0);
    expect(parts.length).toBe(4); // comment lines and header, then 10 000 + 10 000 + 5 001 rows
    const lines = parts.join('').trimEnd().split('\n');
    const comments = lines.filter((l) => l.startsWith('#'));
    expect(comments.some((l) => /Caution/i.test(l))).toBe(true);
    const rows = lines.filter((l) => !l.startsWith('#'));
    expect(rows[0]).toBe('s,x,y,z,valid,p');
    expect(rows.length).toBe(25002);
    expect(rows[25001]!.startsWith('0.1,0,0,0.1,')).toBe(true);
    expect(err).toBe('');
  });
});

describe('every verb shares the input guard', () => {
  it('a named pipe as sensor file, probe set or result file, and /dev/zero as a set piece, are refused by type', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-guard-'));
    try {
      const fifo = join(dir, 'pipe.csv');
      execFileSync('mkfifo', [fifo]);
      const set = join(dir, 'zero.pvtu');
      writeFileSync(set, '<VTKFile type="PUnstructuredGrid"><PUnstructuredGrid><Piece Source="/dev/zero"/></PUnstructuredGrid></VTKFile>');
      const probes = join(dir, 'set.json');
      writeFileSync(probes, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, probes: [] }));
      const cases: [string[], string][] = [
        [['point', PIPE, '--points', fifo], `fieldtally point: ${fifo}: is a named pipe, expected a regular file\n`],
        [['report', PIPE, '--probes', fifo, '--out', join(dir, 'r')], `fieldtally report: ${fifo}: is a named pipe, expected a regular file\n`],
        [['compare', PIPE, set, '--probes', probes], 'fieldtally compare: zero.pvtu: piece file "/dev/zero" is missing or unreadable (/dev/zero: is a character device, expected a regular file)\n'],
        [['gci', fifo, PIPE, PIPE, '--probes', probes], `fieldtally gci: ${fifo}: is a named pipe, expected a regular file\n`],
      ];
      for (const [argv, err] of cases) {
        const r = await run(...argv);
        expect([r.code, r.err], argv[0]).toEqual([1, err]);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
