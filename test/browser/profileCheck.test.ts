// The editor's profile check panel in real Chromium (Debian's /usr/bin/chromium via playwright-core): editing a
// profile number redraws the profile and names what makes it impossible, with the same checks as `haloweave profile`;
// "Use these numbers" puts an edited copy, with an id of its own, into the document, and undo brings the shipped one back.
import { describe, expect, it } from 'vitest';
import { harnessForFile, openEditor, waitSolved } from './harness';

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
});
