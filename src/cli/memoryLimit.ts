/**
 * The memory limit of the command line's loads and outputs: by default three quarters of the machine's
 * memory, and at most half of the process's address-space limit when one is set (`ulimit -v`), since the
 * JavaScript engine reserves much of that for itself. `--allow-large` lifts it. Node only.
 */
import { readFileSync } from 'node:fs';
import { totalmem } from 'node:os';
import { formatMemory } from '../io/memoryBudget.ts';
import { setLoadDefaults } from '../io/nodeFiles.ts';

/** The flag that lifts the limit, accepted by every verb. */
export const ALLOW_LARGE = '--allow-large';

/** The soft address-space limit of this process in bytes (Linux `/proc/self/limits`), or undefined when unlimited or unknown. */
export function addressSpaceLimit(): number | undefined {
  try {
    const m = /^Max address space\s+(\S+)/m.exec(readFileSync('/proc/self/limits', 'utf8'));
    return m && m[1] !== 'unlimited' ? Number(m[1]) : undefined;
  } catch {
    return undefined;
  }
}

/** The default limit in bytes (see the file comment). */
export function defaultMemoryLimit(): number {
  const machine = 0.75 * totalmem();
  const space = addressSpaceLimit();
  return space !== undefined ? Math.min(machine, 0.5 * space) : machine;
}

let limit: number | undefined = defaultMemoryLimit();

/** The current limit in bytes, or undefined when lifted. */
export function memoryLimit(): number | undefined {
  return limit;
}

/** Sets the limit for this process (undefined lifts it) and passes it on to every file load. */
export function setMemoryLimit(bytes: number | undefined): void {
  limit = bytes;
  setLoadDefaults(bytes === undefined ? {} : { memoryLimit: bytes, memoryHint: `give ${ALLOW_LARGE} to go ahead anyway` });
}

/**
 * Refuses an output or working set of `bytes` above the limit, before it is allocated: `what` says what
 * it is (e.g. `--samples 10000000: the probe's values`).
 */
export function checkMemory(bytes: number, what: string): void {
  if (limit !== undefined && bytes > limit) {
    throw new Error(`${what} need about ${formatMemory(bytes)}, above the memory limit of ${formatMemory(limit)} (give ${ALLOW_LARGE} to go ahead anyway)`);
  }
}
