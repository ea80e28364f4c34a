/**
 * ASCII arrays parsed on several threads: the array's text is cut into windows that end on whitespace (so no
 * number is split), a batch of windows is placed in one shared buffer, and `LoadOptions.parseText` (Node:
 * src/parallel/textPool.ts) parses each window's numbers on a worker into a shared buffer of doubles with
 * `parseWindow` below, the same parser (`asciiNumbers.ts`) the one-thread path runs. The caller then takes
 * each window's doubles in order and checks and stores them as the one-thread path does, so the arrays are
 * the same bits. Any window a worker could not parse cleanly (a bad token, odd separators) makes
 * `parseTextInWindows` answer `false`, and the reader parses the array again on one thread, for its message.
 */
import { parseNumbers, skipSpace } from './asciiNumbers.ts';
import { SCRATCH_BYTES } from './elementConvert.ts';
import type { Checkpoint, ParseTextBatch } from './loadOptions.ts';

/** Text bytes of one window (1 MiB; a batch holds one window per worker and two batches are in flight). */
export const TEXT_WINDOW_BYTES = SCRATCH_BYTES;

/** The separators that end a window (those `countTokens` of the XML reader knows). */
const isCut = (c: number) => c === 32 || c === 10 || c === 13 || c === 9;

/** Doubles reserved for a window of `bytes` text bytes: at most one number per two bytes. */
export const windowCapacity = (bytes: number): number => Math.ceil(bytes / 2);

/**
 * Parses every number of `text[start, end)` into `out[outStart…]` (room for `windowCapacity(end − start)`).
 * Returns how many, or a message when the window is not whitespace-separated numbers throughout.
 */
export function parseWindow(text: Uint8Array, start: number, end: number, out: Float64Array, outStart: number): number | string {
  let n = 0, inTok = false;
  for (let i = start; i < end; i++) {
    const sp = isCut(text[i]!);
    if (!sp && !inTok) n++;
    inTok = !sp;
  }
  try {
    const pos = parseNumbers(text, start, end, out.subarray(outStart, outStart + n), 'text window');
    if (skipSpace(text, pos, end) < end) return `text after ${n} numbers`;
  } catch (e) {
    return e instanceof Error ? e.message : String(e);
  }
  return n;
}

/** Fills `target` with the text bytes at file offset `at`. */
export type FetchText = (at: number, target: Uint8Array) => Promise<void> | void;

/** One batch in flight: its shared buffers, the windows' places, and the workers' answer. */
interface Slot {
  readonly text: Uint8Array;
  readonly values: Float64Array;
  windows: [number, number, number][];
  fileEnd: number;
  answer: Promise<(number | string)[]> | undefined;
}

const sharedBytes = (n: number): Uint8Array =>
  typeof SharedArrayBuffer === 'function' ? new Uint8Array(new SharedArrayBuffer(n)) : new Uint8Array(n);

/**
 * Parses the numbers of the text at file offsets `[start, end)` with `parse`, window by window; `take` gets
 * each window's doubles and the index of its first number in the array, in order, and returns false to stop
 * (more numbers than the array holds). Resolves to the count of numbers taken, or `false` when a window
 * failed to parse or `take` stopped (the caller then reads the array on one thread for the exact message).
 * A batch holds one window per thread of `parse` (`parse.workers`), of `parse.windowBytes` text bytes each.
 */
export async function parseTextInWindows(parse: ParseTextBatch, fetch: FetchText, start: number, end: number,
  take: (values: Float64Array, first: number) => boolean, cp: Checkpoint): Promise<number | false> {
  const windowBytes = parse.windowBytes ?? TEXT_WINDOW_BYTES;
  const per = Math.max(1, parse.workers ?? 1), batchBytes = Math.min(per * windowBytes, end - start);
  const slot = (): Slot => {
    const values = sharedBytes(8 * (windowCapacity(batchBytes) + per));
    return { text: sharedBytes(batchBytes), values: new Float64Array(values.buffer), windows: [], fileEnd: start, answer: undefined };
  };
  const slots = [slot(), slot()];
  let next = start, taken = 0, failed = false;
  // Reads the next batch of windows into `s` and hands it to the workers.
  const fill = async (s: Slot): Promise<void> => {
    s.windows = [];
    let used = 0, out = 0;
    while (s.windows.length < per && next < end && used < s.text.length) {
      const len = Math.min(windowBytes, end - next, s.text.length - used), w = s.text.subarray(used, used + len);
      await fetch(next, w);
      let cut = len;
      if (next + cut < end) {
        while (cut > 0 && !isCut(w[cut - 1]!)) cut--;
        if (cut === 0) {
          // a number longer than the window: only one thread can say so, with the reader's message
          if (s.windows.length > 0) break;
          failed = true;
          return;
        }
      }
      s.windows.push([used, used + cut, out]);
      used += cut; out += windowCapacity(cut) + 1; next += cut;
    }
    s.fileEnd = next;
    s.answer = s.windows.length ? parse(s.text, s.windows, s.values) : undefined;
  };
  await fill(slots[0]!);
  if (!failed && next < end) await fill(slots[1]!);
  for (let k = 0; !failed; k ^= 1) {
    const s = slots[k]!;
    if (!s.answer) break;
    const got = await s.answer;
    s.answer = undefined;
    for (let j = 0; j < got.length && !failed; j++) {
      const n = got[j]!;
      if (typeof n !== 'number') { failed = true; break; }
      const o = s.windows[j]![2];
      if (n > 0 && !take(s.values.subarray(o, o + n), taken)) failed = true;
      taken += n;
    }
    await cp.at('reading text', s.fileEnd);
    if (!failed && next < end) await fill(s);
  }
  // let batches still in flight finish before their buffers are dropped
  await Promise.all(slots.map((s) => s.answer?.catch(() => undefined)));
  return failed ? false : taken;
}

/** Parses windows on this thread (what a worker does); a `ParseTextBatch` for tests and single-thread use. */
export const parseTextHere: ParseTextBatch = async (text, windows, values) =>
  windows.map(([a, b, o]) => parseWindow(text, a, b, values, o));
