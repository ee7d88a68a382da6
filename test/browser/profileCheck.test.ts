// The editor's profile check panel in real Chromium (Debian's /usr/bin/chromium via playwright-core): editing a
// profile number redraws the profile and names what makes it impossible, with the same checks as `haloweave profile`;
// "Use these numbers" puts an edited copy, with an id of its own, into the document, and undo brings the shipped one back.
// The start-a-plan panel drafts a plan from a catalog file whose RA is in hours under another name, and the editor solves it.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { harnessForFile, openEditor, waitSolved } from './harness';
import { demoScenario } from '../../src/core/scenario/generator';

const harness = harnessForFile();
const sel = (id: string) => `[data-testid="${id}"]`;

describe('profile check panel', () => {
  it('an impossible central wavelength is refused; a possible one is applied as an edited profile, undoably', async () => {
    const { context, page } = await openEditor(harness());
    try {
      await waitSolved(page);
      await page.click(`${sel('panel-profile-check')} .panel-toggle`);
      await page.waitForSelector(sel('profile-check-usable'));
      expect(await page.isDisabled(sel('profile-check-apply'))).toBe(true);
      const field = page.locator(sel('profile-edit-centralWavelengthA'));
      await field.fill('5000');
      await field.press('Enter');
      await page.waitForSelector(sel('profile-check-problem'));
      expect(await page.textContent(sel('profile-check-problem'))).toMatch(/no slit anywhere in the field/);
      expect(await page.isDisabled(sel('profile-check-apply'))).toBe(true);
      await field.fill('8500');
      await field.press('Enter');
      await page.waitForFunction((s) => !document.querySelector(s), sel('profile-check-problem'));
      expect(await page.isDisabled(sel('profile-check-apply'))).toBe(false);
      await page.click(sel('profile-check-apply'));
      await page.waitForFunction((s) => (document.querySelector(s) as HTMLSelectElement).value.endsWith('-edited'), sel('profile-select'));
      const central = () => page.evaluate(() => (window as unknown as { haloweave: { store: { doc: { profile: { detector: { centralWavelengthA: number } } } } } }).haloweave.store.doc.profile.detector.centralWavelengthA);
      expect(await central()).toBe(8500);
      await page.click(sel('undo'));
      await page.waitForFunction((s) => !(document.querySelector(s) as HTMLSelectElement).value.endsWith('-edited'), sel('profile-select'));
      expect(await central()).not.toBe(8500);
    } finally {
      await context.close();
    }
  }, 240_000);

  it('start a plan: a catalog with RA in hours under another name becomes a plan that the editor opens and solves', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'haloweave-start-plan-'));
    const rows = demoScenario().catalogCsv.trim().split('\n').slice(1).map((l) => {
      const [id, ra, dec, mag, color, role] = l.split(',');
      return [id, (Number(ra) / 15).toFixed(8), dec, mag, color, role].join(',');
    });
    const path = join(dir, 'my-candidates.csv');
    writeFileSync(path, ['NAME,alpha,delta,mag,color,role', ...rows].join('\n') + '\n');
    const { context, page } = await openEditor(harness());
    try {
      await waitSolved(page);
      await page.click(`${sel('panel-start-plan')} .panel-toggle`);
      const values: Record<string, string> = { id: 'Started A', ra: '10:47:15.0', dec: '-21:24:18', re: '40', q: '0.8', pa: '35', vsys: '1180', muE: '21.2' };
      for (const [k, v] of Object.entries(values)) await page.fill(sel(`start-${k}`), v);
      await page.setInputFiles(sel('start-files'), path);
      await page.click(sel('start-plan'));
      const plan = () => page.evaluate(() => (window as unknown as { haloweave: { store: { doc: { plan: { galaxy: { id: string }; catalogColumns?: Record<string, string> } } } } }).haloweave.store.doc.plan);
      await page.waitForFunction(() => (window as unknown as { haloweave: { store: { doc: { plan: { galaxy: { id: string } } } } } }).haloweave.store.doc.plan.galaxy.id === 'Started A', undefined, { timeout: 60_000 });
      expect((await plan()).catalogColumns).toEqual({ id: 'NAME', ra: 'alpha', raUnit: 'hour', dec: 'delta' });
      expect(await page.locator(sel('start-choice')).count()).toBeGreaterThanOrEqual(5);
      await waitSolved(page, 180_000);
    } finally {
      await context.close();
    }
  }, 300_000);
});
