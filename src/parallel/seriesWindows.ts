/**
 * Splitting a series into contiguous windows of steps (one per worker) and joining the windows' history
 * tables back into the table one thread gives. Pure (no threads, no files): `seriesPool.ts` runs the windows.
 *
 * Exactness: each window is evaluated by the single-thread path (`evaluateSeries`), so every number is the
 * same; joining keeps step order, and columns in order of first appearance over the whole series (a
 * window's new columns come after those of earlier windows, in that window's order — the order one
 * builder adds them in), NaN where a window did not have a column. Only `meshReuse` differs honestly:
 * each window reads its first step's mesh afresh, so `reused` counts what was actually reused.
 */
import type { HistoryTable } from '../series/historyTable.ts';
import type { SeriesIndex } from '../series/seriesIndex.ts';

/**
 * Contiguous runs of `steps` (indices into the series, in order), at most `workers` of them, lengths
 * differing by at most one; never an empty run.
 */
export function stepWindows(steps: readonly number[], workers: number): number[][] {
  const w = Math.max(1, Math.min(Math.floor(workers), steps.length));
  const out: number[][] = [];
  for (let k = 0, start = 0; k < w; k++) {
    const end = start + Math.floor(steps.length / w) + (k < steps.length % w ? 1 : 0);
    out.push(steps.slice(start, end));
    start = end;
  }
  return out;
}

/** The series restricted to the steps `window` (same name and time source, so messages read the same). */
export function windowIndex(index: SeriesIndex, window: readonly number[]): SeriesIndex {
  return { name: index.name, timeSource: index.timeSource, steps: window.map((i) => index.steps[i]!) };
}

/** The history tables of consecutive windows joined in order into one table (see the file comment). */
export function joinHistoryTables(parts: readonly HistoryTable[]): HistoryTable {
  if (parts.length === 0) throw new Error('joinHistoryTables: no tables to join');
  const n = parts.reduce((s, p) => s + p.time.length, 0);
  const time = new Float64Array(n);
  const cols = new Map<string, HistoryTable['columns'][number]>();
  let at = 0;
  for (const p of parts) {
    time.set(p.time, at);
    for (const c of p.columns) {
      const id = `${c.probe}\u0000${c.key}`;
      let into = cols.get(id);
      if (!into) { into = { ...c, values: new Float64Array(n).fill(NaN) }; cols.set(id, into); }
      into.values.set(c.values, at);
    }
    at += p.time.length;
  }
  const first = parts[0]!;
  return {
    series: first.series, timeSource: first.timeSource, timeUnit: first.timeUnit, time,
    stepNames: parts.flatMap((p) => p.stepNames), columns: [...cols.values()],
    failures: parts.flatMap((p) => p.failures),
    meshReuse: { steps: n, reused: parts.reduce((s, p) => s + p.meshReuse.reused, 0) },
  };
}
