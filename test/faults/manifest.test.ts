/** The manifest's profile digest: the same for a profile file's JSON and for the profile as the editor holds it. */
import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { canonicalJson, profileDigest } from '../../src/core/check/manifest';
import { parseProfile } from '../../src/core/profile/load';
import { sha256Hex } from '../../src/cli/outputFolder';

const DIR = join(__dirname, '../../instrument-profiles');

describe('profileDigest', () => {
  it.each(readdirSync(DIR).filter((f) => f.endsWith('.json')))('%s: the file and the validated profile give one digest', (f) => {
    const json = JSON.parse(readFileSync(join(DIR, f), 'utf8'));
    expect(profileDigest(parseProfile(json, f))).toBe(profileDigest(json));
    // Any changed value changes it (the gap the slits keep between them here).
    expect(profileDigest({ ...json, slits: { ...json.slits, gapArcsec: json.slits.gapArcsec + 0.1 } })).not.toBe(profileDigest(json));
    // The command line's node:crypto hash gives the built-in hash's digest.
    expect(profileDigest(json, sha256Hex)).toBe(profileDigest(json));
  });

  it('ignores key order and layout, not values', () => {
    expect(canonicalJson({ b: 1, a: [1, { d: 2, c: 'x' }] })).toBe('{"a":[1,{"c":"x","d":2}],"b":1}');
  });
});
