/** Choosing what to open from the files a user picked: the only file, else the set file, else a clear refusal. */
import { describe, expect, it } from 'vitest';
import { loadRequestFor, requestBytes } from '../../src/app/fileChoice.ts';

const file = (name: string, size = 3, relative = '') => {
  const f = new File([new Uint8Array(size)], name);
  if (relative) Object.defineProperty(f, 'webkitRelativePath', { value: relative });
  return f;
};

describe('loadRequestFor', () => {
  it('opens a single file whatever its name', () => {
    const r = loadRequestFor([file('result.bin')]);
    expect(r.kind === 'files' && r.main.path).toBe('result.bin');
  });
  it('opens the set file and passes its pieces by path', () => {
    const r = loadRequestFor([file('a_0.vtu', 5), file('a.pvtu', 7), file('a_1.vtu', 11)]);
    if (r.kind !== 'files') throw new Error('expected files');
    expect(r.main.path).toBe('a.pvtu');
    expect(r.others.map((f) => f.path)).toEqual(['a_0.vtu', 'a_1.vtu']);
    expect(requestBytes(r)).toBe(23);
  });
  it('picks the shallowest set file of a folder', () => {
    const r = loadRequestFor([file('b.vtm', 1, 'case/sub/b.vtm'), file('a.vtm', 1, 'case/a.vtm'), file('p.vtu', 1, 'case/sub/p.vtu')]);
    expect(r.kind === 'files' && r.main.path).toBe('case/a.vtm');
  });
  it('refuses several result files without a set file', () => {
    expect(() => loadRequestFor([file('a.vtu'), file('b.vtu')])).toThrow(/2 files chosen and none is a set file/);
  });
});
