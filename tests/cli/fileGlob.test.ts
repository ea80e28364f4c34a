/**
 * Glob patterns expanded by the command line itself (for quoted patterns). Reference: the usual shell
 * meanings of *, ?, [..], {a,b} and ** (as in POSIX sh and bash brace expansion).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expandGlob, expandInputs, segmentRegExp } from '../../src/cli/fileGlob.ts';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-glob-'));
  for (const f of ['a1.vtu', 'a2.vtu', 'b1.vtu', 'a1.vtk', '.hidden.vtu', 'runs/r1/case.vtu', 'runs/r2/case.vtu', 'runs/r2/deep/case.vtu']) {
    mkdirSync(join(dir, f, '..'), { recursive: true });
    writeFileSync(join(dir, f), '');
  }
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('glob expansion', () => {
  it('*, ?, classes and alternatives within a name; hidden files only when asked', () => {
    const names = (p: string) => expandGlob(join(dir, p)).map((f) => f.slice(dir.length + 1));
    expect(names('*.vtu')).toEqual(['a1.vtu', 'a2.vtu', 'b1.vtu']);
    expect(names('a?.vt?')).toEqual(['a1.vtk', 'a1.vtu', 'a2.vtu']);
    expect(names('[ab]1.vtu')).toEqual(['a1.vtu', 'b1.vtu']);
    expect(names('[!a]1.vtu')).toEqual(['b1.vtu']);
    expect(names('{a1,b1}.vtu')).toEqual(['a1.vtu', 'b1.vtu']);
    expect(names('.*.vtu')).toEqual(['.hidden.vtu']);
  });

  it('** matches any depth of folders', () => {
    const names = (p: string) => expandGlob(join(dir, p)).map((f) => f.slice(dir.length + 1));
    expect(names('runs/*/case.vtu')).toEqual(['runs/r1/case.vtu', 'runs/r2/case.vtu']);
    expect(names('runs/**/case.vtu')).toEqual(['runs/r1/case.vtu', 'runs/r2/case.vtu', 'runs/r2/deep/case.vtu']);
    expect(segmentRegExp('a.b*').test('a.bcd')).toBe(true);
    expect(segmentRegExp('a.b*').test('axbcd')).toBe(false);
  });

  it('plain names pass through; a pattern with no match is an error', () => {
    expect(expandInputs(['x.vtu', join(dir, 'b*.vtu')])).toEqual(['x.vtu', join(dir, 'b1.vtu')]);
    expect(() => expandInputs([join(dir, 'z*.vtu')])).toThrow(/^no file matches ".*z\*\.vtu"$/);
  });
});
