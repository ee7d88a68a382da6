/**
 * Seeded pseudo-random numbers for scenarios and the pointing search: the same seed gives the same
 * sequence on every machine (32-bit integer arithmetic only). Generator: mulberry32 (public-domain
 * 32-bit mixer, common practice for reproducible test data; not for cryptography).
 */
import { PMath } from './portableMath';

/** A stream of uniform numbers in [0, 1) plus derived draws. */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [lo, hi). */
  uniform(lo: number, hi: number): number;
  /** Standard normal draw (Box-Muller), scaled: mean + sigma * N(0, 1). */
  normal(mean?: number, sigma?: number): number;
  /** Integer in [0, n). */
  int(n: number): number;
}

/** Hash a text seed (or pass a number through) to an unsigned 32-bit integer (FNV-1a for text). */
export function seedToUint32(seed: number | string): number {
  if (typeof seed === 'number') return (Math.floor(seed) >>> 0) ^ 0x9e3779b9;
  let h = 0x811c9dc5;
  for (let i = 0; i < seed.length; i++) {
    h ^= seed.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** A seeded generator (mulberry32); `makeRng(7)` always yields the same sequence. */
export function makeRng(seed: number | string): Rng {
  let state = seedToUint32(seed);
  let spare: number | null = null;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    uniform: (lo, hi) => lo + (hi - lo) * next(),
    int: (n) => Math.min(n - 1, Math.floor(next() * n)),
    normal: (mean = 0, sigma = 1) => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return mean + sigma * s;
      }
      let u = 0;
      while (u <= 1e-300) u = next();
      const v = next();
      const r = Math.sqrt(-2 * PMath.log(u));
      spare = r * PMath.sin(2 * Math.PI * v);
      return mean + sigma * r * PMath.cos(2 * Math.PI * v);
    },
  };
}
