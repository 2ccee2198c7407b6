/**
 * Seeded random numbers for generated test data, samples and benchmarks, so every run sees the same
 * bytes: mulberry32 (a public-domain 32-bit mixer) for uniform deviates in [0, 1), and the Box–Muller
 * transform (Box & Muller, Ann. Math. Stat. 29 (1958) 610) for normal ones.
 */

export function uniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates. */
export function normal(seed: number): () => number {
  const u = uniform(seed);
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}
