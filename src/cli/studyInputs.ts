/**
 * What the study verbs (`report`, `compare`, `gci`, `check-probes`) read from disk: the probe-set file, result
 * files with their pieces (each with its size and SHA-256, for the report's list of inputs), and the
 * tool's version (`version.ts`). Node only.
 */
import { createHash } from 'node:crypto';
import { basename, dirname, relative, resolve as resolvePath } from 'node:path';
import { readBytes } from '../io/nodeFiles.ts';
import { readDataset } from '../io/readDataset.ts';
import type { Dataset } from '../model/dataset.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { readProbeSet } from '../study/probeSetFile.ts';
import type { InputFileInfo } from '../study/reportHtml.ts';

export { toolVersion } from './version.ts';

const sha256 = (b: Uint8Array): string => createHash('sha256').update(b).digest('hex');

/** A probe-set file, checked (older versions upgraded), with its text and input record. */
export async function readProbeSetFile(path: string): Promise<{ set: ProbeSet; text: string; fromVersion: number; input: InputFileInfo }> {
  const bytes = await readBytes(path);
  const text = new TextDecoder().decode(bytes);
  const { set, fromVersion } = readProbeSet(text, basename(path));
  return { set, text, fromVersion, input: { name: basename(path), bytes: bytes.length, sha256: sha256(bytes), role: fromVersion < set.version ? `probe set (version ${fromVersion}, upgraded on reading)` : 'probe set' } };
}

/** A result file loaded, with every file it read (a set's pieces too) as report inputs. */
export async function loadInput(path: string): Promise<{ dataset: Dataset; inputs: InputFileInfo[] }> {
  const folder = dirname(resolvePath(path));
  const bytes = await readBytes(path);
  const inputs: InputFileInfo[] = [{ name: basename(path), bytes: bytes.length, sha256: sha256(bytes), role: 'result file' }];
  const dataset = await readDataset(basename(path), bytes, {
    resolve: async (rel) => {
      const full = resolvePath(folder, rel);
      const b = await readBytes(full).catch(() => { throw new Error(`${basename(path)}: piece "${rel}" is missing (looked for ${full})`); });
      inputs.push({ name: relative(folder, full) || rel, bytes: b.length, sha256: sha256(b), role: `piece of ${basename(path)}` });
      return b;
    },
  });
  return { dataset, inputs };
}
