/**
 * Modified Bessel functions I0, I1, K0, K1 of a real positive argument, by the polynomial
 * approximations of Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 9.8.1–9.8.8
 * (relative error below about 2e-7). The circular-section image sums need them as ratios K/I, which
 * fall like e^(−2t); the exponentially scaled forms keep those ratios finite for large t.
 */

/** e^(−x)·I0(x) (A&S 9.8.1 for x ≤ 3.75, 9.8.2 above). */
export function i0e(x: number): number {
  if (x <= 3.75) {
    const t = (x / 3.75) ** 2;
    const v = 1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813)))));
    return v * Math.exp(-x);
  }
  const t = 3.75 / x;
  const p =
    0.39894228 +
    t * (0.01328592 + t * (0.00225319 + t * (-0.00157565 + t * (0.00916281 + t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))));
  return p / Math.sqrt(x);
}

/** e^(−x)·I1(x) (A&S 9.8.3 for x ≤ 3.75, 9.8.4 above). */
export function i1e(x: number): number {
  if (x <= 3.75) {
    const t = (x / 3.75) ** 2;
    const v = x * (0.5 + t * (0.87890594 + t * (0.51498869 + t * (0.15084934 + t * (0.02658733 + t * (0.00301532 + t * 0.00032411))))));
    return v * Math.exp(-x);
  }
  const t = 3.75 / x;
  const p =
    0.39894228 +
    t * (-0.03988024 + t * (-0.00362018 + t * (0.00163801 + t * (-0.01031555 + t * (0.02282967 + t * (-0.02895312 + t * (0.01787654 - t * 0.00420059)))))));
  return p / Math.sqrt(x);
}

/** e^(x)·K0(x) (A&S 9.8.5 for x ≤ 2, 9.8.6 above). */
export function k0e(x: number): number {
  if (x <= 2) {
    const t = (x / 2) ** 2;
    const i0 = i0e(x) * Math.exp(x);
    const v = -Math.log(x / 2) * i0 + (-0.57721566 + t * (0.4227842 + t * (0.23069756 + t * (0.0348859 + t * (0.00262698 + t * (0.0001075 + t * 0.0000074))))));
    return v * Math.exp(x);
  }
  const t = 2 / x;
  const p = 1.25331414 + t * (-0.07832358 + t * (0.02189568 + t * (-0.01062446 + t * (0.00587872 + t * (-0.0025154 + t * 0.00053208)))));
  return p / Math.sqrt(x);
}

/** e^(x)·K1(x) (A&S 9.8.7 for x ≤ 2, 9.8.8 above). */
export function k1e(x: number): number {
  if (x <= 2) {
    const t = (x / 2) ** 2;
    const i1 = i1e(x) * Math.exp(x);
    const v = x * Math.log(x / 2) * i1 + 1 + t * (0.15443144 + t * (-0.67278579 + t * (-0.18156897 + t * (-0.01919402 + t * (-0.00110404 - t * 0.00004686)))));
    return (v / x) * Math.exp(x);
  }
  const t = 2 / x;
  const p = 1.25331414 + t * (0.23498619 + t * (-0.0365562 + t * (0.01504268 + t * (-0.00780353 + t * (0.00325614 - t * 0.00068245)))));
  return p / Math.sqrt(x);
}
