/**
 * What a series is before any step is read: its steps in time order, each with the file(s) that hold it,
 * and where the times came from. Pure (no file system): the Node opener (src/cli/seriesInputs.ts) and the
 * worker build indexes from paths they can open.
 *
 * Times are in the time unit of the series (the collection's or the `TimeValue` field data's; taken as
 * seconds when reported), or step indices 0, 1, 2 … when neither gives a time.
 */

/** Where step times come from: the `.pvd` collection's `timestep` attributes, each file's `TimeValue` field data, or the step index. */
export type TimeSource = 'collection' | 'field-data' | 'step-index';

/** One step: its time and the files that hold it (several parts of a `.pvd` step are read together). */
export interface SeriesStep {
  /** Time of the step (time unit of the series), or its index for `step-index`. */
  time: number;
  /** Paths of the step's files (relative to the series' folder, `/`-separated). */
  files: string[];
  /** Where the step was named, for messages: `run.pvd line 7`, or the file's name. */
  where: string;
}

/** A series: its steps in strictly increasing time order. */
export interface SeriesIndex {
  /** Name for messages and reports (the `.pvd` file, the folder or the sequence's pattern). */
  name: string;
  steps: SeriesStep[];
  timeSource: TimeSource;
}

/** Sentence stating where the times came from, written into every output. */
export function timeSourceStatement(s: TimeSource): string {
  switch (s) {
    case 'collection': return 'times from the collection file (its timestep attributes)';
    case 'field-data': return 'times from each file\'s TimeValue field data';
    case 'step-index': return 'no times in the files: steps numbered 0, 1, 2 … stand in for time';
  }
}

/** The unit label of time: `s` for real times, `step` for step indices. */
export function timeUnit(s: TimeSource): string {
  return s === 'step-index' ? 'step' : 's';
}

/** Throws naming both steps when times are not finite or not strictly increasing. */
export function checkIncreasingTimes(index: SeriesIndex): void {
  const st = index.steps;
  if (st.length === 0) throw new Error(`${index.name}: the series holds no steps`);
  for (let i = 0; i < st.length; i++) {
    if (!Number.isFinite(st[i]!.time)) throw new Error(`${st[i]!.where}: step time ${st[i]!.time} is not a finite number`);
    if (i > 0 && !(st[i]!.time > st[i - 1]!.time)) {
      const what = st[i]!.time === st[i - 1]!.time ? 'the same as' : 'earlier than';
      throw new Error(`${index.name}: ${st[i]!.where} has time ${st[i]!.time}, ${what} ${st[i - 1]!.where} (${st[i - 1]!.time}); step times must increase strictly`);
    }
  }
}

/** Indices of the steps with from ≤ time ≤ to (both optional); throws when none is left. */
export function stepsInWindow(index: SeriesIndex, from?: number, to?: number): number[] {
  if (from !== undefined && to !== undefined && !(to > from)) throw new Error(`--to ${to} must be greater than --from ${from}`);
  const out: number[] = [];
  index.steps.forEach((s, i) => { if ((from === undefined || s.time >= from) && (to === undefined || s.time <= to)) out.push(i); });
  if (out.length === 0) {
    const t = index.steps;
    throw new Error(`${index.name}: no step lies in the window ${from ?? '−∞'} … ${to ?? '+∞'} (steps run from ${t[0]!.time} to ${t[t.length - 1]!.time})`);
  }
  return out;
}
