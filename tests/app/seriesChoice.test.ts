import { describe, expect, it } from 'vitest';
import { seriesChoiceFor } from '../../src/app/seriesChoice.ts';

/** Node has File since v20; a folder's files carry their path in webkitRelativePath. */
function files(...paths: string[]): File[] {
  return paths.map((p) => {
    const f = new File([new Uint8Array(1)], p.split('/').pop()!);
    if (p.includes('/')) Object.defineProperty(f, 'webkitRelativePath', { value: p });
    return f;
  });
}

describe('series among the chosen files', () => {
  it('a .pvd with its files is a collection series', () => {
    const c = seriesChoiceFor(files('run/flow.pvd', 'run/flow_0.vtu', 'run/flow_1.vtu'))!;
    expect(c.collection).toBe('run/flow.pvd');
    expect(c.name).toBe('flow.pvd');
    expect(c.files.map((f) => f.path)).toEqual(['run/flow.pvd', 'run/flow_0.vtu', 'run/flow_1.vtu']);
  });

  it('numbered result files are steps in number order, not letter order', () => {
    const c = seriesChoiceFor(files('cells_10.vtu', 'cells_9.vtu', 'cells_11.vtu'))!;
    expect(c.steps).toEqual(['cells_9.vtu', 'cells_10.vtu', 'cells_11.vtu']);
    expect(c.name).toBe('cells_9.vtu … cells_11.vtu');
  });

  it('a folder of per-step sets: the sets are the steps, their pieces are not', () => {
    const c = seriesChoiceFor(files('out/s_1.pvtu', 'out/s_2.pvtu', 'out/s_1/p_0.vtu', 'out/s_1/p_1.vtu', 'out/s_2/p_0.vtu', 'out/s_2/p_1.vtu'))!;
    expect(c.steps).toEqual(['out/s_1.pvtu', 'out/s_2.pvtu']);
    expect(c.name).toBe('out');
  });

  it('one file, or one set with its pieces, is not a series', () => {
    expect(seriesChoiceFor(files('a.vtu'))).toBeNull();
    expect(seriesChoiceFor(files('set.pvtu', 'set_0.vtu', 'set_1.vtu'))).toBeNull();
    // several sets that are not numbered steps: the single-result path opens the shallowest, as before
    expect(seriesChoiceFor(files('d/main.vtm', 'd/other.pvtu', 'd/main/p_0.vtu'))).toBeNull();
  });

  it('files of two sequences, or two collections, are refused with the names', () => {
    expect(() => seriesChoiceFor(files('a_1.vtu', 'a_2.vtu', 'b_1.vtu'))).toThrow(/files of 2 sequences/);
    expect(() => seriesChoiceFor(files('x.pvd', 'y.pvd'))).toThrow('2 collection files chosen (x.pvd, y.pvd); choose one .pvd with its step files');
  });
});
