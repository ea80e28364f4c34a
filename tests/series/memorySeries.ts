/** An in-memory `SeriesFiles` for tests: paths → bytes, read through the same readers as files on disk. */
import { bytesSource } from '../../src/io/byteSource.ts';
import { readFieldDataOnly } from '../../src/io/fieldDataOnly.ts';
import { readDatasetFrom } from '../../src/io/readDataset.ts';
import type { SeriesFiles } from '../../src/series/seriesOpen.ts';

/** File access over a map of `/`-separated paths; `loads` counts the datasets read. */
export function memoryFiles(map: Map<string, Uint8Array>): SeriesFiles & { loads: string[] } {
  const get = (p: string) => {
    const b = map.get(p);
    if (!b) throw new Error(`${p}: cannot read file (no such file)`);
    return b;
  };
  const loads: string[] = [];
  return {
    loads,
    async text(p) { return new TextDecoder().decode(get(p)); },
    async load(p, opts) {
      loads.push(p);
      const folder = p.includes('/') ? p.slice(0, p.lastIndexOf('/') + 1) : '';
      return readDatasetFrom(bytesSource(p.split('/').pop()!, get(p)), { ...opts, resolve: async (rel) => get(folder + rel) });
    },
    async fieldData(p) {
      const folder = p.includes('/') ? p.slice(0, p.lastIndexOf('/') + 1) : '';
      return readFieldDataOnly(bytesSource(p.split('/').pop()!, get(p)), { resolve: async (rel) => get(folder + rel) });
    },
  };
}
