/**
 * Where the Node worker threads' entry files are (Node only). In a clone the entries in workers/ register
 * the TypeScript loader and import the sources; the installed command (bin/build-cli.mjs) ships each
 * worker as its own bundle beside dist-cli/fieldtally.mjs, plain JavaScript that starts with no loader.
 */

/** Set to true by the bundler (bin/build-cli.mjs); absent when running from source. */
declare const FIELDTALLY_BUNDLED: boolean | undefined;

/** The worker kinds: compute shares (`nodePool.ts`), series runs (`seriesPool.ts`), zlib blocks (`inflatePool.ts`). */
export type WorkerKind = 'share' | 'series' | 'inflate';

/** URL of the entry file of a `kind` worker, for `new Worker(url)`. */
export function workerEntry(kind: WorkerKind): URL {
  if (typeof FIELDTALLY_BUNDLED !== 'undefined' && FIELDTALLY_BUNDLED) return new URL(`./${kind}Worker.mjs`, import.meta.url);
  return new URL(`../../workers/${kind}Worker.node.mjs`, import.meta.url);
}
