/**
 * Units of probe sets: the catalogue's factors, refusal of offset and unknown units, the reference presets
 * and the unit a field has by its name.
 */
import { describe, expect, it } from 'vitest';
import { siDataset, siFactors } from '../../src/study/siDataset.ts';
import { FLUID_PRESETS, UNIT_CATALOGUE, fieldSiUnit, fluidPreset, normaliseUnit, unitByName, unitDef, unitLabel, unitProblem } from '../../src/study/units.ts';
import { pipeCase } from '../../src/samples/pipe.ts';

describe('unit catalogue', () => {
  it('converts by the definitions of the units', () => {
    // Reference, from memory (not read; exact by definition, docs/references.md "Units and conversions"):
    // SI prefixes (BIPM SI Brochure, 9th ed.); inch = 0.0254 m, foot = 0.3048 m and
    // pound = 0.45359237 kg by the 1959 international yard and pound agreement, standard gravity 9.80665 m/s²
    // (CGPM 1901), bar = 1e5 Pa, atm = 101325 Pa, cP = 1 mPa·s, cSt = 1 mm²/s — all exact by definition.
    expect(unitDef('mm')!.factor).toBe(1e-3);
    expect(unitDef('ft')!.factor).toBe(0.3048);
    expect(unitDef('kPa')!.factor).toBe(1e3);
    expect(unitDef('bar')!.factor).toBe(1e5);
    expect(unitDef('atm')!.factor).toBe(101325);
    expect(unitDef('psi')!.factor).toBeCloseTo(6894.757293168361, 9);
    expect(unitDef('cP')!.factor).toBe(1e-3);
    expect(unitDef('cSt')!.factor).toBe(1e-6);
    expect(unitDef('km/h')!.factor).toBeCloseTo(1 / 3.6, 15);
    for (const u of UNIT_CATALOGUE) expect(unitDef(u.si)!.factor, `${u.symbol} → ${u.si}`).toBe(1);
  });

  it('reads common spellings, refuses offset and unknown units with the reason', () => {
    expect(normaliseUnit('kg/m^3')).toBe('kg/m³');
    expect(normaliseUnit('kg/m3')).toBe('kg/m³');
    expect(normaliseUnit('Pa.s')).toBe('Pa·s');
    expect(normaliseUnit('m^2/s')).toBe('m²/s');
    expect(unitDef('N*m')!.symbol).toBe('N·m');
    expect(unitProblem('Pa')).toBeNull();
    expect(unitProblem('Pa.s')).toBe('"Pa.s" is written "Pa·s" here');
    expect(unitProblem('°C')).toMatch(/offset unit/);
    expect(unitProblem('degF')).toMatch(/offset unit/);
    expect(unitProblem('furlong')).toBe('an unknown unit "furlong"');
  });

  it('reference presets are the values of IAPWS-95 water / ISA air, docs/references.md §10', () => {
    // Reference: docs/references.md §10 — water at 20 °C, 1 atm: ρ = 998.207 kg/m³, μ = 1.00160 mPa·s
    // (C, IAPWS-95/IAPWS-2008); ISA sea level ρ = 1.2250 kg/m³ (V, Mechanical Engineers' Handbook vol. 4,
    // Table 6), air μ = 1.7894e-5 Pa·s (C, Sutherland's law)
    expect(fluidPreset('water-20c')).toMatchObject({ density: 998.207, viscosity: 1.0016e-3 });
    expect(fluidPreset('air-isa-sea-level')).toMatchObject({ density: 1.225, viscosity: 1.7894e-5 });
    expect(FLUID_PRESETS.every((p) => /docs\/references\.md §10/.test(p.source))).toBe(true);
  });

  it('field units: declared, else by name (SI), else undeclared; dimensionless shown blank', () => {
    expect(unitByName('p')).toBe('Pa');
    expect(unitByName('velocity')).toBe('m/s');
    expect(unitByName('wallShearStress')).toBe('Pa');
    expect(unitByName('skinFriction')).toBe('Pa');
    expect(unitByName('phi')).toBe('');
    expect(fieldSiUnit('p', { p: 'kPa' })).toBe('Pa');
    expect(fieldSiUnit('T', { T: 'K' })).toBe('K');
    expect(fieldSiUnit('phi', {})).toBe('undeclared');
    expect(unitLabel('1')).toBe('');
    expect(unitLabel('Pa')).toBe('Pa');
  });
});

describe('siDataset', () => {
  it('scales coordinates and declared fields by their factors; an SI file is used as it is', () => {
    const d = pipeCase({ nTheta: 8, nRadial: 2, nAxial: 2 });
    expect(siDataset(d, siFactors(undefined))).toBe(d);
    expect(siDataset(d, siFactors({ length: 'm', fields: { p: 'Pa' } }))).toBe(d);
    const f = siFactors({ length: 'mm', fields: { p: 'kPa' } });
    const s = siDataset(d, f);
    expect(s).not.toBe(d);
    expect(s.pieces[0]!.points[5]).toBeCloseTo(d.pieces[0]!.points[5]! * 1e-3, 18);
    const p0 = d.pieces[0]!.pointData.find((x) => x.name === 'p')!, p1 = s.pieces[0]!.pointData.find((x) => x.name === 'p')!;
    expect(p1.values[3]).toBeCloseTo(p0.values[3]! * 1e3, 12);
    // undeclared fields are shared, not copied
    expect(s.pieces[0]!.pointData.find((x) => x.name === 'velocity')).toBe(d.pieces[0]!.pointData.find((x) => x.name === 'velocity'));
    // converted once per declaration
    expect(siDataset(d, f)).toBe(s);
  });
});
