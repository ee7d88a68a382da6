/** fast-check arbitraries shared by the export tests: awkward text and slit lists. */
import fc from 'fast-check';
import type { Slit } from '../../src/core/geometry/maskSolution';

/** Text with the characters that break naive CSV and spreadsheets: delimiters, quotes, line ends, formula starts, non-ASCII. */
export const awkwardText = (minLength = 0) =>
  fc
    .array(
      fc.oneof(
        fc.constantFrom(',', '"', '\n', '\r', '\r\n', '=', '+', '-', '@', '\t', "'", ' ', '#', ';', 'é', 'Ø', 'ß', 'ж', '漢', '😀'),
        fc.string({ unit: 'grapheme', minLength: 1, maxLength: 3 }),
      ),
      { minLength, maxLength: 8 },
    )
    .map((parts) => parts.join(''))
    .filter((s) => s.length >= minLength);

export const finite = fc.double({ noNaN: true, noDefaultInfinity: true });

export const slitArb: fc.Arbitrary<Slit> = fc.record({
  maskId: awkwardText(1),
  slitId: awkwardText(1),
  objectId: awkwardText(0),
  role: fc.constantFrom('tracer', 'starlight', 'sky', 'alignment'),
  raDeg: finite,
  decDeg: finite,
  xArcsec: finite,
  yArcsec: finite,
  lenBelowArcsec: finite,
  lenAboveArcsec: finite,
  widthArcsec: finite,
  tiltDeg: finite,
  priority: finite,
  mag: fc.option(finite, { nil: null }),
});

