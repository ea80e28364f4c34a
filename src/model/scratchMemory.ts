/**
 * Memory for a large array written whole as soon as it is made (the cell-tree build's 24 bytes of cell boxes
 * a cell, dropped after the build, and its node-box array, which is the radix sort's scratch first): taken from
 * the engine's own page allocator through a WebAssembly.Memory instead of malloc.
 *
 * Why: the command line re-starts itself with glibc's hugetlb tunable (faster loads), so malloc backs large
 * arrays with transparent huge pages; on a virtual machine whose memory other processes have fragmented, the
 * first touch of such a page can wait for the kernel to compact memory. The 10M-cell tree build's first
 * build spent 1.6 s of CPU in its codes pass this way against 0.8–0.95 s with these boxes taken from here
 * (A/B in the same minutes, load average 13–17; 1M cells: no difference), and the node boxes' sort passes
 * 531–544 ms against 386–391 ms. Pages from here are ordinary ones, zeroed by the kernel on first touch. Falls
 * back to a plain array where WebAssembly is missing, the size is beyond a 32-bit memory or the memory cannot
 * be had. An array that may be posted to another thread by transfer must not come from here (its buffer
 * cannot be detached).
 */

const PAGE = 65536;
/** A 32-bit WebAssembly memory holds at most 65536 pages (4 GiB). */
const MAX_PAGES = 65536;

/** A fresh, zeroed Float32Array of `length` elements (see the file comment). */
export function scratchFloat32(length: number): Float32Array {
  const pages = Math.ceil((4 * length) / PAGE);
  if (typeof WebAssembly === 'object' && pages > 0 && pages <= MAX_PAGES) {
    try {
      return new Float32Array(new WebAssembly.Memory({ initial: pages, maximum: pages }).buffer, 0, length);
    } catch {
      // no room for the memory here: a plain array below
    }
  }
  return new Float32Array(length);
}
