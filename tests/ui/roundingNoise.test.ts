/**
 * Rounding noise: a value at most 10⁻⁹ of its own quantity's scale is marked "≈ 0 relative to …", the
 * number itself kept; only force parts (against the force, coefficients against the largest coefficient)
 * and a balance's net flux (against its inflow) have a scale.
 */
import { describe, expect, it } from 'vitest';
import { NOISE_FRACTION, assignNoiseScales, isRoundingNoise, noiseMark, quantityText } from '../../src/ui/roundingNoise.ts';
import type { Quantity } from '../../src/ui/results.ts';

const q = (key: string, label: string, value: number, unit = ''): Quantity => ({ key, label, value, unit, pinned: false });

describe('isRoundingNoise', () => {
  it('marks values at most 1e-9 of a non-zero scale, and nothing else', () => {
    const cd = { value: 27620, label: 'C_D' };
    expect(isRoundingNoise(-5.6e-14, cd)).toBe(true);
    expect(isRoundingNoise(27620 * NOISE_FRACTION, cd)).toBe(true);
    expect(isRoundingNoise(27620 * NOISE_FRACTION * 1.01, cd)).toBe(false);
    // zero is exact, not noise; no scale, a zero or non-finite scale, or a non-finite value: never marked
    expect(isRoundingNoise(0, cd)).toBe(false);
    expect(isRoundingNoise(1e-20, undefined)).toBe(false);
    expect(isRoundingNoise(1e-20, { value: 0, label: 'x' })).toBe(false);
    expect(isRoundingNoise(1e-20, { value: NaN, label: 'x' })).toBe(false);
    expect(isRoundingNoise(NaN, cd)).toBe(false);
  });
  it('keeps the number and adds the mark', () => {
    const cl = { ...q('CL', 'C_L', -5.565e-14), scale: { value: 27620, label: 'C_D' } };
    expect(quantityText(cl)).toBe('-5.565×10⁻¹⁴ (≈ 0 relative to C_D)');
    expect(quantityText(cl, 4, true)).toBe('-5.565e-14 (≈ 0 relative to C_D)');
    expect(noiseMark(0.3, { value: 1, label: 'C_D' })).toBe('');
  });
});

describe('assignNoiseScales', () => {
  it('force total (view tool keys): coefficients against the largest, forces against |F|', () => {
    // the Stokes sphere of sample-fields/ (src/samples/sphere.ts): drag only, lift and side are rounding
    const r = assignNoiseScales('force', [
      q('CD', 'C_D', 27620), q('dragForce', 'F_drag', 1.41e-5, 'N'), q('CL', 'C_L', -5.565e-14), q('liftForce', 'F_lift', -2.8e-23, 'N'),
      q('sideForce', 'F_side', 4e-24, 'N'), q('CS', 'C_S (side)', 8e-15), q('CDpressure', 'C_D pressure part', 9190), q('forceX', 'F_x', 1.41e-5, 'N'),
      q('momentX', 'M_x', 1e-27, 'N·m'),
    ]);
    const text = Object.fromEntries(r.map((x) => [x.key, quantityText(x)]));
    expect(text['CL']).toBe('-5.565×10⁻¹⁴ (≈ 0 relative to C_D)');
    expect(text['CS']).toBe('8.000×10⁻¹⁵ (≈ 0 relative to C_D)');
    expect(text['liftForce']).toBe('-2.800×10⁻²³ N (≈ 0 relative to |F|)');
    expect(text['CD']).toBe('27620');
    expect(text['CDpressure']).toBe('9190');
    expect(text['dragForce']).toBe('1.410×10⁻⁵ N');
    // moments have no scale in the result: never marked
    expect(r.find((x) => x.key === 'momentX')!.scale).toBeUndefined();
  });
  it('force total (probe-set keys), and a real small lift stays unmarked', () => {
    const r = assignNoiseScales('force', [q('CD', 'C_D', 0.5), q('CL', 'C_L', 1e-6), q('CS', 'C_S', 0), q('force.drag', 'F_drag', 10, 'N'),
      q('force.lift', 'F_lift', 2e-5, 'N'), q('force.side', 'F_side', 3e-9, 'N')]);
    expect(r.map((x) => quantityText(x))).toEqual(['0.5000', '1.000×10⁻⁶', '0', '10.00 N', '2.000×10⁻⁵ N', '3.000×10⁻⁹ N (≈ 0 relative to |F|)']);
  });
  it('a force whose parts all cancel: marked against Σ|dF| given with the outcome; a part small beside the net force keeps its own scale', () => {
    // a closed wall in a uniform 7 Pa with no reference pressure (tests/surface/forces.test.ts): Σ|dF| = 42 N, q·A = 0.5
    const gross = { value: 42, label: 'Σ|dF|' }, grossC = { value: 84, label: 'Σ|dF|/(q·A)' };
    const r = assignNoiseScales('force', [
      { ...q('CD', 'C_D', 3.1e-15), scale: grossC }, { ...q('CL', 'C_L', -1.2e-15), scale: grossC }, q('CS', 'C_S', 0),
      { ...q('force.drag', 'F_drag', 1.5e-15, 'N'), scale: gross }, { ...q('force.lift', 'F_lift', -6e-16, 'N'), scale: gross },
      { ...q('force.side', 'F_side', 0, 'N'), scale: gross },
    ]);
    expect(r.map((x) => quantityText(x))).toEqual(['3.100×10⁻¹⁵ (≈ 0 relative to Σ|dF|/(q·A))', '-1.200×10⁻¹⁵ (≈ 0 relative to Σ|dF|/(q·A))', '0',
      '1.500×10⁻¹⁵ N (≈ 0 relative to Σ|dF|)', '-6.000×10⁻¹⁶ N (≈ 0 relative to Σ|dF|)', '0 N']);
    // the Stokes sphere's lift with Σ|dF| given too: still "relative to C_D", as before
    const s = assignNoiseScales('force', [q('CD', 'C_D', 27620), { ...q('CL', 'C_L', -5.565e-14), scale: { value: 41000, label: 'Σ|dF|/(q·A)' } }]);
    expect(quantityText(s[1]!)).toBe('-5.565×10⁻¹⁴ (≈ 0 relative to C_D)');
  });
  it('mass balance: net flux and imbalance share against the inflow; a cut-plane has no scale', () => {
    // the pipe-stations probe set on sample-fields/pipe-medium.vtu (tests/study/fixtures/pipe-stations.v2.json)
    const r = assignNoiseScales('mass-balance', [q('net', 'net ṁ (Σ outward)', 6.939e-18, 'kg/s'), q('inflow', 'ṁ in', 0.01543, 'kg/s'),
      q('outflow', 'ṁ out', 0.01543, 'kg/s'), q('imbalanceShare', 'imbalance / inflow', 4.498e-16)]);
    expect(r.map((x) => quantityText(x))).toEqual(['6.939×10⁻¹⁸ kg/s (≈ 0 relative to ṁ in)', '0.01543 kg/s', '0.01543 kg/s', '4.498×10⁻¹⁶ (≈ 0 relative to ṁ in)']);
    const real = assignNoiseScales('mass-balance', [q('net', 'net ṁ (Σ outward)', 1e-4, 'kg/s'), q('inflow', 'ṁ in', 0.01543, 'kg/s')]);
    expect(quantityText(real[0]!)).toBe('1.000×10⁻⁴ kg/s');
    expect(assignNoiseScales('plane', [q('massFlowRate', 'ṁ', 1e-20, 'kg/s')])[0]!.scale).toBeUndefined();
  });
});
