// A first plan from the user's own files in real Chromium (Debian's /usr/bin/chromium via playwright-core): a catalog
// whose RA is in hours under another name and a profile of the user's own, dropped together on the start panel or
// given one after the other; the galaxy typed (a missing field named, nothing typed lost); the plan opens on that
// profile, is solved and shown with the catalog's summary, and is saved with the profile file it names. Also: the profile check's footprint corners typed as text
// (a bad line named, a sliver refused) and the notice for a catalog read as Latin-1.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { harnessForFile, openEditor, ROOT, waitSolved } from './harness';
import { demoScenario } from '../../src/core/scenario/generator';

const harness = harnessForFile();
const sel = (id: string) => `[data-testid="${id}"]`;
const dir = mkdtempSync(join(tmpdir(), 'haloweave-onboarding-'));
const catalogText = ['NAME,alpha,delta,mag,color,role', ...demoScenario().catalogCsv.trim().split('\n').slice(1).map((l) => {
  const [id, ra, dec, mag, color, role] = l.split(',');
  return [id, (Number(ra) / 15).toFixed(8), dec, mag, color, role].join(',');
})].join('\n') + '\n';
const shipped = JSON.parse(readFileSync(join(ROOT, 'instrument-profiles/ridge10-narrow.json'), 'utf8'));
const profileText = JSON.stringify({ ...shipped, id: 'my-ridge', label: 'my ridge spectrograph', slits: { ...shipped.slits, widthArcsec: 1.1 } }, null, 2);
writeFileSync(join(dir, 'my-candidates.csv'), catalogText);
writeFileSync(join(dir, 'my-ridge.json'), profileText);
const GALAXY: Record<string, string> = { id: 'Started B', ra: '10:47:15.0', dec: '-21:24:18', re: '40', q: '0.8', pa: '35', vsys: '1180', muE: '21.2' };

type Doc = { plan: { galaxy: { id: string }; instrument?: string; catalogColumns?: Record<string, string> }; profile: { id: string; slits: { widthArcsec: number } } };
const docOf = (page: import('playwright-core').Page) => page.evaluate(() => (window as unknown as { haloweave: { store: { doc: Doc } } }).haloweave.store.doc);

describe('start a plan from dropped files', () => {
  it('catalog and profile in one drop; a missing field is named and nothing typed is lost; the plan opens, solves and shows', async () => {
    const { context, page } = await openEditor(harness());
    try {
      await page.click(`${sel('panel-start-plan')} .panel-toggle`);
      await page.evaluate(([cat, prof]) => {
        const dt = new DataTransfer();
        dt.items.add(new File([cat], 'my-candidates.csv', { type: 'text/csv' }));
        dt.items.add(new File([prof], 'my-ridge.json', { type: 'application/json' }));
        const target = document.querySelector('[data-testid="start-drop"]')!;
        target.dispatchEvent(new DragEvent('dragover', { dataTransfer: dt, bubbles: true, cancelable: true }));
        target.dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
      }, [catalogText, profileText]);
      await page.waitForFunction((s) => document.querySelector(s)?.textContent?.includes('my-ridge.json'), sel('start-profile-name'));
      expect(await page.textContent(sel('start-catalog-name'))).toContain('my-candidates.csv');
      // The window did not take the drop: the demo plan is still open.
      expect((await docOf(page)).plan.galaxy.id).not.toBe('Started B');

      for (const [k, v] of Object.entries(GALAXY)) if (k !== 'vsys') await page.fill(sel(`start-${k}`), v);
      await page.click(sel('start-plan'));
      await page.waitForSelector(sel('start-bad'));
      expect(await page.textContent(sel('start-bad'))).toMatch(/start a plan: velocity \(km\/s\): is empty \(the systemic velocity in km\/s/);
      expect(await page.getAttribute(sel('start-vsys'), 'aria-invalid')).toBe('true');
      expect(await page.inputValue(sel('start-ra'))).toBe('10:47:15.0');

      // The panel closed and opened again keeps what was typed and given.
      await page.click(`${sel('panel-start-plan')} .panel-toggle`);
      await page.click(`${sel('panel-start-plan')} .panel-toggle`);
      expect(await page.inputValue(sel('start-dec'))).toBe('-21:24:18');
      expect(await page.textContent(sel('start-profile-name'))).toContain('my-ridge');

      await page.fill(sel('start-vsys'), GALAXY.vsys);
      await page.click(sel('start-plan'));
      await page.waitForFunction(() => (window as unknown as { haloweave: { store: { doc: Doc } } }).haloweave.store.doc.plan.galaxy.id === 'Started B', undefined, { timeout: 60_000 });
      const doc = await docOf(page);
      expect(doc.profile.id).toBe('my-ridge');
      expect(doc.profile.slits.widthArcsec).toBe(1.1);
      expect(doc.plan.catalogColumns).toEqual({ id: 'NAME', ra: 'alpha', raUnit: 'hour', dec: 'delta' });
      expect(await page.textContent(sel('start-summary-catalog'))).toMatch(/catalog my-candidates\.csv \(csv\): (\d+) rows, \1 usable, 0 rows with problems/);
      expect(await page.textContent(sel('start-summary-alignment'))).toMatch(/alignment stars: \d+ in the catalog, \d+ of mag/);
      expect(await page.locator(sel('start-column')).count()).toBeGreaterThanOrEqual(4);
      expect(await page.locator(sel('start-choice')).count()).toBeGreaterThanOrEqual(5);
      expect(await page.textContent(sel('doc-name'))).toMatch(/my-candidates\.plan\.json •/);
      await waitSolved(page, 180_000);
      expect(Number(await page.textContent(sel('count-tracer')))).toBeGreaterThan(0);

      // Saving writes the plan naming the profile file, and the profile file itself.
      const downloads: import('playwright-core').Download[] = [];
      page.on('download', (d) => downloads.push(d));
      await page.click(sel('save-plan'));
      await expect.poll(() => downloads.length, { timeout: 10_000 }).toBe(2);
      expect(downloads.map((d) => d.suggestedFilename())).toEqual(['my-candidates.plan.json', 'my-ridge.profile.json']);
      const saved = JSON.parse(readFileSync((await downloads[0].path())!, 'utf8'));
      expect(saved.instrument).toBe('my-ridge.profile.json');
      expect(JSON.parse(readFileSync((await downloads[1].path())!, 'utf8')).slits.widthArcsec).toBe(1.1);
      expect(await page.textContent(sel('doc-name'))).not.toContain('•');
    } finally {
      await context.close();
    }
  }, 300_000);

  it('profile after the catalog through the picker; footprint corners typed as text; a Latin-1 catalog gets a notice', async () => {
    const { context, page } = await openEditor(harness());
    try {
      await page.click(`${sel('panel-start-plan')} .panel-toggle`);
      await page.setInputFiles(sel('start-files'), join(dir, 'my-candidates.csv'));
      await page.setInputFiles(sel('start-files'), join(dir, 'my-ridge.json'));
      await page.waitForFunction((s) => document.querySelector(s)?.textContent?.includes('my-ridge.json'), sel('start-profile-name'));
      expect(await page.textContent(sel('start-catalog-name'))).toContain('my-candidates.csv');

      await page.click(`${sel('panel-profile-check')} .panel-toggle`);
      const corners = page.locator(sel('profile-edit-footprint'));
      await corners.fill('-100 0\n100\n100 0.01');
      await corners.blur();
      expect(await page.textContent(sel('profile-edit-footprint-error'))).toMatch(/footprint, line 2: "100" is not one corner/);
      await corners.fill('-100 0\n100 0\n100 0.01\n-100 0.01');
      await corners.blur();
      await page.waitForSelector(sel('profile-check-problem'));
      expect(await page.textContent(sel('profile-check-problem'))).toMatch(/footprint: the outline encloses 2\.000 square arcsec, less than one minimal slit/);
      expect(await page.isDisabled(sel('profile-check-apply'))).toBe(true);

      const latin = [...'id,ra,dec,mag\nCl\xe9a-1,161.80,-21.40,21.0\nCl\xe9a-2,161.81,-21.41,21.2\n'].map((ch) => ch.charCodeAt(0));
      await page.evaluate((bytes) => {
        const dt = new DataTransfer();
        dt.items.add(new File([Uint8Array.from(bytes)], 'accents.csv', { type: 'text/csv' }));
        const target = document.querySelector('[data-testid="app"]')!;
        target.dispatchEvent(new DragEvent('dragover', { dataTransfer: dt, bubbles: true, cancelable: true }));
        target.dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
      }, latin);
      await page.waitForFunction(() => [...document.querySelectorAll('[data-testid="notice-warning"]')].some((n) => n.textContent?.includes('read as Latin-1')));
    } finally {
      await context.close();
    }
  }, 300_000);
});
