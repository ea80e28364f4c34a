// Types of bin/hugePages.mjs (plain JavaScript, run before any TypeScript loader), for the tests.

/** Estimated decoded bytes from which the re-start with huge pages pays. */
export const HUGE_PAGES_MIN_BYTES: number;

/** Estimated bytes the input files of `args` decode to; Infinity for a folder, a pattern or a file naming other files. */
export function inputEstimate(args: readonly string[], enough?: number): number;

/** Whether the estimate of `args` reaches `minBytes` (default HUGE_PAGES_MIN_BYTES or FIELDTALLY_RESPAWN_MIN_BYTES). */
export function wantsHugePages(args: readonly string[], minBytes?: number): boolean;
