/**
 * A fixed, seeded set of arguments for every PMath function (src/core/numeric/portableMath.ts), covering the
 * ranges the planner uses (angles in radians up to a few turns, magnitudes and surface brightnesses through
 * pow(10, -0.4 m), Sérsic exponents) and some edges. The same set is evaluated in Node and in the browser to
 * show that both give the same bits (test/browser/portableMath.test.ts); the arguments themselves are made with
 * basic arithmetic and PMath only, so they are the same doubles in both.
 */
import { makeRng } from '../../src/core/numeric/random';
import { PMath } from '../../src/core/numeric/portableMath';

export type UnaryName = 'sin' | 'cos' | 'tan' | 'asin' | 'acos' | 'atan' | 'exp' | 'log' | 'log10';
export type BinaryName = 'atan2' | 'pow' | 'hypot';

export interface ProbeArguments {
  unary: Record<UnaryName, number[]>;
  binary: Record<BinaryName, [number, number][]>;
}

/** `n` seeded arguments per function (plus fixed edge cases). */
export function probeArguments(n: number, seed = 20261202): ProbeArguments {
  const rng = makeRng(seed);
  const many = (draw: () => number, edges: number[]) => [...edges, ...Array.from({ length: n }, draw)];
  const turns = () => rng.uniform(-4 * Math.PI, 4 * Math.PI);
  const unit = () => rng.uniform(-1, 1);
  const pairs = (draw: () => [number, number], edges: [number, number][]) => [...edges, ...Array.from({ length: n }, draw)];
  return {
    unary: {
      sin: many(turns, [0, -0, Math.PI, Math.PI / 2, 1e-9, 1e6, -1e6]),
      cos: many(turns, [0, Math.PI, Math.PI / 2, 1e-9, 1e6]),
      tan: many(() => rng.uniform(-1.5, 1.5), [0, Math.PI / 4, 1.5707963]),
      asin: many(unit, [0, 1, -1, 0.5, 1e-12]),
      acos: many(unit, [0, 1, -1, 0.5]),
      atan: many(() => rng.uniform(-50, 50), [0, 1, -1, 1e12]),
      exp: many(() => rng.uniform(-40, 40), [0, 1, -1, 1e-12, 700]),
      log: many(() => PMath.exp(rng.uniform(-30, 30)), [1, 2, 10, 1e-300, 1e300]),
      log10: many(() => PMath.exp(rng.uniform(-30, 30)), [1, 10, 1000, 1e-5, 2]),
    },
    binary: {
      atan2: pairs(() => [rng.uniform(-2e4, 2e4), rng.uniform(-2e4, 2e4)], [[0, 1], [1, 0], [0, -1], [-0, -1], [1, 1], [-1, -1]]),
      pow: pairs(() => (rng.next() < 0.5 ? [10, rng.uniform(-12, 4)] : [rng.uniform(0, 40), rng.uniform(-4, 4)]), [[2, 10], [10, -0.4], [0, 0], [4, 0.5], [1e-3, 0.25]]),
      hypot: pairs(() => [rng.uniform(-1e4, 1e4), rng.uniform(-1e4, 1e4)], [[3, 4], [0, 0], [1e-200, 1e-200], [5, 12]]),
    },
  };
}

/** Every PMath-like function applied to every probe argument, as one flat array in a fixed order. */
export function evaluateProbe(m: Record<UnaryName | BinaryName, (...a: number[]) => number>, args: ProbeArguments): number[] {
  const out: number[] = [];
  for (const [name, xs] of Object.entries(args.unary) as [UnaryName, number[]][]) for (const x of xs) out.push(m[name](x));
  for (const [name, xs] of Object.entries(args.binary) as [BinaryName, [number, number][]][]) for (const [a, b] of xs) out.push(m[name](a, b));
  return out;
}

/** Bit patterns of doubles as hex text (so that -0 and every NaN payload compare exactly). */
export function bitsHex(values: readonly number[]): string[] {
  const f = new Float64Array(1), u = new BigUint64Array(f.buffer);
  return values.map((v) => { f[0] = v; return u[0].toString(16); });
}
