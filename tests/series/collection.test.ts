/**
 * Collection files (.pvd) and numbered sequences: times from the collection with uneven steps, several
 * parts per step, order by number rather than by name, and clear errors (the file and line) for
 * repeated times, missing attributes and mixed sequences. Hand-made inputs; the format follows VTK's
 * documentation of the XML collection file ("VTK File Formats", VTK User's Guide, section on .pvd).
 */
import { describe, expect, it } from 'vitest';
import { parseCollection } from '../../src/series/collection.ts';
import { orderNumbered, splitNumbered, stepFilesOfFolder } from '../../src/series/numberedFiles.ts';
import { checkIncreasingTimes, stepsInWindow } from '../../src/series/seriesIndex.ts';

const pvd = (body: string) => `<?xml version="1.0"?>\n<VTKFile type="Collection" version="0.1">\n<Collection>\n${body}\n</Collection>\n</VTKFile>\n`;

describe('collection files', () => {
  it('reads uneven timesteps, joins parts of a step and orders by time', () => {
    const idx = parseCollection(pvd([
      '<DataSet timestep="0.25" part="0" file="b0.vtu"/>',
      '<DataSet timestep="0" part="0" file="a0.vtu"/>',
      '<DataSet timestep="0" part="1" file="a1.vtu"/>',
      '<DataSet timestep="1e-1" part="0" file="dir/c0.vtu"/>',
    ].join('\n')), 'run.pvd');
    expect(idx.timeSource).toBe('collection');
    expect(idx.steps.map((s) => s.time)).toEqual([0, 0.1, 0.25]);
    expect(idx.steps[0]!.files).toEqual(['a0.vtu', 'a1.vtu']);
    expect(idx.steps[1]!.files).toEqual(['dir/c0.vtu']);
    expect(idx.steps[0]!.where).toBe('run.pvd line 5');
  });

  it('numbers steps in file order when no data set has a timestep', () => {
    const idx = parseCollection(pvd('<DataSet file="x.vtu"/>\n<DataSet file="y.vtu"/>'), 'n.pvd');
    expect(idx.timeSource).toBe('step-index');
    expect(idx.steps.map((s) => [s.time, s.files[0]])).toEqual([[0, 'x.vtu'], [1, 'y.vtu']]);
  });

  it('refuses repeated times, missing attributes and other roots with the line', () => {
    expect(() => parseCollection(pvd('<DataSet timestep="1" file="a.vtu"/>\n<DataSet timestep="1" file="b.vtu"/>'), 'r.pvd'))
      .toThrow('r.pvd line 5: a second data set for timestep 1 (part "", group ""; first at line 4: a.vtu, then b.vtu); times must not repeat');
    expect(() => parseCollection(pvd('<DataSet timestep="1" file="a.vtu"/>\n<DataSet file="b.vtu"/>'), 'r.pvd'))
      .toThrow('r.pvd line 5: <DataSet> has no timestep attribute while others have one');
    expect(() => parseCollection(pvd('<DataSet timestep="x" file="a.vtu"/>'), 'r.pvd')).toThrow('r.pvd line 4: timestep="x" is not a finite number');
    expect(() => parseCollection(pvd('<DataSet timestep="0"/>'), 'r.pvd')).toThrow('r.pvd line 4: <DataSet> has no file attribute');
    expect(() => parseCollection('<VTKFile type="UnstructuredGrid"></VTKFile>', 'u.pvd')).toThrow('expected type="Collection"');
    expect(() => parseCollection(pvd(''), 'e.pvd')).toThrow('e.pvd: the collection lists no <DataSet>');
  });
});

describe('numbered sequences', () => {
  it('orders by the number, not by the letters, in every naming style', () => {
    expect(orderNumbered(['f_10.vtu', 'f_9.vtu', 'f_100.vtu'], 'x')).toEqual(['f_9.vtu', 'f_10.vtu', 'f_100.vtu']);
    expect(orderNumbered(['run/flow.0002.vtu', 'run/flow.0001.vtu'], 'x')).toEqual(['run/flow.0001.vtu', 'run/flow.0002.vtu']);
    expect(orderNumbered(['name12.vtk', 'name3.vtk'], 'x')).toEqual(['name3.vtk', 'name12.vtk']);
    expect(splitNumbered('a/flow_0012.pvtu')).toEqual({ stem: 'flow_', number: 12, digits: '0012', extension: '.pvtu' });
  });

  it('refuses mixed sequences, repeated numbers and unnumbered names, naming the files', () => {
    expect(() => orderNumbered(['a_1.vtu', 'b_1.vtu', 'b_2.vtu'], 'runs/')).toThrow('runs/: files of 2 sequences: a_<n>.vtu (1 files), b_<n>.vtu (2 files)');
    expect(() => orderNumbered(['a_1.vtu', 'a_001.vtu'], 'runs/')).toThrow('runs/: "a_1.vtu" and "a_001.vtu" carry the same step number 1');
    expect(() => orderNumbered(['a_1.vtu', 'final.vtu'], 'runs/')).toThrow('"final.vtu" carries no step number');
    expect(() => orderNumbered([], 'empty/')).toThrow('empty/: no result files');
  });

  it('takes the set files of a folder as its steps, not their pieces', () => {
    const names = ['s_2.pvtu', 's_2_0.vtu', 's_2_1.vtu', 's_1.pvtu', 's_1_0.vtu', 's_1_1.vtu', 'notes.txt'];
    expect(stepFilesOfFolder(names, 'dir/')).toEqual(['s_1.pvtu', 's_2.pvtu']);
  });
});

describe('time checks and windows', () => {
  const idx = (times: number[]) => ({ name: 'seq', timeSource: 'field-data' as const, steps: times.map((t, i) => ({ time: t, files: [`f_${i}.vtu`], where: `f_${i}.vtu` })) });
  it('names both files when a time repeats or goes back', () => {
    expect(() => checkIncreasingTimes(idx([0, 1, 1]))).toThrow('seq: f_2.vtu has time 1, the same as f_1.vtu (1); step times must increase strictly');
    expect(() => checkIncreasingTimes(idx([0, 2, 1]))).toThrow('seq: f_2.vtu has time 1, earlier than f_1.vtu (2)');
  });
  it('selects the steps inside a window and says when none is', () => {
    expect(stepsInWindow(idx([0, 0.1, 0.3, 0.7]), 0.1, 0.5)).toEqual([1, 2]);
    expect(() => stepsInWindow(idx([0, 0.1]), 5)).toThrow('seq: no step lies in the window 5 … +∞ (steps run from 0 to 0.1)');
    expect(() => stepsInWindow(idx([0, 0.1]), 1, 0.5)).toThrow('--to 0.5 must be greater than --from 1');
  });
});
