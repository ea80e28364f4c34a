/**
 * The tool's version. The bundled command (`bin/build-cli.mjs`) has it written in at build time as the
 * constant `FIELDTALLY_VERSION`; run from source, it is read from the repository's package.json.
 */
import { readFileSync } from 'node:fs';

declare const FIELDTALLY_VERSION: string | undefined;

/** The tool's version, e.g. `0.1.0`. */
export function toolVersion(): string {
  if (typeof FIELDTALLY_VERSION === 'string') return FIELDTALLY_VERSION;
  const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
  return pkg.version;
}
