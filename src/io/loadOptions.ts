/**
 * What every reader takes besides the bytes: progress reporting, cancellation, and a way to fetch the
 * other files of a multi-file set (pieces of a `.pvtu`, blocks of a `.vtm`).
 */

/** One progress report: the current stage and how many bytes of the input it has consumed. */
export interface LoadProgress {
  stage: string;
  bytesDone: number;
  bytesTotal: number;
}

/** Fetches a file named relative to the set file's folder (`/`-separated); rejects with a clear error if missing. */
export type ResolveFile = (relativePath: string) => Promise<Uint8Array>;

export interface LoadOptions {
  /** Called now and then (throttled by the reader) with the stage and bytes consumed. */
  onProgress?: (p: LoadProgress) => void;
  /** When aborted, the reader stops at its next checkpoint and rejects with an Error named 'AbortError'. */
  signal?: AbortSignal;
  /** Required for set files; single files ignore it. */
  resolve?: ResolveFile;
}

/** Throws an AbortError if the signal is aborted. */
export function checkAborted(signal: AbortSignal | undefined, where: string): void {
  if (signal?.aborted) {
    const e = new Error(`${where}: loading cancelled`);
    e.name = 'AbortError';
    throw e;
  }
}

/**
 * A cooperative checkpoint for long parses: reports progress, lets the event loop run (so a cancel
 * message can arrive in a worker) at most every `intervalMs`, and throws if cancelled.
 */
export class Checkpoint {
  private last = performance.now();
  constructor(
    private readonly where: string,
    private readonly opts: LoadOptions,
    private readonly bytesTotal: number,
    private readonly intervalMs = 50,
  ) {}

  /** Call between arrays or blocks; cheap when called often. */
  async at(stage: string, bytesDone: number): Promise<void> {
    const now = performance.now();
    if (now - this.last < this.intervalMs) return;
    this.last = now;
    this.opts.onProgress?.({ stage, bytesDone, bytesTotal: this.bytesTotal });
    await new Promise<void>((r) => setTimeout(r, 0));
    checkAborted(this.opts.signal, this.where);
  }
}
