import { describe, expect, it } from 'vitest';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../core/physics/angles.ts';
import { bracket, finiteOrNull, interpolate, maxOf, minOf, sortedOrder } from '../../core/physics/numbers.ts';

describe('numeric helpers', () => {
  it('turns NaN and ±Infinity into null and keeps every finite number, zero included', () => {
    expect([Number.NaN, Infinity, -Infinity].map(finiteOrNull)).toEqual([null, null, null]);
    expect([0, -0, 5e-324, -1.7e308].map(finiteOrNull)).toEqual([0, -0, 5e-324, -1.7e308]);
  });

  it('finds the extremes of a million values without spreading them into arguments (a spread overflows the stack)', () => {
    const v = new Float64Array(1_000_000).map((_, i) => Math.sin(i));
    expect(maxOf(v)).toBeCloseTo(1, 9);
    expect(minOf(v)).toBeCloseTo(-1, 9);
    expect(maxOf([])).toBe(-Infinity);
    expect(minOf([])).toBe(Infinity);
  });

  it('interpolates linearly inside the table, takes the nearest end outside and says it did (common practice)', () => {
    const xs = [0, 1, 3];
    const ys = [10, 20, 0];
    expect(interpolate(xs, ys, 0.5)).toBe(15);
    expect(interpolate(xs, ys, 2)).toBe(10);
    expect(interpolate(xs, ys, 3)).toBe(0);
    expect(interpolate(xs, ys, -1)).toBe(10);
    expect(bracket(xs, -1).outside).toBe(true);
    expect(bracket(xs, 4).outside).toBe(true);
    expect(bracket(xs, 3).outside).toBe(false);
    expect(interpolate([2], [7], 5)).toBe(7);
    expect(bracket([2], 2).outside).toBe(false);
    expect(() => bracket([], 1)).toThrow();
  });

  it('sorts indices stably', () => {
    expect(sortedOrder([3, 1, 2, 1])).toEqual([1, 3, 2, 0]);
  });

  it('names its angle conversions for what they convert (π rad = 180°)', () => {
    expect(Math.PI * DEG_PER_RAD).toBe(180);
    expect(180 * RAD_PER_DEG).toBeCloseTo(Math.PI, 15);
  });
});
