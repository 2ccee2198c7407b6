import { describe, expect, it } from 'vitest';
import {
  compressibilityFactor,
  enhancementFactor,
  densityFromMoleFraction,
  isaTroposphere,
  moistAirDensity,
  saturationVapourPressure,
  speedOfSound,
  sutherlandViscosity,
  vapourMoleFraction,
} from '../../core/physics/air.ts';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('air properties', () => {
  it('returns NaN rather than a number for NaN input', () => {
    expect(moistAirDensity(Number.NaN, 293.15, 0.5)).toBeNaN();
    expect(sutherlandViscosity(Number.NaN)).toBeNaN();
  });

  it('gives zero density at zero pressure and none of the vapour at zero humidity', () => {
    expect(densityFromMoleFraction(0, 293.15, 0)).toBe(0);
    expect(vapourMoleFraction(101325, 293.15, 0)).toBe(0);
  });

  // ISO 2533:1975 Table 1 / ICAO Doc 7488: sea-level standard values.
  it('matches the ISO 2533 sea-level viscosity 1.7894e-5 Pa s and speed of sound 340.294 m/s', () => {
    expect(sutherlandViscosity(288.15)).toBeCloseTo(1.7894e-5, 9);
    expect(speedOfSound(288.15)).toBeCloseTo(340.294, 3);
  });

  it('matches the ISO 2533 sea-level density 1.225 kg/m³ in the standard atmosphere', () => {
    expect(isaTroposphere(0).rho).toBeCloseTo(1.225, 6);
  });

  // ISO 2533:1975 Table 5 (geopotential altitude): p and ρ at 1000 m, 5000 m and 11 000 m.
  it.each([
    [1000, 89874.6, 1.11164],
    [5000, 54019.9, 0.736116],
    [11000, 22632.0, 0.363918],
  ])('matches ISO 2533 at %d m', (h, p, rho) => {
    const s = isaTroposphere(h);
    expect(rel(s.p, p)).toBeLessThan(2e-6);
    expect(rel(s.rho, rho)).toBeLessThan(5e-6);
  });

  it('gives CIPM-2007 dry air at 15 °C within 0.05 % of the ISO 2533 1.225 kg/m³ (the difference is Z and the molar mass)', () => {
    // ISO 2533 uses an ideal gas with R = 287.052 87; CIPM-2007 includes Z ≈ 0.9996.
    expect(rel(moistAirDensity(101325, 288.15, 0), 1.225)).toBeLessThan(5e-4);
  });

  it('gives the saturation vapour pressure of water at 20 °C as 2339 Pa (IAPWS / Wagner & Pruss: 2339.2 Pa)', () => {
    // IAPWS-95 saturation pressure at 293.15 K: 2.3392 kPa (Wagner & Pruss, J. Phys. Chem. Ref. Data 31 (2002), Table 13.1)
    expect(rel(saturationVapourPressure(293.15), 2339.2)).toBeLessThan(5e-4);
  });

  it('gives a compressibility factor of 0.99964 for dry air at 20 °C, 101 325 Pa (CIPM-2007 eq. A1.3; value from memory)', () => {
    expect(compressibilityFactor(101325, 293.15, 0)).toBeCloseTo(0.99964, 5);
  });

  it('gives 1.2046 kg/m³ for dry and 1.1993 kg/m³ for 50 % RH air at 20 °C, 101 325 Pa (CIPM-2007; from memory)', () => {
    expect(moistAirDensity(101325, 293.15, 0)).toBeCloseTo(1.2046, 4);
    expect(moistAirDensity(101325, 293.15, 0.5)).toBeCloseTo(1.1993, 4);
  });

  it('makes humid air lighter than dry air at the same pressure and temperature', () => {
    expect(moistAirDensity(101325, 303.15, 0.9)).toBeLessThan(moistAirDensity(101325, 303.15, 0));
  });
});

describe('CIPM-2007 enhancement factor', () => {
  // Picard, Davis, Gläser, Fujii, Metrologia 45 (2008) 149, eq. A1.2: f = α + βp + γt², α = 1.00062,
  // β = 3.14e-8 Pa⁻¹, γ = 5.6e-7 K⁻²; at 101 325 Pa and 20 °C that is 1.004 025 6 (arithmetic on the published constants).
  it('is 1.0040256 at 101 325 Pa and 20 °C, and grows with pressure', () => {
    expect(enhancementFactor(101325, 293.15)).toBeCloseTo(1.0040256, 7);
    expect(enhancementFactor(60000, 293.15)).toBeCloseTo(1.00062 + 3.14e-8 * 60000 + 5.6e-7 * 400, 10);
  });
});
