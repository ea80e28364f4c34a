// Types of src/io/zlibEngine.mjs (plain JavaScript, shared with the plain-JavaScript inflate workers).

/** Inflates `block` into `out`; the inflated length (more than `out.length` when the stream is longer); throws zlib's message when corrupt. */
export function engineInflate(block: Uint8Array, out: Uint8Array): number;

/** Whether this Node's zlib engine has the parts `engineInflate` uses. */
export function engineWorks(): boolean;
