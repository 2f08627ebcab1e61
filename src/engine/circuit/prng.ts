/**
 * Small seeded pseudo-random generator (mulberry32: a 32-bit state advanced by a Weyl sequence and mixed by two
 * multiply–xorshift rounds). Deterministic across platforms; plenty for tolerance sampling, not for cryptography.
 */
export type Random = () => number;

/** Uniform numbers on [0, 1) from a 32-bit integer seed. */
export function mulberry32(seed: number): Random {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Uniform on [lo, hi]. */
export function uniform(random: Random, lo: number, hi: number): number {
  return lo + (hi - lo) * random();
}
