/**
 * Scans a reader noted while writing an array (src/model/arrayScans.ts) stand in for the piece checks' own passes:
 * a noted first non-finite value gives the same message as the scan finds, a noted id range that fits leaves the
 * connectivity unread, and one that does not fit makes the check scan and name the entry as before.
 */
import { describe, expect, it } from 'vitest';
import { noteScan, notedFirstNonFinite, notedWithin } from '../../src/model/arrayScans.ts';
import { hexGrid } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { validatePiece } from '../../src/model/validate.ts';

const copy = (p: Piece): Piece => ({ ...p, points: p.points.slice(), connectivity: p.connectivity.slice() });
const message = (f: () => void) => { try { f(); return 'valid'; } catch (e) { return (e as Error).message; } };

describe('noted scans in the piece checks', () => {
  it('a noted non-finite coordinate gives the message of the scan', () => {
    const scanned = copy(hexGrid(2, 2, 2)), noted = copy(hexGrid(2, 2, 2));
    scanned.points[10] = Number.NaN; noted.points[10] = Number.NaN;
    noteScan(noted.points, { firstNonFinite: 10 });
    expect(message(() => validatePiece(noted, 'm.vtu: piece 0'))).toBe(message(() => validatePiece(scanned, 'm.vtu: piece 0')));
    expect(message(() => validatePiece(noted, 'm.vtu: piece 0'))).toBe('m.vtu: piece 0: point 3 has a non-finite coordinate (NaN); expected finite numbers');
  });

  it('a noted id range inside the points skips the pass; one past them scans and names the entry', () => {
    const p = copy(hexGrid(2, 2, 2));
    noteScan(p.connectivity, { min: 0, max: 26 });
    expect(notedWithin(p.connectivity, 0, 26)).toBe(true);
    expect(message(() => validatePiece(p, 'm.vtu: piece 0'))).toBe('valid');
    const bad = copy(hexGrid(2, 2, 2));
    bad.connectivity[5] = 27;
    noteScan(bad.connectivity, { min: 0, max: 27 });
    expect(notedWithin(bad.connectivity, 0, 26)).toBe(false);
    expect(message(() => validatePiece(bad, 'm.vtu: piece 0'))).toBe('m.vtu: piece 0: connectivity entry 5 is point 27, but the piece has 27 points (expected 0..26)');
  });

  it('an array nobody noted has no scan', () => {
    expect(notedFirstNonFinite(new Float64Array(3))).toBeUndefined();
    expect(notedWithin(new Int32Array(3), 0, 10)).toBe(false);
  });
});
