/**
 * Numbered file sequences: `flow.0001.vtu`, `flow_0001.vtu`, `flow0001.vtk`, … ordered by the number's
 * value (so `flow_10` follows `flow_9`), never by the names' letters. Files of several sequences, mixed
 * extensions or a number that repeats (`flow_1`, `flow_001`) are refused with the names. In a folder the
 * set files (`.pvtu`, `.vtm`) are the steps when there are any — the pieces they list are not steps.
 */

/** Extensions of result files a series step may be. */
export const STEP_EXTENSIONS = ['.vtu', '.vtp', '.vtk', '.pvtu', '.pvtp', '.vtm'] as const;
const SET_EXTENSIONS = ['.pvtu', '.pvtp', '.vtm'];

const baseName = (p: string): string => p.replace(/\\/g, '/').split('/').pop()!;

/** `{ stem, number, extension }` of a numbered name (the last run of digits before the extension), or null. */
export function splitNumbered(path: string): { stem: string; number: number; digits: string; extension: string } | null {
  const m = /^(.*?)(\d+)(\.[A-Za-z0-9]+)$/.exec(baseName(path));
  if (!m) return null;
  return { stem: m[1]!, number: Number(m[2]!), digits: m[2]!, extension: m[3]!.toLowerCase() };
}

/** Whether a file name has a result-file extension. */
export function isStepFile(path: string): boolean {
  const b = baseName(path).toLowerCase();
  return STEP_EXTENSIONS.some((e) => b.endsWith(e));
}

/**
 * Orders the files of one numbered sequence by their numbers. A single file is a series of one step.
 * `what` names the input in messages (the folder or the pattern).
 */
export function orderNumbered(paths: readonly string[], what: string): string[] {
  if (paths.length === 0) throw new Error(`${what}: no result files (${STEP_EXTENSIONS.join(', ')})`);
  if (paths.length === 1) return [...paths];
  const parts = paths.map((p) => ({ p, s: splitNumbered(p) }));
  const bare = parts.find((x) => x.s === null);
  if (bare) throw new Error(`${what}: "${baseName(bare.p)}" carries no step number; a series needs numbered names such as flow_0001.vtu`);
  const groups = new Map<string, string[]>();
  for (const x of parts) {
    const k = `${x.s!.stem}#${x.s!.extension}`;
    groups.set(k, [...(groups.get(k) ?? []), x.p]);
  }
  if (groups.size > 1) {
    const list = [...groups.entries()].map(([k, v]) => `${k.replace('#', '<n>')} (${v.length} files)`).join(', ');
    throw new Error(`${what}: files of ${groups.size} sequences: ${list}; choose one, e.g. with a pattern such as "flow_*.vtu"`);
  }
  const sorted = parts.sort((a, b) => a.s!.number - b.s!.number);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i]!.s!.number === sorted[i - 1]!.s!.number) {
      throw new Error(`${what}: "${baseName(sorted[i - 1]!.p)}" and "${baseName(sorted[i]!.p)}" carry the same step number ${sorted[i]!.s!.number}`);
    }
  }
  return sorted.map((x) => x.p);
}

/**
 * The step files of a folder's listing: its set files when it has any (their pieces are not steps),
 * else its other result files; then ordered as one numbered sequence.
 */
export function stepFilesOfFolder(names: readonly string[], what: string): string[] {
  const results = names.filter(isStepFile);
  const sets = results.filter((n) => SET_EXTENSIONS.some((e) => n.toLowerCase().endsWith(e)));
  return orderNumbered(sets.length > 0 ? sets : results, what);
}
