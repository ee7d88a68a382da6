import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseProfileText } from '../../src/core/profile/load';

const dir = join(__dirname, '../../instrument-profiles');

describe('shipped instrument profiles', () => {
  const files = readdirSync(dir).filter((f) => f.endsWith('.json'));
  it('has at least three', () => expect(files.length).toBeGreaterThanOrEqual(3));
  for (const f of files) {
    it(`${f} loads and carries the illustrative-numbers note`, () => {
      const p = parseProfileText(readFileSync(join(dir, f), 'utf8'), f);
      expect(p.id + '.json').toBe(f);
      expect(p.note).toMatch(/observatory's documentation/);
    });
  }
});
