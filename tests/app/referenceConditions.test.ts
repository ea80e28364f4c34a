/**
 * Reference conditions: presets from the study layer's catalogue (water at 20 °C, ISA sea-level air), a hand
 * edit of ρ or μ turns the fluid custom, and the probe set's `reference` round-trips every value, the lift
 * rule included.
 */
import { describe, expect, it } from 'vitest';
import {
  CUSTOM_FLUID, choosePreset, conditionsFromDoc, defaultConditions, fluidAfterEdit, liftOf, referenceDoc,
} from '../../src/app/referenceConditions.ts';

const thin: [number, number, number, number, number, number] = [0, 10, -3, 3, 0, 0.2];

describe('reference conditions', () => {
  it('start on water at 20 °C and switch to air at the ISA sea level', () => {
    const c = defaultConditions();
    // Reference: IAPWS-95 (density) and IAPWS-2008 (viscosity) at 20 °C, 1 atm: ρ = 998.207 kg/m³, μ = 1.0016 mPa·s
    expect([c.fluid, c.density, c.viscosity]).toEqual(['water-20c', 998.207, 0.0010016]);
    const air = choosePreset(c, 'air-isa-sea-level');
    // Reference: ISA sea level ρ = 1.2250 kg/m³ (Mechanical Engineers' Handbook vol. 4, Table 6); μ from Sutherland's law at 288.15 K (β = 1.458×10⁻⁶, S = 110.4 K)
    expect([air.density, air.viscosity]).toEqual([1.225, 1.7894e-5]);
    expect(choosePreset(air, CUSTOM_FLUID)).toMatchObject({ fluid: 'custom', density: 1.225 });
    expect(() => choosePreset(c, 'mercury')).toThrow(/unknown fluid preset "mercury" \(expected water-20c, air-isa-sea-level or custom\)/);
  });

  it('a hand edit of ρ makes the fluid custom; typing the preset\'s values back makes it the preset again', () => {
    const c = { ...defaultConditions(), density: 1000 };
    expect(fluidAfterEdit(c)).toBe('custom');
    expect(fluidAfterEdit({ ...c, density: 998.207 })).toBe('water-20c');
  });

  it('writes every value explicitly and reads it back; a ruled lift is written with its rule and the direction it gave', () => {
    const c = { ...choosePreset(defaultConditions(), 'air-isa-sea-level'), speed: 40, area: 0.3, length: 1.2, pressure: 101325, momentPoint: [0.25, 0, 0] as [number, number, number] };
    const doc = referenceDoc(c, thin);
    expect(doc).toEqual({
      preset: 'air-isa-sea-level', density: 1.225, viscosity: 1.7894e-5, speed: 40, area: 0.3, length: 1.2, pressure: 101325,
      dragDirection: [1, 0, 0], liftDirection: [0, 1, 0], liftFrom: 'rule', momentPoint: [0.25, 0, 0],
    });
    expect(conditionsFromDoc(doc)).toEqual({ ...c, lift: [0, 1, 0] });
    expect(liftOf(c, thin).rule).toMatch(/^lift \(0, 1, 0\) derived: the mesh is thin along z/);
  });

  it('a lift direction without its rule is taken as set by hand; a set with other ρ than its preset is custom', () => {
    const c = conditionsFromDoc({ preset: 'water-20c', density: 1000, liftDirection: [0, 0, 1] });
    expect(c).toMatchObject({ fluid: 'custom', density: 1000, viscosity: 0.0010016, liftFrom: 'set', lift: [0, 0, 1] });
    expect(liftOf(c, thin)).toEqual({ direction: [0, 0, 1], rule: null });
    expect(conditionsFromDoc({ preset: 'water-20c' })).toMatchObject({ fluid: 'water-20c', density: 998.207 });
    expect(conditionsFromDoc(undefined)).toEqual(defaultConditions());
  });
});
