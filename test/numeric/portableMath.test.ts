// The engine-independent transcendental functions of src/core/numeric/portableMath.ts: accurate (checked against
// Node's own Math, an independent implementation, to within 2 ulp), exact where the true value is a double, and
// the only ones src/core uses (a scan of the sources). That the browser gives the same bits is checked in Chromium
// by test/browser/portableMath.test.ts.
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { PMath, sq } from '../../src/core/numeric/portableMath';
import { evaluateProbe, probeArguments, type BinaryName, type UnaryName } from './probeArguments';

/** Distance in units in the last place between two finite doubles of the same sign (0 when equal). */
function ulpDistance(a: number, b: number): number {
  if (a === b) return 0;
  const f = new Float64Array([a, b]);
  const i = new BigInt64Array(f.buffer);
  const key = (v: bigint) => (v < 0n ? -(v & 0x7fffffffffffffffn) : v);
  const d = key(i[0]) - key(i[1]);
  return Number(d < 0n ? -d : d);
}

const NATIVE = Math as unknown as Record<UnaryName | BinaryName, (...a: number[]) => number>;

describe('PMath', () => {
  const args = probeArguments(4000);

  it('agrees with Node\'s Math to within 2 ulp on every probe argument (a second, independent implementation)', () => {
    const ours = evaluateProbe(PMath, args);
    const theirs = evaluateProbe(NATIVE, args);
    expect(ours.length).toBe(theirs.length);
    let worst = 0, differ = 0;
    for (let k = 0; k < ours.length; k++) {
      if (Number.isNaN(theirs[k])) { expect(ours[k], `probe ${k}`).toBeNaN(); continue; }
      const d = ulpDistance(ours[k], theirs[k]);
      worst = Math.max(worst, d);
      if (d) differ++;
    }
    // Measured: 1 ulp at most for sin, cos, asin, acos, atan, exp, pow; 2 for atan2 and for log10 near 1.
    expect(worst).toBeLessThanOrEqual(2);
    // Two implementations of the same functions do round some arguments differently: that is the reason for PMath.
    console.log(`PMath vs node Math: ${differ} of ${ours.length} results differ in the last bit`);
  });

  it('is exact where the true value is a double', () => {
    expect(PMath.sin(0)).toBe(0);
    expect(Object.is(PMath.sin(-0), -0)).toBe(true);
    expect(PMath.cos(0)).toBe(1);
    expect(PMath.atan2(0, -1)).toBe(Math.PI); // pi rounded is the double Math.PI
    expect(PMath.atan2(1, 1)).toBe(Math.PI / 4);
    expect(PMath.exp(0)).toBe(1);
    expect(PMath.log(1)).toBe(0);
    expect(PMath.log10(1000)).toBe(3);
    expect(PMath.log10(1e-5)).toBe(-5);
    expect(PMath.pow(2, 10)).toBe(1024);
    expect(PMath.pow(10, 3)).toBe(1000);
    expect(PMath.pow(4, 0.5)).toBe(2);
    expect(PMath.hypot(3, 4)).toBe(5);
    expect(PMath.hypot(5, 12)).toBe(13);
    expect(PMath.asin(1)).toBe(Math.PI / 2);
    expect(PMath.acos(-1)).toBe(Math.PI);
    expect(sq(-3)).toBe(9);
  });

  it('keeps Math\'s special cases', () => {
    expect(PMath.pow(0, 0)).toBe(1);
    expect(PMath.pow(-8, 1 / 3)).toBeNaN();
    expect(PMath.log(0)).toBe(-Infinity);
    expect(PMath.log(-1)).toBeNaN();
    expect(PMath.exp(-Infinity)).toBe(0);
    expect(PMath.asin(1.5)).toBeNaN();
    expect(PMath.sin(Infinity)).toBeNaN();
    expect(PMath.hypot(Infinity, NaN)).toBe(Infinity);
  });

  it('is the only source of approximated Math functions in src/core', () => {
    const root = join(__dirname, '../../src/core');
    const files: string[] = [];
    const walk = (d: string) => {
      for (const n of readdirSync(d)) {
        const p = join(d, n);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.tsx?$/.test(n) && !p.endsWith('portableMath.ts')) files.push(p);
      }
    };
    walk(root);
    expect(files.length).toBeGreaterThan(50);
    const approximated = /(^|[^A-Za-z0-9_$])Math\.(sin|cos|tan|asin|acos|atan|atan2|exp|expm1|log|log2|log10|log1p|pow|hypot|cbrt|sinh|cosh|tanh|asinh|acosh|atanh)\b/;
    const power = /[^*/\s]\s*\*\*\s*[^*/\s=]/; // the ** operator (Math.pow); BigInt powers are allowed below
    const offenders: string[] = [];
    for (const f of files) {
      readFileSync(f, 'utf8').split('\n').forEach((line, i) => {
        const code = line.replace(/\/\/.*$/, '').replace(/^\s*\*.*$/, '').replace(/\/\*.*?\*\//g, '');
        if (approximated.test(code) || (power.test(code) && !/\d+n\s*\*\*\s*\d+n/.test(code))) offenders.push(`${relative(root, f)}:${i + 1}: ${line.trim()}`);
      });
    }
    expect(offenders).toStrictEqual([]);
  });
});
