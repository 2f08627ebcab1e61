/**
 * Seeded random numbers for the out-of-model cases, kept apart from the engine's generator: SplitMix32 (a 32-bit
 * Weyl sequence, golden-ratio increment, mixed by two multiply–xorshift rounds as in Steele, Lea and Flood,
 * "Fast splittable pseudorandom number generators", OOPSLA 2014, reduced to 32 bits). Deterministic everywhere.
 */
export type Random = () => number;

export function splitmix32(seed: number): Random {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return ((z ^ (z >>> 16)) >>> 0) / 4294967296;
  };
}

/** FNV-1a of a string: turns a case's name into a seed. */
export function hashString(s: string): number {
  let h = 2166136261;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
  return h >>> 0;
}
