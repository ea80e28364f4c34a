/**
 * Whether two typed arrays hold the same bytes: the check behind mesh reuse between series steps and the
 * caches that key on a face selection or a node list (an array given again in a fresh copy).
 */

type View = ArrayBufferView & { length: number };

/** Whether two typed arrays of one kind hold the same bytes (NaN coordinates compare by their bits). */
export function sameBytes(a: View, b: View): boolean {
  if (a === b) return true;
  if (a.byteLength !== b.byteLength || a.constructor !== b.constructor) return false;
  const aligned = a.byteOffset % 4 === 0 && b.byteOffset % 4 === 0 && a.byteLength % 4 === 0;
  const x = aligned ? new Uint32Array(a.buffer, a.byteOffset, a.byteLength / 4) : new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = aligned ? new Uint32Array(b.buffer, b.byteOffset, b.byteLength / 4) : new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
  return true;
}
