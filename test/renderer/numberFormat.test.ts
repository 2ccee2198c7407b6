/**
 * The window's one number format (renderer/src/logic/numberFormat.ts): edge cases first (no value,
 * negative zero, the extremes, halves), then rounding to an uncertainty by JCGM 100:2008 (GUM) §7.2.6 with
 * its own worked example, then the per-quantity defaults, headers and read-outs.
 */
import { describe, expect, it } from 'vitest';
import { reportNumber } from '../../core/formats/reportTable.ts';
import {
  columnHeader,
  DASH,
  fixed,
  formatQuantity,
  millions,
  QUANTITY,
  readOutText,
  reynoldsText,
  signed,
  significant,
  uncertainty,
  valueForUncertainty,
  withUncertainty,
  withUnit,
} from '../../renderer/src/logic/numberFormat.ts';

describe('no value, negative zero, extremes', () => {
  it('shows "—" for null, undefined, NaN and the infinities, in every formatter', () => {
    for (const v of [null, undefined, Number.NaN, Infinity, -Infinity]) {
      expect(fixed(v, 2)).toBe(DASH);
      expect(significant(v, 3)).toBe(DASH);
      expect(millions(v)).toBe(DASH);
      expect(reynoldsText(v)).toBe(DASH);
      expect(withUncertainty(v, 0.01, 3)).toBe(DASH);
      expect(valueForUncertainty(v, 0.01, 3)).toBe(DASH);
      expect(uncertainty(v)).toBe(DASH);
      expect(signed(v, 2)).toBe(DASH);
      expect(formatQuantity('cl', v)).toBe(DASH);
    }
  });

  it('never shows a negative zero: -0 and negatives that round to zero lose the sign', () => {
    expect(fixed(-0, 3)).toBe('0.000');
    expect(fixed(-0.00001, 3)).toBe('0.000');
    expect(fixed(-0.4, 0)).toBe('0');
    expect(significant(-0, 3)).toBe('0');
    expect(signed(-0.00001, 4)).toBe('0.0000');
    expect(withUncertainty(-0.00001, 0.0012, 4)).toBe('0.0000 ± 0.0012');
  });

  it('writes minus as the ASCII hyphen-minus (pastes into a spreadsheet as a number), never U+2212, and groups no thousands', () => {
    const texts = [
      fixed(-2.0915, 2),
      significant(-1.234e-7, 3),
      withUncertainty(-2.0915, 0.026, 2),
      formatQuantity('cm', -0.0137),
      signed(-0.5, 1),
      fixed(99180.3, 0),
      fixed(1234567.891, 1),
    ];
    for (const t of texts) {
      expect(t).not.toContain('\u2212');
      expect(t).not.toMatch(/[\s,\u2009\u202f](?=\d{3})/);
    }
    expect(texts).toEqual(['-2.09', '-1.23e-7', '-2.091 ± 0.026', '-0.0137', '-0.5', '99180', '1234567.9']);
    expect(Number(fixed(-2.0915, 2))).toBe(-2.09);
  });

  it('goes to exponent form for very small and very large magnitudes (no "+", no padded exponent)', () => {
    expect(significant(9.59e-5, 3)).toBe('9.59e-5');
    expect(significant(0.000271, 3)).toBe('0.000271');
    expect(significant(123_456_789, 4)).toBe('1.235e8');
    expect(significant(5e-324, 2)).toBe('4.9e-324');
    expect(fixed(1e21, 2)).toBe('1.000000e21');
    expect(fixed(-1.7976931348623157e308, 3)).toBe('-1.797693e308');
    expect(significant(999_999.6, 6)).toBe('1.00000e6');
  });

  it('rounds halves of the binary value away from zero, as toFixed and the exports do (1.005 is stored below the half)', () => {
    expect(fixed(0.125, 2)).toBe('0.13');
    expect(fixed(-0.125, 2)).toBe('-0.13');
    expect(fixed(2.5, 0)).toBe('3');
    expect(fixed(1.005, 2)).toBe('1.00');
    expect(fixed(1.005, 2)).toBe(reportNumber(1.005, 2));
    expect(significant(0.0012345, 4)).toBe('0.001234'); // 0.0012345 is stored as 0.00123449999…
  });
});

describe('rounding to the uncertainty (JCGM 100:2008, GUM §7.2.6)', () => {
  it('GUM §7.2.6 example: y = 10.057 62 Ω with u = 27 mΩ is given as 10.058 Ω', () => {
    expect(withUncertainty(10.05762, 0.027, 2)).toBe('10.058 ± 0.027');
    expect(valueForUncertainty(10.05762, 0.027, 2)).toBe('10.058');
  });

  it('quotes the uncertainty to two significant digits, rounded to the nearest (GUM §7.2.6 allows rounding up; the exports round to the nearest too): 28.05 → 28, 10.47 → 10', () => {
    expect(uncertainty(28.05)).toBe('28');
    expect(uncertainty(10.47)).toBe('10');
    expect(uncertainty(0.00013239)).toBe('0.00013');
  });

  it("puts the value at the place of the uncertainty's second significant digit, whatever the default", () => {
    expect(withUncertainty(0.06577710582827746, 0.0001323901641698016, 5)).toBe('0.06578 ± 0.00013');
    expect(withUncertainty(0.8626279, 0.0035, 4)).toBe('0.8626 ± 0.0035');
    expect(withUncertainty(14.110937, 1.6, 2)).toBe('14.1 ± 1.6');
    expect(withUncertainty(1234.5, 56, 1)).toBe('1235 ± 56');
    // the second significant digit in the tens: the value rounded to tens
    expect(withUncertainty(12_345, 560, 1)).toBe('12350 ± 560');
  });

  it("agrees with the report export's rounding of the same value and uncertainty", () => {
    for (const [v, u] of [
      [0.06577710582827746, 0.0001323901641698016],
      [-2.091499954414847, 0.026],
      [610.6161, 1.53],
      [0.8626279, 0.0035],
    ] as const) {
      expect(valueForUncertainty(v, u, 4)).toBe(reportNumber(v, 4, u));
    }
  });

  it('falls back to the default decimals without a usable uncertainty (none, zero, negative, NaN)', () => {
    for (const u of [null, undefined, 0, -0.01, Number.NaN]) expect(withUncertainty(0.86262, u, 4)).toBe('0.8626');
  });

  it('never shows more than seven significant digits of the value, even with a tiny uncertainty', () => {
    const v = withUncertainty(99180.3456789, 1e-6, 1).split(' ± ')[0]!;
    expect(v.replace('.', '').length).toBeLessThanOrEqual(7);
    expect(v).toBe('99180.35');
  });
});

describe('quantities, headers and read-outs', () => {
  it('gives each quantity its screen resolution: α 2 decimals, CL 4, CD 5, Cm 4, q 1, V 2, Re in millions to 3', () => {
    expect(formatQuantity('alpha', 12.34567)).toBe('12.35');
    expect(formatQuantity('cl', 0.862628)).toBe('0.8626');
    expect(formatQuantity('cd', 0.0123103)).toBe('0.01231');
    expect(formatQuantity('cm', -0.037236)).toBe('-0.0372');
    expect(formatQuantity('q', 610.6161)).toBe('610.6');
    expect(formatQuantity('v', 32.14518)).toBe('32.15');
    expect(formatQuantity('reynolds', 473_783)).toBe('0.474');
    expect(formatQuantity('epsilon', 0.001344339)).toBe('0.00134');
    expect(formatQuantity('factor', 0.125049)).toBe('0.1250');
    expect(formatQuantity('uncertainty', 0.0034567)).toBe('0.0035');
    expect(formatQuantity('cl', 0.862628, 0.0035)).toBe('0.8626 ± 0.0035');
    expect(QUANTITY.q.unit).toBe('Pa');
  });

  it('quotes Reynolds numbers in millions: "0.474" under "Re [10⁶]", "0.474 × 10⁶" in text', () => {
    expect(millions(473_783)).toBe('0.474');
    expect(reynoldsText(473_783)).toBe('0.474 × 10⁶');
    expect(columnHeader('Re', QUANTITY.reynolds.unit)).toBe('Re [10⁶]');
  });

  it('writes headers as "symbol [unit]", a ratio as [–], no brackets without a unit', () => {
    expect(columnHeader('α', 'deg')).toBe('α [deg]');
    expect(columnHeader('CL', '-')).toBe('CL [–]');
    expect(columnHeader('point')).toBe('point');
  });

  it('gives plot read-outs with the unit, the uncertainty rounded by §7.2.6, nothing for a ratio', () => {
    expect(readOutText(0.51234, 0.0031, 4)).toBe('0.5123 ± 0.0031');
    expect(readOutText(12.3456, undefined, 2, 'deg')).toBe('12.35 deg');
    expect(readOutText(12.3456, 0.051, 2, 'deg')).toBe('12.346 ± 0.051 deg');
    expect(readOutText(-0.00001, undefined, 2)).toBe('0.00');
    expect(withUnit(DASH, 'Pa')).toBe(DASH);
  });

  it('signs differences: "+" for a positive change, none for zero', () => {
    expect(signed(0.01234, 4)).toBe('+0.0123');
    expect(signed(-0.01234, 4)).toBe('-0.0123');
    expect(signed(0, 2)).toBe('0.00');
  });
});
