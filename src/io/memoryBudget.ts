/**
 * A memory budget for one load: every reader claims the bytes of each array before allocating it, so a
 * small file that declares gigabytes (huge counts, zlib headers promising 2 GiB) is refused with a
 * message before anything is allocated. The budget is set for the duration of one `readDatasetFrom`
 * when `LoadOptions.memoryLimit` is given (the command line gives it; loads in one process run one at a
 * time there); without it, claims are only counted.
 */

/** The active budget: the limit in bytes, the bytes claimed so far, and how to lift the limit (for the message). */
interface Budget { limit: number; used: number; hint: string }

let active: Budget | undefined;

/** A byte count in binary units for messages (e.g. "2.0 GiB"). */
export function formatMemory(bytes: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB', 'PiB'];
  let v = bytes, u = 0;
  while (v >= 1024 && u < units.length - 1) { v /= 1024; u++; }
  return u === 0 ? `${Math.round(v)} bytes` : `${v.toFixed(1)} ${units[u]}`;
}

/**
 * Runs `fn` under a budget of `limit` bytes (or none when undefined); `hint` says how to lift it. A
 * budget already active (a set reading its pieces) is kept, so pieces count towards the set's total.
 */
export async function withMemoryBudget<T>(limit: number | undefined, hint: string | undefined, fn: () => Promise<T>): Promise<T> {
  if (limit === undefined || active) return fn();
  active = { limit, used: 0, hint: hint ?? 'free memory or load a smaller file' };
  try {
    return await fn();
  } finally {
    active = undefined;
  }
}

/**
 * Claims `bytes` for an array about to be allocated at `where` (file and array); throws a one-line error
 * when the load would pass its budget.
 */
export function claimMemory(bytes: number, where: string): void {
  if (!active) return;
  const total = active.used + bytes;
  if (total > active.limit) {
    throw new Error(`${where}: needs ${formatMemory(bytes)} for this array, ${formatMemory(total)} for the load so far, above the memory limit of ${formatMemory(active.limit)} (${active.hint})`);
  }
  active.used = total;
}
