import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseProfile, parseProfileText } from '../../src/core/profile/load';
import { InputError, type Problem } from '../../src/core/result';

const base = JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/quad8-square.json'), 'utf8')) as Record<string, any>;

/** The problems parseProfile reports for a copy of the shipped profile changed by `mutate`. */
function problemsOf(mutate: (p: Record<string, any>) => void): Problem[] {
  const p = structuredClone(base);
  mutate(p);
  try {
    parseProfile(p, 'bad.json');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).problems;
  }
  throw new Error('expected the profile to be rejected');
}

/** The problems parseProfileText reports for a text. */
function textProblemsOf(text: string): Problem[] {
  try {
    parseProfileText(text, 'bad.json');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).problems;
  }
  throw new Error('expected the text to be rejected');
}

const wheres = (ps: Problem[]) => ps.map((p) => p.where);

describe('malformed instrument profiles: each error names the key path', () => {
  it('the unchanged base profile loads (so every rejection below is caused by its change)', () => {
    expect(parseProfile(structuredClone(base), 'ok.json').id).toBe('quad8-square');
  });

  it.each([
    ['id'],
    ['label'],
    ['telescope.apertureM'],
    ['site.latDeg'],
    ['site.lonDeg'],
    ['site.elevationM'],
    ['site.pressureHPa'],
    ['site.temperatureC'],
    ['site.relativeHumidity'],
    ['footprint'],
    ['slits.minLengthArcsec'],
    ['slits.gapArcsec'],
    ['slits.widthArcsec'],
    ['slits.maxTiltDeg'],
    ['alignment.boxSizeArcsec'],
    ['alignment.minCount'],
    ['alignment.magRange'],
    ['detector.pixels'],
    ['detector.dispersionAPerPixel'],
    ['detector.centralWavelengthA'],
    ['detector.xArcsecPerPixel'],
    ['detector.gapsPixels'],
    ['detector.edgeMarginPixels'],
  ])('missing key %s is reported as missing, by its path', (path) => {
    const ps = problemsOf((p) => {
      const keys = path.split('.');
      let o = p;
      for (const k of keys.slice(0, -1)) o = o[k];
      delete o[keys[keys.length - 1]];
    });
    expect(ps).toHaveLength(1);
    expect(ps[0].where).toBe(`bad.json: ${path}`);
    expect(ps[0].what).toMatch(/^missing \(expected \w+\)$/);
  });

  it('a missing section is named', () => {
    const ps = problemsOf((p) => delete p.detector);
    expect(wheres(ps)).toEqual(['bad.json: detector']);
    expect(ps[0].what).toMatch(/missing \(expected object\)/);
  });

  it('wrong types name the key and the expected type', () => {
    const ps = problemsOf((p) => {
      p.telescope.apertureM = '8.1';
      p.detector.pixels = 4096.5;
      p.id = 42;
      p.footprint[1] = [165, 'a'];
    });
    const byWhere = Object.fromEntries(ps.map((p) => [p.where, p.what]));
    expect(byWhere['bad.json: telescope.apertureM']).toMatch(/expected number, received string/);
    expect(byWhere['bad.json: detector.pixels']).toMatch(/whole number/);
    expect(byWhere['bad.json: id']).toMatch(/expected string, received number/);
    expect(byWhere['bad.json: footprint.1.1']).toMatch(/expected number, received string/);
  });

  it('a footprint with fewer than three corners', () => {
    const ps = problemsOf((p) => (p.footprint = [[0, 0], [10, 10]]));
    expect(wheres(ps)).toEqual(['bad.json: footprint']);
    expect(ps[0].what).toMatch(/at least three corners/);
  });

  it('negative lengths', () => {
    const ps = problemsOf((p) => {
      p.slits.minLengthArcsec = -3;
      p.slits.widthArcsec = -0.5;
      p.slits.gapArcsec = -1;
      p.alignment.boxSizeArcsec = 0;
      p.detector.edgeMarginPixels = -2;
    });
    expect(wheres(ps).sort()).toEqual(
      ['alignment.boxSizeArcsec', 'detector.edgeMarginPixels', 'slits.gapArcsec', 'slits.minLengthArcsec', 'slits.widthArcsec'].map((k) => `bad.json: ${k}`).sort(),
    );
    for (const p of ps) expect(p.what).toMatch(/must be greater than 0|must not be negative/);
  });

  it('magRange reversed', () => {
    const ps = problemsOf((p) => (p.alignment.magRange = [20, 16]));
    expect(wheres(ps)).toEqual(['bad.json: alignment.magRange']);
    expect(ps[0].what).toMatch(/\[bright, faint\] with bright < faint/);
  });

  it('a reversed detector gap', () => {
    const ps = problemsOf((p) => (p.detector.gapsPixels = [[100, 200], [2100, 2040]]));
    expect(wheres(ps)).toEqual(['bad.json: detector.gapsPixels.1']);
    expect(ps[0].what).toMatch(/p0 < p1/);
  });

  it('values out of range: latitude, humidity', () => {
    const ps = problemsOf((p) => {
      p.site.latDeg = 95;
      p.site.relativeHumidity = 40; // a percentage where a fraction 0..1 is expected
    });
    expect(wheres(ps).sort()).toEqual(['bad.json: site.latDeg', 'bad.json: site.relativeHumidity']);
  });

  it('a self-intersecting footprint (a bow tie)', () => {
    const ps = problemsOf((p) => (p.footprint = [[-100, -100], [100, 100], [100, -100], [-100, 100]]));
    expect(wheres(ps)).toEqual(['bad.json: footprint']);
    expect(ps[0].what).toMatch(/crosses or touches itself/);
    expect(ps[0].fix).toMatch(/in order around the outline/);
  });

  it('a footprint whose outline touches itself at a corner', () => {
    // Corner (0, 0) of the notch lies on the bottom edge: not a simple polygon.
    const ps = problemsOf((p) => (p.footprint = [[-100, 0], [100, 0], [100, 100], [0, 0], [-100, 100]]));
    expect(wheres(ps)).toEqual(['bad.json: footprint']);
  });

  it('a non-convex but simple footprint is accepted', () => {
    const p = structuredClone(base);
    p.footprint = [[-100, -100], [100, -100], [100, 100], [20, 100], [20, 0], [-20, 0], [-20, 100], [-100, 100]];
    expect(parseProfile(p, 'ok.json').footprint).toHaveLength(8);
  });

  it('reports every problem at once, the outline check included', () => {
    // Defect found by this suite and fixed in load.ts: the self-intersection was only reported once
    // every schema problem was gone, so a user had to fix and reload twice.
    const ps = problemsOf((p) => {
      delete p.id;
      p.slits.minLengthArcsec = -1;
      p.alignment.magRange = [21, 15];
      p.footprint = [[-100, -100], [100, 100], [100, -100], [-100, 100]];
      p.telescope.apertureM = 'big';
    });
    expect(wheres(ps).sort()).toEqual(
      ['alignment.magRange', 'footprint', 'id', 'slits.minLengthArcsec', 'telescope.apertureM'].map((k) => `bad.json: ${k}`).sort(),
    );
  });

  it('the InputError message has one line per problem, each with the file and key', () => {
    const p = structuredClone(base);
    delete p.slits.gapArcsec;
    p.detector.pixels = -5;
    try {
      parseProfile(p, 'bad.json');
      throw new Error('expected a rejection');
    } catch (e) {
      const lines = (e as Error).message.split('\n');
      expect(lines).toHaveLength(2);
      expect(lines.some((l) => l.startsWith('bad.json: slits.gapArcsec: missing'))).toBe(true);
      expect(lines.some((l) => l.startsWith('bad.json: detector.pixels:'))).toBe(true);
    }
  });

  it('a top level that is not an object', () => {
    for (const v of [null, 42, 'text', [1, 2]]) {
      const ps = (() => {
        try {
          parseProfile(v, 'bad.json');
        } catch (e) {
          return (e as InputError).problems;
        }
        throw new Error('expected a rejection');
      })();
      expect(ps[0].where).toBe('bad.json: (top level)');
      expect(ps[0].what).toMatch(/expected object/);
    }
  });
});

describe('invalid JSON text', () => {
  it('names the file, line and column of the syntax error', () => {
    const text = '{\n  "id": "x",\n  "label": "y"\n  "telescope": {}\n}';
    const ps = textProblemsOf(text);
    expect(ps).toHaveLength(1);
    // The missing comma is noticed at the opening quote of "telescope": line 4, column 3.
    expect(ps[0].where).toBe('bad.json:4:3');
    expect(ps[0].what).toMatch(/^not valid JSON: /);
  });

  it('truncated and empty texts point at the end', () => {
    expect(textProblemsOf('{"id": "x",\n')[0].where).toBe('bad.json:2:1');
    expect(textProblemsOf('')[0].where).toBe('bad.json:1:1');
  });

  it('valid JSON with schema problems goes on to the key-path report', () => {
    const ps = textProblemsOf('{"id": "x"}');
    expect(wheres(ps)).toContain('bad.json: label');
    expect(wheres(ps)).toContain('bad.json: detector');
  });
});
