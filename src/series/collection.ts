/**
 * Reads the index of a VTK collection file (`.pvd`: `<VTKFile type="Collection">` holding `<DataSet
 * timestep=… part=… group=… file=…/>` elements). Data sets with the same timestep are parts of one step
 * (read together as one dataset); two with the same timestep, part and group are a duplicate and refused
 * with both line numbers. Steps are ordered by time. A collection without timestep attributes numbers its
 * steps in file order (`step-index`); one where only some data sets carry a timestep is refused.
 */
import type { SeriesIndex, SeriesStep } from './seriesIndex.ts';
import { checkIncreasingTimes } from './seriesIndex.ts';

interface Entry { line: number; time: number | undefined; part: string; group: string; file: string }

function lineAt(text: string, pos: number): number {
  let n = 1;
  for (let i = text.indexOf('\n'); i >= 0 && i < pos; i = text.indexOf('\n', i + 1)) n++;
  return n;
}

function attrs(tag: string): Map<string, string> {
  const m = new Map<string, string>();
  for (const a of tag.matchAll(/([A-Za-z_][\w.-]*)\s*=\s*("([^"]*)"|'([^']*)')/g)) m.set(a[1]!, a[3] ?? a[4] ?? '');
  return m;
}

const unescape = (s: string): string => s.replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');

/**
 * The steps of a collection file. `name` (the file's name) starts every message; file paths are returned
 * as written (relative to the collection's folder, `/`-separated).
 */
export function parseCollection(text: string, name: string): SeriesIndex {
  const root = /<VTKFile\b([^>]*)>/.exec(text);
  if (!root) throw new Error(`${name}: not a VTK collection file (no <VTKFile> element)`);
  const type = attrs(root[1]!).get('type');
  if (type !== 'Collection') throw new Error(`${name}: <VTKFile type="${type ?? ''}">, expected type="Collection" for a .pvd file`);
  if (!/<Collection\b/.test(text)) throw new Error(`${name} line ${lineAt(text, root.index)}: no <Collection> element`);
  const entries: Entry[] = [];
  for (const m of text.matchAll(/<DataSet\b([^>]*?)\/?>/g)) {
    const line = lineAt(text, m.index);
    const a = attrs(m[1]!);
    const file = a.get('file');
    if (!file) throw new Error(`${name} line ${line}: <DataSet> has no file attribute`);
    const ts = a.get('timestep');
    let time: number | undefined;
    if (ts !== undefined) {
      time = Number(ts);
      if (ts.trim() === '' || !Number.isFinite(time)) throw new Error(`${name} line ${line}: timestep="${ts}" is not a finite number`);
    }
    entries.push({ line, time, part: a.get('part') ?? '', group: a.get('group') ?? '', file: unescape(file).replace(/\\/g, '/') });
  }
  if (entries.length === 0) throw new Error(`${name}: the collection lists no <DataSet>`);
  const timed = entries.filter((e) => e.time !== undefined).length;
  if (timed > 0 && timed < entries.length) {
    const e = entries.find((x) => x.time === undefined)!;
    throw new Error(`${name} line ${e.line}: <DataSet> has no timestep attribute while others have one`);
  }
  if (timed === 0) {
    const steps: SeriesStep[] = entries.map((e, i) => ({ time: i, files: [e.file], where: `${name} line ${e.line}` }));
    return { name, steps, timeSource: 'step-index' };
  }
  const byTime = new Map<number, Entry[]>();
  for (const e of entries) {
    const list = byTime.get(e.time!) ?? [];
    const twin = list.find((x) => x.part === e.part && x.group === e.group);
    if (twin) throw new Error(`${name} line ${e.line}: a second data set for timestep ${e.time} (part "${e.part}", group "${e.group}"; first at line ${twin.line}: ${twin.file}, then ${e.file}); times must not repeat`);
    list.push(e);
    byTime.set(e.time!, list);
  }
  const steps: SeriesStep[] = [...byTime.entries()].sort((a, b) => a[0] - b[0]).map(([time, list]) => ({
    time, files: list.map((e) => e.file), where: `${name} line ${list[0]!.line}`,
  }));
  const index: SeriesIndex = { name, steps, timeSource: 'collection' };
  checkIncreasingTimes(index);
  return index;
}
