// Types of bin/cliBundle.mjs (plain JavaScript, run before any TypeScript loader), for the tests.

/** File name of the command's bundle (CommonJS) in a bundle folder. */
export const BUNDLE_ENTRY: string;

/** The Node workers bundled beside the command: kind → entry file relative to `root`. */
export function workerEntries(root: string): Record<string, string>;

/** Bundles the command and its workers into `dir`; the version, verb names, the command's size (bytes) and every input. */
export function writeBundle(root: string, dir: string, overrides?: Record<string, unknown>): Promise<{ version: string; verbs: string[]; bytes: number; inputs: string[] }>;

/** The stamp of the sources under `root` a bundle is made from (file count and a hash of paths, sizes and times). */
export function sourceStamp(root: string): string;

/** Path of the cached bundle's entry for the sources under `root`, built when missing; throws when it cannot be built. */
export function cachedBundle(root: string): Promise<string>;
