/**
 * Which benchmarks `npm run bench` runs: with no names the light set (every benchmark not in `HEAVY`:
 * meshes built in memory, no big files, no browser, no VTK); with names those named, where `heavy` stands
 * for every heavy one and `all` for every benchmark.
 */

/**
 * Benchmarks left out unless named (or `heavy` / `all` is given), with what makes them heavy. A new
 * benchmark that needs big files, gigabytes of memory, a browser or VTK belongs here.
 */
export const HEAVY: Readonly<Record<string, string>> = {
  versus: 'fieldtally against VTK 9.1 on the four 1M-cell files, fresh processes each (about 4 GB of memory)',
  scale: 'writes and reads a 10M-hexahedron file (1.3 GB of disk, several GB of memory)',
  growth: 'builds 10M hexahedra in memory (about 1.5 GB)',
  viewer: 'the app in headless chromium on the 1M-cell files',
  load: 'reads the ten 1M-cell files of sample-fields/large/ (writes them when missing)',
  series: 'writes and reads a 200-step series of 100k cells',
  startup: 'packs and installs the command (npm pack) before timing it',
  appScale: 'the app in headless chromium on a 10M-hexahedron file (1.3 GB of disk, about 2 GB of browser memory)',
};

/** The words that stand for a set rather than one benchmark. */
export const SET_WORDS = ['all', 'heavy'] as const;

export interface BenchChoice {
  /** Benchmarks to run, in the order of `names`. */
  readonly run: string[];
  /** Benchmarks not run, each with why (its `HEAVY` reason, or "not named"). */
  readonly leftOut: Record<string, string>;
  /** Words of `args` that name no benchmark and no set. */
  readonly unknown: string[];
}

/** Chooses from the benchmark `names` (sorted file stems) by the command-line words `args`. */
export function chooseBenchmarks(names: readonly string[], args: readonly string[]): BenchChoice {
  const unknown = args.filter((a) => !names.includes(a) && !(SET_WORDS as readonly string[]).includes(a));
  const chosen = (n: string): boolean =>
    args.length === 0 ? !(n in HEAVY) : args.includes('all') || args.includes(n) || (args.includes('heavy') && n in HEAVY);
  const leftOut: Record<string, string> = {};
  for (const n of names) if (!chosen(n)) leftOut[n] = args.length === 0 ? HEAVY[n]! : HEAVY[n] ? `heavy, not named: ${HEAVY[n]}` : 'not named';
  return { run: names.filter(chosen), leftOut, unknown };
}
