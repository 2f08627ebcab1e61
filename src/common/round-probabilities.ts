/**
 * Probabilities as the API answers them: rounded to 4 decimals, so 0.25000000000000006 is 0.25. Every number
 * under a key named `probability`, or inside an object named `probabilities`, is rounded; nothing else changes.
 * (The pages format the unrounded values themselves, never rounding up across the conclusion threshold.)
 */
const DECIMALS = 4;

const round = (n: number) => (Number.isFinite(n) ? Number(n.toFixed(DECIMALS)) : n);

export function roundProbabilities<T>(value: T, key = '', inProbabilities = false): T {
  if (typeof value === 'number') return (key === 'probability' || inProbabilities ? round(value) : value) as T;
  if (Array.isArray(value)) return value.map((v) => roundProbabilities(v, '', false)) as T;
  if (value && typeof value === 'object' && !(value instanceof Date)) {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = roundProbabilities(v, k, k === 'probabilities');
    return out as T;
  }
  return value;
}
