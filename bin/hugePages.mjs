// Whether a command line is worth re-starting Node with glibc's `malloc.hugetlb=1` tunable (bin/fieldtally.mjs).
//
// The tunable backs large typed arrays with transparent huge pages, so first touching a freshly loaded field
// costs far fewer page faults; but the re-start is a second Node start-up, about 60–80 ms of wall time here.
// Measured with `cut` (whole processes, 2-core virtual machine, load average 1.6–4.5): 114 MB of decoded arrays
// (the 1M-hexahedron file) gained 15–25 ms from the tunable, so the re-start cost 35–60 ms more than it saved;
// 391 MB (3M hexahedra, appended raw) gained about 110 ms. So the command re-starts itself only when its input
// files may decode to at least `HUGE_PAGES_MIN_BYTES`, or when it cannot tell cheaply (a folder, a pattern, a
// collection naming other files): the one-shot commands on 1M-cell files then pay one Node start-up.
import { closeSync, openSync, readSync, statSync } from 'node:fs';

/** Estimated decoded bytes from which the re-start pays (bytes; see the file comment). */
export const HUGE_PAGES_MIN_BYTES = 256 * 1024 * 1024;

/** A compressed XML file decodes to about this many times its size (the 1M sample files: 5.1× and 6.6×). */
const COMPRESSED_GROWTH = 8;

/** Files that name other files (sets, collections, series lists): their size says nothing of the load. */
const NAMES_OTHER_FILES = /\.(pvtu|pvtp|pvts|pvtr|pvti|vtm|vtmb|vtpd|vtpc|pvd|series|visit)$/i;

/** An argument that a verb expands into files (a glob or a numbered pattern). */
const PATTERN = /[*?[]|%0?\d*d/;

/** Whether the first KiB of `file` declares a compressor (XML VTK files name it in the root element). */
function declaresCompressor(file) {
  const head = Buffer.alloc(1024);
  const fd = openSync(file, 'r');
  try {
    const n = readSync(fd, head, 0, head.length, 0);
    return head.toString('latin1', 0, n).includes('compressor=');
  } finally {
    closeSync(fd);
  }
}

/**
 * Estimated bytes the input files of `args` decode to (their sizes, a compressed XML file's times
 * `COMPRESSED_GROWTH`), or Infinity when an argument is a folder, a pattern or a file naming other files.
 * Arguments that name no existing path (options and their values) count nothing. Stops counting once the
 * estimate reaches `enough` (a long list of files is not read through when its first files decide).
 */
export function inputEstimate(args, enough = Infinity) {
  let bytes = 0;
  for (const a of args) {
    if (bytes >= enough) break;
    if (a.startsWith('-')) continue;
    let s;
    try { s = statSync(a); } catch { if (PATTERN.test(a)) return Infinity; continue; }
    if (s.isDirectory() || NAMES_OTHER_FILES.test(a)) return Infinity;
    if (!s.isFile()) continue;
    let grows = false;
    try { grows = s.size > 0 && declaresCompressor(a); } catch { /* unreadable: the verb says so */ }
    bytes += grows ? COMPRESSED_GROWTH * s.size : s.size;
  }
  return bytes;
}

/**
 * Whether to re-start with huge pages for `args`: their input estimate is at least `minBytes` (default
 * `HUGE_PAGES_MIN_BYTES`, or `FIELDTALLY_RESPAWN_MIN_BYTES` from the environment).
 */
export function wantsHugePages(args, minBytes = Number(process.env.FIELDTALLY_RESPAWN_MIN_BYTES || HUGE_PAGES_MIN_BYTES)) {
  return inputEstimate(args, minBytes) >= minBytes;
}
