/**
 * Transcendental functions that give the same bits on every JavaScript engine.
 *
 * `Math.sin`, `Math.exp`, `Math.pow`... are only required by the language to be "implementation-approximated":
 * Node's V8 and a browser's V8 of another version round some arguments differently in the last bit (measured in
 * test/browser/portableMath.test.ts). The editor solves in the browser and `haloweave plan` in Node; for both to
 * give the same slits from the same plan, every computation in src/core uses these instead. They are pure
 * JavaScript ports of the FreeBSD/fdlibm routines (the npm @stdlib/math-base-special-* packages), built only on
 * IEEE 754 basic operations, which every engine rounds identically; they agree with V8's own Math to within 2 ulp (test/numeric).
 *
 * The exactly rounded Math functions (abs, floor, ceil, round, trunc, sign, sqrt, min, max, fround, imul) stay
 * Math's own. test/numeric/portableMath.test.ts keeps src/core free of the others.
 */
import sinImpl from '@stdlib/math-base-special-sin';
import cosImpl from '@stdlib/math-base-special-cos';
import tanImpl from '@stdlib/math-base-special-tan';
import asinImpl from '@stdlib/math-base-special-asin';
import acosImpl from '@stdlib/math-base-special-acos';
import atanImpl from '@stdlib/math-base-special-atan';
import atan2Impl from '@stdlib/math-base-special-atan2';
import expImpl from '@stdlib/math-base-special-exp';
import lnImpl from '@stdlib/math-base-special-ln';
import log10Impl from '@stdlib/math-base-special-log10';
import powImpl from '@stdlib/math-base-special-pow';
import hypotImpl from '@stdlib/math-base-special-hypot';

/** Engine-independent counterparts of Math's approximated functions; angles in radians, as Math's. */
export const PMath = {
  /** sin of an angle in radians. */
  sin: sinImpl as (xRad: number) => number,
  /** cos of an angle in radians. */
  cos: cosImpl as (xRad: number) => number,
  /** tan of an angle in radians. */
  tan: tanImpl as (xRad: number) => number,
  /** arcsine in radians, [-pi/2, pi/2]. */
  asin: asinImpl as (x: number) => number,
  /** arccosine in radians, [0, pi]. */
  acos: acosImpl as (x: number) => number,
  /** arctangent in radians, (-pi/2, pi/2). */
  atan: atanImpl as (x: number) => number,
  /** atan2(y, x) in radians, (-pi, pi], Math.atan2's argument order. */
  atan2: atan2Impl as (y: number, x: number) => number,
  /** e^x. */
  exp: expImpl as (x: number) => number,
  /** Natural logarithm. */
  log: lnImpl as (x: number) => number,
  /** Base-10 logarithm. */
  log10: log10Impl as (x: number) => number,
  /** x^y (Math.pow's special cases). */
  pow: powImpl as (x: number, y: number) => number,
  /** sqrt(x^2 + y^2) without undue overflow (two arguments only). */
  hypot: hypotImpl as (x: number, y: number) => number,
} as const;

/** x squared, exactly rounded (one multiplication), for `x ** 2`. */
export function sq(x: number): number {
  return x * x;
}
