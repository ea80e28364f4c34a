/**
 * What the study verbs (`report`, `compare`, `gci`, `check-probes`) read from disk: the probe-set file, result
 * files with their pieces (each with its size and SHA-256, for the report's list of inputs), and the
 * tool's version (`version.ts`). Node only.
 */
import { createHash } from 'node:crypto';
import { basename, dirname, relative, resolve as resolvePath } from 'node:path';
import { loadDatasetFile, openFileSource, readBytes } from '../io/nodeFiles.ts';
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

/** SHA-256 of a regular file, read in chunks (never whole). */
async function hashFile(path: string): Promise<{ bytes: number; sha256: string }> {
  const src = await openFileSource(path);
  try {
    const h = createHash('sha256');
    const chunk = 8 << 20;
    for (let at = 0; at < src.size; at += chunk) h.update(await src.read(at, Math.min(chunk, src.size - at)));
    return { bytes: src.size, sha256: h.digest('hex') };
  } finally {
    await src.close();
  }
}

/**
 * A result file loaded by ranges with the same guards as every verb (regular files only, memory limit),
 * with every file it read (a set's pieces too) as report inputs, each with its size and SHA-256.
 */
export async function loadInput(path: string): Promise<{ dataset: Dataset; inputs: InputFileInfo[] }> {
  const folder = dirname(resolvePath(path));
  const pieces: { full: string; rel: string }[] = [];
  const dataset = await loadDatasetFile(path, {}, (full, rel) => pieces.push({ full, rel }));
  const inputs: InputFileInfo[] = [{ name: basename(path), ...await hashFile(path), role: 'result file' }];
  for (const p of pieces) inputs.push({ name: relative(folder, p.full) || p.rel, ...await hashFile(p.full), role: `piece of ${basename(path)}` });
  return { dataset, inputs };
}
