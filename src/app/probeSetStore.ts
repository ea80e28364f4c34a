/**
 * Keeps the probe set in the browser's local storage between visits, so nothing the user made is lost
 * on a reload. Saved as an envelope `{ savedAt, file, set }` under one key. On start the stored set is
 * read back through the same checks as an uploaded file; a stored set that cannot be read is never
 * dropped silently: it is moved aside under a key of its own (and reported), and if even that fails the
 * store writes to a fresh key so the old text stays untouched.
 */
import type { ProbeSet } from '../study/probeSet.ts';
import { MAX_PROBE_SET_DEPTH, probeSetFromJson, tooDeepAt, writeProbeSet } from '../study/probeSetFile.ts';
import { oneLineMessage } from '../io/messageText.ts';

/** What the store needs of `localStorage` (tests pass a map). */
export interface KeyValueStore {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

/** Key of the kept probe set. */
export const STORE_KEY = 'fieldtally.probe-set';

export type Recovered =
  | { kind: 'none' }
  | { kind: 'set'; set: ProbeSet; fromVersion: number; savedAt: string | null; file: string | null }
  | { kind: 'corrupt'; message: string; keptAs: string | null };

export class ProbeSetStore {
  private key = STORE_KEY;

  constructor(private readonly storage: KeyValueStore | null, private readonly now: () => string = () => new Date().toISOString()) {}

  /** The key the set is written under now. */
  get currentKey(): string { return this.key; }

  /** Reads the kept set (see the file comment). */
  recover(): Recovered {
    let raw: string | null;
    try { raw = this.storage?.getItem(this.key) ?? null; } catch { return { kind: 'none' }; }
    if (raw === null) return { kind: 'none' };
    try {
      if (tooDeepAt(raw, MAX_PROBE_SET_DEPTH + 1) >= 0) throw new Error(`the stored text nests deeper than ${MAX_PROBE_SET_DEPTH} levels, more than any probe set`);
      const env = JSON.parse(raw) as { savedAt?: unknown; file?: unknown; set?: unknown };
      if (typeof env !== 'object' || env === null || !('set' in env)) throw new Error('the stored text is not a kept probe set ({ savedAt, file, set })');
      const { set, fromVersion } = probeSetFromJson(env.set, 'stored probe set');
      return { kind: 'set', set, fromVersion, savedAt: typeof env.savedAt === 'string' ? env.savedAt : null, file: typeof env.file === 'string' ? env.file : null };
    } catch (e) {
      const message = oneLineMessage(e);
      const aside = `${STORE_KEY}.unreadable.${this.now()}`;
      try {
        this.storage!.setItem(aside, raw);
        this.storage!.removeItem(this.key);
        return { kind: 'corrupt', message, keptAs: aside };
      } catch {
        // could not copy it aside: leave it where it is and write to another key from now on
        this.key = `${STORE_KEY}.${this.now()}`;
        return { kind: 'corrupt', message, keptAs: null };
      }
    }
  }

  /** Keeps `set` (with the file it was used on); returns an error message when the storage refuses. */
  save(set: ProbeSet, file: string | null): string | null {
    if (!this.storage) return 'this browser offers no local storage';
    try {
      this.storage.setItem(this.key, JSON.stringify({ savedAt: this.now(), file, set: JSON.parse(writeProbeSet(set)) as unknown }));
      return null;
    } catch (e) {
      return (e as Error).message || 'the browser refused to store the probe set';
    }
  }
}
