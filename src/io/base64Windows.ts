/**
 * Uncompressed base64 arrays decoded on several threads: the array's text is cut into windows of whole
 * 4-character groups (counted without looking at the text: base64 without line breaks, as VTK writes it), a batch of windows is placed in one shared buffer, and `LoadOptions.decodeBase64`
 * (Node: src/parallel/textPool.ts) decodes each window on a worker into a shared byte buffer with
 * `decodeWindow` below (the reader's own `Base64Reader`). Every window but the last decodes to three bytes a
 * group, so each window's place in the array is known before it is decoded. A window that does not decode to
 * exactly that (whitespace or padding inside the data, a bad character, text that ends early) makes
 * `decodeBase64InWindows` answer false, and the reader decodes the array on one thread, for its message.
 */
import { Base64Reader } from './base64.ts';
import type { FetchText } from './asciiWindows.ts';
import { SCRATCH_BYTES } from './elementConvert.ts';
import type { Base64Batch, Checkpoint } from './loadOptions.ts';

/**
 * Decodes `text[start, end)` into exactly `bytes` bytes at `out[outStart…]`. Returns `bytes`, or a message
 * when the window holds fewer (padding inside, text ending early) or is not base64.
 */
export function decodeWindow(text: Uint8Array, start: number, end: number, out: Uint8Array, outStart: number, bytes: number): number | string {
  try {
    const got = new Base64Reader(text, start, end, 'base64 window').readSome(out, outStart, bytes);
    return got === bytes ? got : `${got} of ${bytes} bytes`;
  } catch (e) {
    return e instanceof Error ? e.message : String(e);
  }
}

/** Decodes windows on this thread (what a worker does); a `Base64Batch` for tests. */
export const decodeBase64Here: Base64Batch = async (text, windows, out) =>
  windows.map(([a, b, o, n]) => decodeWindow(text, a, b, out, o, n));

const sharedBytes = (n: number): Uint8Array =>
  typeof SharedArrayBuffer === 'function' ? new Uint8Array(new SharedArrayBuffer(n)) : new Uint8Array(n);

/**
 * Decodes the `total` bytes whose base64 text starts at file offset `start` (the text may run on to `end`,
 * past the array, as appended data do) with `decode`, batch by batch; `take` gets each batch's bytes and the
 * index of its first byte, in order. Resolves to true, or false when a window did not decode cleanly (nothing
 * is thrown; the caller decodes the array on one thread for the exact message).
 */
export async function decodeBase64InWindows(decode: Base64Batch, fetch: FetchText, start: number, end: number, total: number,
  take: (bytes: Uint8Array, first: number) => void, cp: Checkpoint): Promise<boolean> {
  const per = Math.max(1, decode.workers ?? 1), windowChars = decode.windowBytes ?? SCRATCH_BYTES;
  const batchChars = Math.min(per * windowChars, end - start);
  const slots = [0, 1].map(() => ({
    text: sharedBytes(batchChars), out: sharedBytes(Math.ceil(batchChars / 4) * 3), windows: [] as [number, number, number, number][],
    first: 0, bytes: 0, fileEnd: start, answer: undefined as Promise<(number | string)[]> | undefined,
  }));
  let next = start, produced = 0, failed = false;
  type Slot = (typeof slots)[number];
  const fill = async (s: Slot): Promise<void> => {
    s.windows = []; s.first = produced;
    let used = 0, o = 0;
    while (s.windows.length < per && produced < total && next < end && used < s.text.length) {
      const len = Math.min(windowChars, end - next, s.text.length - used), w = s.text.subarray(used, used + len);
      await fetch(next, w);
      // whole groups only, and no more groups than the array's bytes need; no scan for whitespace here (it
      // would cost this thread as much as decoding): a window holding some decodes short and fails
      const groups = Math.min(len >> 2, Math.ceil((total - produced) / 3)), cut = 4 * groups;
      if (groups === 0) { failed = true; return; }
      const bytes = Math.min(3 * groups, total - produced);
      s.windows.push([used, used + cut, o, bytes]);
      used += cut; o += bytes; produced += bytes; next += cut;
    }
    s.bytes = o; s.fileEnd = next;
    s.answer = s.windows.length ? decode(s.text, s.windows, s.out) : undefined;
  };
  await fill(slots[0]!);
  if (!failed) await fill(slots[1]!);
  for (let k = 0; !failed; k ^= 1) {
    const s = slots[k]!;
    if (!s.answer) break;
    const got = await s.answer;
    s.answer = undefined;
    if (got.some((g, j) => g !== s.windows[j]![3])) { failed = true; break; }
    take(s.out.subarray(0, s.bytes), s.first);
    await cp.at('decoding base64', s.fileEnd);
    if (produced < total) await fill(s);
  }
  await Promise.all(slots.map((s) => s.answer?.catch(() => undefined)));
  return !failed && produced === total;
}
