import { describe, expect, it } from 'vitest';
import { lookupUnit, STANDARD_GRAVITY, toSI } from '../../core/physics/units.ts';

const si = (value: number, unit: string) => toSI(value, lookupUnit(unit)!);

// Factors: NIST SP 811 (2008 ed.), Appendix B.8 (factors for units listed alphabetically).
describe('units of tunnel files as written (every spelling of the v2 list)', () => {
  it.each([
    // force
    ['N', 1],
    ['kN', 1000],
    ['lbf', 4.4482216152605],
    ['lb', 4.4482216152605], // NIST SP 811 B.8 pound-force 4.448 222 E+00 N
    ['ozf', 4.4482216152605 / 16], // NIST SP 811 B.8 ounce-force 2.780 139 E-01 N
    ['kgf', 9.80665],
    ['kp', 9.80665], // NIST SP 811 B.8 kilogram-force, exact
    ['gf', 0.00980665], // NIST SP 811 B.8 gram-force 9.806 65 E-03 N
    ['kg', 9.80665],
    ['g', 0.00980665], // mass indication × standard gravity 9.806 65 m/s² (NIST SP 811 B.8)
  ])('force: 1 %s = %f N', (unit, n) => {
    expect(lookupUnit(unit)!.quantity).toBe('force');
    expect(si(1, unit)).toBeCloseTo(n, 12);
  });

  it.each([
    ['N m', 1],
    ['Nm', 1],
    ['N·m', 1],
    ['N mm', 0.001],
    ['N cm', 0.01],
    // NIST SP 811 B.8: pound-force inch 1.129 848 E-01 N m; pound-force foot 1.355 818 E+00 N m
    ['lbf in', 0.1129848290276167],
    ['in-lb', 0.1129848290276167],
    ['in lbf', 0.1129848290276167],
    ['in·lbf', 0.1129848290276167],
    ['lb in', 0.1129848290276167],
    ['lbf ft', 4.4482216152605 * 0.3048],
    ['ft-lb', 4.4482216152605 * 0.3048],
    ['kgf m', 9.80665], // NIST SP 811 B.8 kilogram-force metre 9.806 65 N m
  ])('moment: 1 %s = %f N m', (unit, nm) => {
    expect(lookupUnit(unit)!.quantity).toBe('moment');
    expect(si(1, unit)).toBeCloseTo(nm, 12);
  });

  it.each([
    ['Pa', 1],
    ['kPa', 1000],
    ['hPa', 100],
    ['mbar', 100],
    ['bar', 1e5],
    ['psi', 6894.757293168361], // NIST SP 811 B.8 6.894 757 E+03 Pa
    ['torr', 133.32236842105263], // NIST SP 811 B.8 (101 325/760) Pa
    ['mmHg', 133.322387415], // NIST SP 811 B.8 conventional millimetre of mercury 1.333 224 E+02 Pa
    ['inHg', 3386.389], // NIST SP 811 B.8 conventional inch of mercury 3.386 389 E+03 Pa
    ['inH2O', 249.08891], // NIST SP 811 B.8 conventional inch of water 2.490 889 E+02 Pa
    ['mmH2O', 9.80665], // NIST SP 811 B.8 conventional millimetre of water 9.806 65 Pa
    ['cmH2O', 98.0665], // ten conventional millimetres of water
  ])('pressure: 1 %s = %f Pa', (unit, pa) => {
    expect(lookupUnit(unit)!.quantity).toBe('pressure');
    expect(si(1, unit)).toBeCloseTo(pa, 9);
  });

  it('names the mercury and force factors the contract quotes, to the digits quoted', () => {
    expect(si(1, 'inHg')).toBe(3386.389);
    expect(si(1, 'mmHg').toFixed(6)).toBe('133.322387');
    expect(si(1, 'lbf')).toBe(4.4482216152605);
    expect(si(1, 'kgf')).toBe(9.80665);
    expect(STANDARD_GRAVITY).toBe(9.80665);
  });

  it('reads temperatures in every spelling (NIST SP 811 B.8: T/K = t/°C + 273.15 = (t/°F + 459.67)/1.8)', () => {
    for (const s of ['degC', '°C', 'deg C', 'C', 'degr. C']) expect(si(20, s)).toBeCloseTo(293.15, 10);
    for (const s of ['degF', '°F']) expect(si(68, s)).toBeCloseTo(293.15, 10);
    expect(si(293.15, 'K')).toBe(293.15);
  });

  it('reads angles in every spelling', () => {
    for (const s of ['deg', '°', 'degrees', 'degr.']) expect(si(180, s)).toBeCloseTo(Math.PI, 14);
    expect(si(1, 'rad')).toBe(1);
  });

  it('reads humidity as % or a fraction, and "/" or "-" as dimensionless', () => {
    expect(si(50, '%')).toBe(0.5);
    expect(si(0.5, 'fraction')).toBe(0.5);
    expect(lookupUnit('/')!.quantity).toBe('ratio');
    expect(lookupUnit('-')!.quantity).toBe('ratio');
  });

  it('is case-insensitive and marks mass units read as force', () => {
    expect(lookupUnit('KPA')!.scale).toBe(1000);
    expect(lookupUnit('LBF')!.label).toBe('lbf');
    expect(lookupUnit('kg')!.massAsForce).toBe(true);
    expect(lookupUnit('kgf')!.massAsForce).toBeUndefined();
  });

  it('still knows nothing it was not told', () => {
    for (const s of ['stone', 'inHg2', 'Nmm2', 'degK', '']) expect(lookupUnit(s)).toBeUndefined();
  });
});
