import { describe, expect, it } from 'vitest';
import { fromSI, lookupUnit, normaliseUnit, toSI } from '../../core/physics/units.ts';

const si = (value: number, unit: string) => toSI(value, lookupUnit(unit)!);

describe('unit conversion to SI', () => {
  it('rejects units it does not know instead of guessing', () => {
    expect(lookupUnit('furlong')).toBeUndefined();
    expect(lookupUnit('')).toBeUndefined();
    expect(lookupUnit('inHg2')).toBeUndefined();
  });

  it('reads the usual spellings of one unit alike', () => {
    for (const s of ['N m', 'N·m', 'Nm', 'n*m', 'N.m']) expect(lookupUnit(s)?.label).toBe('N m');
    for (const s of ['lbf in', 'lbf-in', 'in lbf', 'lbf·in']) expect(lookupUnit(s)?.label).toBe('lbf in');
    for (const s of ['degC', '°C', 'deg C', 'C']) expect(lookupUnit(s)?.label).toBe('degC');
    expect(normaliseUnit(' InH2O ')).toBe('inh2o');
  });

  // Factors: NIST SP 811 (2008), Appendix B.8 and B.9; water columns conventional (docs/data-format.md).
  it.each([
    [1, 'kPa', 1000],
    [1, 'hPa', 100],
    [1, 'mbar', 100],
    [1, 'psi', 6894.757], // NIST SP 811 B.8: 6.894 757 E+03 Pa
    [1, 'inH2O', 249.08891], // conventional inch of water, docs/data-format.md §1.1 / NIST SP 811 B.8 footnote (249.089 Pa)
    [1, 'mmH2O', 9.80665], // NIST SP 811 B.8: conventional mmH2O 9.806 65 Pa
    [1, 'torr', 133.3224], // NIST SP 811 B.8: 1.333 224 E+02 Pa
    [1, 'lbf', 4.448222], // NIST SP 811 B.8: 4.448 222 E+00 N
    [1, 'kgf', 9.80665], // NIST SP 811 B.8: exact
    [1, 'lbf in', 0.1129848], // NIST SP 811 B.8: 1.129 848 E-01 N m
    [1, 'lbf ft', 1.355818], // NIST SP 811 B.8: 1.355 818 E+00 N m
    [180, 'deg', Math.PI],
    [1, 'rad', 1],
    [50, '%', 0.5],
    [0.5, 'fraction', 0.5],
  ])('%d %s is %d in SI (to the 7 digits NIST prints)', (value, unit, expected) => {
    expect(Math.abs(si(value, unit) - expected) / Math.abs(expected)).toBeLessThan(1e-6);
  });

  it('converts temperatures with their offsets (NIST SP 811 B.8)', () => {
    expect(si(0, 'degC')).toBeCloseTo(273.15, 10);
    expect(si(32, 'degF')).toBeCloseTo(273.15, 10);
    expect(si(212, 'degF')).toBeCloseTo(373.15, 10);
    expect(si(-40, 'degF')).toBeCloseTo(si(-40, 'degC'), 10);
    expect(si(300, 'K')).toBe(300);
  });

  it('round-trips through SI', () => {
    const conv = lookupUnit('degF')!;
    expect(fromSI(toSI(68.5, conv), conv)).toBeCloseTo(68.5, 12);
  });

  it('keeps NaN and negative values as they are', () => {
    expect(si(Number.NaN, 'kPa')).toBeNaN();
    expect(si(-2, 'kPa')).toBe(-2000);
  });
});
