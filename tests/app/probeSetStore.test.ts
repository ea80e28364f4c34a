/**
 * Keeping the probe set in local storage: what is saved comes back after a "reload"; a stored text that
 * cannot be read is reported and kept aside, never dropped; when even that fails the store moves to a
 * fresh key and leaves the old text untouched. Reference: the store's own contract (src/app/probeSetStore.ts).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ProbeSetStore, STORE_KEY, type KeyValueStore } from '../../src/app/probeSetStore.ts';
import { readProbeSet } from '../../src/study/probeSetFile.ts';

class MapStore implements KeyValueStore {
  readonly map = new Map<string, string>();
  failWrites = false;
  getItem(k: string) { return this.map.get(k) ?? null; }
  setItem(k: string, v: string) { if (this.failWrites) throw new Error('QuotaExceededError'); this.map.set(k, v); }
  removeItem(k: string) { this.map.delete(k); }
}

const SET = readProbeSet(readFileSync(join(__dirname, '../study/fixtures/pipe-stations.v2.json'), 'utf8')).set;
const clock = () => '2026-01-02T03:04:05.000Z';

describe('ProbeSetStore', () => {
  it('nothing stored: nothing recovered', () => {
    expect(new ProbeSetStore(new MapStore(), clock).recover()).toEqual({ kind: 'none' });
  });

  it('a saved set comes back unchanged after a reload, with the file it was used on', () => {
    const storage = new MapStore();
    expect(new ProbeSetStore(storage, clock).save(SET, 'pipe-medium.vtu')).toBeNull();
    const r = new ProbeSetStore(storage, clock).recover();
    expect(r).toEqual({ kind: 'set', set: SET, fromVersion: 2, savedAt: '2026-01-02T03:04:05.000Z', file: 'pipe-medium.vtu' });
  });

  it('a version-1 set kept by an older fieldtally is upgraded on recovery', () => {
    const storage = new MapStore();
    storage.setItem(STORE_KEY, JSON.stringify({ savedAt: 'x', file: null, set: JSON.parse(readFileSync(join(__dirname, '../study/fixtures/pipe-stations.v1.json'), 'utf8')) }));
    const r = new ProbeSetStore(storage, clock).recover();
    expect(r.kind === 'set' && r.fromVersion).toBe(1);
    expect(r.kind === 'set' && r.set.version).toBe(2);
  });

  it('unreadable text is reported and kept aside under its own key, not dropped', () => {
    for (const text of ['{"savedAt": "x", "set": {"format": "fieldtally-probe-set", "version": 2, "probes": [{"id": "a"}]}}', 'not json {', '{"other": 1}']) {
      const storage = new MapStore();
      storage.setItem(STORE_KEY, text);
      const store = new ProbeSetStore(storage, clock);
      const r = store.recover();
      expect(r.kind).toBe('corrupt');
      if (r.kind !== 'corrupt') return;
      expect(r.keptAs).toBe(`${STORE_KEY}.unreadable.2026-01-02T03:04:05.000Z`);
      expect(storage.getItem(r.keptAs!)).toBe(text);
      expect(storage.getItem(STORE_KEY)).toBeNull();
      expect(r.message.length).toBeGreaterThan(10);
      // the next save writes a fresh set without touching the kept text
      expect(store.save(SET, null)).toBeNull();
      expect(storage.getItem(r.keptAs!)).toBe(text);
    }
  });

  it('when the text cannot even be copied aside, it stays where it is and the store writes elsewhere', () => {
    const storage = new MapStore();
    storage.setItem(STORE_KEY, 'garbage');
    storage.failWrites = true;
    const store = new ProbeSetStore(storage, clock);
    const r = store.recover();
    expect(r).toMatchObject({ kind: 'corrupt', keptAs: null });
    expect(store.currentKey).not.toBe(STORE_KEY);
    expect(store.save(SET, null)).toBe('QuotaExceededError');
    storage.failWrites = false;
    expect(store.save(SET, null)).toBeNull();
    expect(storage.getItem(STORE_KEY)).toBe('garbage');
  });

  it('no storage at all: saving says so', () => {
    expect(new ProbeSetStore(null, clock).save(SET, null)).toBe('this browser offers no local storage');
  });
});
