// The editor in real Chromium (Debian's /usr/bin/chromium via playwright-core), served by Vite in-process:
// the demo loads solved, a mask drag changes the slits, undo restores them exactly, a bad catalog shows its
// row report, reload restores the work, exported files pass `haloweave check` and load again, and the editor's
// numbers equal those of `haloweave plan` on the same plan.
import { describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { writeFileSync } from 'node:fs';
import { fitsImageBytes } from './fitsImage';
import { anchors, demoOnDisk, dragMask, expectFolderAgreesWithCli, maskCounts, numbersOfOutput, openEditor, runCli, shownNumbers, harnessForFile, waitSolved } from './harness';

const harness = harnessForFile();

async function clickExport(page: Page, testId: string, dir: string): Promise<string> {
  if (!(await page.locator(`[data-testid="${testId}"]`).isVisible())) await page.click('[data-testid="export-menu"]');
  const [download] = await Promise.all([page.waitForEvent('download'), page.click(`[data-testid="${testId}"]`)]);
  const path = join(dir, download.suggestedFilename());
  await download.saveAs(path);
  return path;
}

describe('editor in chromium', () => {
  it('loads the demo solved, drags a mask (slits change), undoes exactly, and restores the work after a reload', async () => {
    const { context, page } = await openEditor(harness());
    const masks = await anchors(page);
    expect(masks.length).toBeGreaterThanOrEqual(4);
    const before = await shownNumbers(page);
    expect(before.counts.tracer).toBeGreaterThan(0);
    expect(before.counts.alignment).toBeGreaterThanOrEqual(3 * masks.length);
    await page.screenshot({ path: '/tmp/hw-demo.png' });

    const perMaskBefore = Object.fromEntries(await Promise.all(masks.map(async (m) => [m.id, await maskCounts(page, m.id)] as const)));
    // Move a mask well across the field (towards the view's centre, so the pointer stays on the canvas): its
    // tracer yield must change. Masks may overlap; the one on top at that point is the one that moves.
    const box = (await page.locator('[data-testid="sky-view"]').boundingBox())!;
    // The mask farthest from the view's centre (a mask already on the centre would not move towards it).
    const off = (a: { x: number; y: number }) => Math.hypot(box.width / 2 - a.x, box.height / 2 - a.y);
    const far = masks.reduce((a, b) => (off(b) > off(a) ? b : a));
    const dirX = box.width / 2 - far.x, dirY = box.height / 2 - far.y;
    const n = Math.hypot(dirX, dirY) || 1;
    await dragMask(page, far.id, (dirX / n) * 160, (dirY / n) * 160);
    await waitSolved(page);
    const moved = await anchors(page);
    const k = moved.findIndex((m, i) => Math.hypot(m.x - masks[i].x, m.y - masks[i].y) > 100);
    expect(k).toBeGreaterThanOrEqual(0);
    expect(moved.filter((m, i) => m.x !== masks[i].x || m.y !== masks[i].y)).toHaveLength(1);
    const id = moved[k].id;
    const perMaskAfter = await maskCounts(page, id);
    expect(perMaskAfter.tracer).not.toBe(perMaskBefore[id].tracer);
    const after = await shownNumbers(page);
    expect(after.counts).not.toStrictEqual(before.counts);
    await expect.poll(() => page.textContent(`[data-testid="lock-${id}"]`)).toBe('locked');
    await page.screenshot({ path: '/tmp/hw-dragged.png' });

    // Undo with the keyboard: everything as before, exactly.
    await page.locator('[data-testid="sky-view"]').focus();
    await page.keyboard.press('Control+z');
    await waitSolved(page);
    await expect.poll(async () => (await anchors(page))[k]).toStrictEqual(masks[k]);
    expect(await anchors(page)).toStrictEqual(masks);
    expect(await shownNumbers(page)).toStrictEqual(before);
    expect(await maskCounts(page, id)).toStrictEqual(perMaskBefore[id]);

    // Redo, then reload: the autosave brings back the moved mask and its numbers.
    await page.keyboard.press('Control+Shift+z');
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(after);
    await page.waitForFunction(() => /kept in this browser/.test(document.querySelector('[data-testid="autosave-status"]')?.textContent ?? ''));
    await page.waitForTimeout(600);
    await page.reload();
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(after);
    const restored = await anchors(page);
    expect(restored.map((m) => m.id)).toStrictEqual(moved.map((m) => m.id));
    expect(restored[k].pa).toBe(moved[k].pa);
    expect(Math.abs(restored[k].x - moved[k].x)).toBeLessThan(0.2);
    expect(Math.abs(restored[k].y - moved[k].y)).toBeLessThan(0.2);
    expect(await page.textContent(`[data-testid="lock-${id}"]`)).toBe('locked');
    await context.close();
  });

  it('shows every bad row of a dropped catalog with its line, column and reason', async () => {
    const { context, page } = await openEditor(harness());
    const csv = [
      'id,ra,dec,mag',
      'ok1,161.80,-21.40,21.0',
      'nomag,161.81,-21.41,',
      'textra,abc,-21.40,21.5',
      'far,161.82,95,21.0',
      'ok1,161.83,-21.42,21.2',
      'ok2,161.79,-21.39,20.5',
    ].join('\n') + '\n';
    await page.evaluate((text) => {
      const dt = new DataTransfer();
      dt.items.add(new File([text], 'bad-rows.csv', { type: 'text/csv' }));
      const target = document.querySelector('[data-testid="app"]')!;
      target.dispatchEvent(new DragEvent('dragover', { dataTransfer: dt, bubbles: true, cancelable: true }));
      target.dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
    }, csv);
    await page.waitForSelector('[data-testid="reject-row"]');
    const rows = await page.$$eval('[data-testid="reject-row"]', (trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent ?? '')));
    // Lines count the header as line 1: the bad rows are lines 3, 4, 5 and the duplicate id on line 6.
    const lines = [...new Set(rows.map((r) => Number(r[0])))].sort((a, b) => a - b);
    expect(lines).toStrictEqual([3, 4, 5, 6]);
    const byLine = (l: number) => rows.filter((r) => Number(r[0]) === l);
    expect(byLine(3).some((r) => r[1] === 'mag')).toBe(true);
    expect(byLine(4).some((r) => r[1] === 'ra')).toBe(true);
    expect(byLine(5).some((r) => r[1] === 'dec')).toBe(true);
    expect(byLine(6).some((r) => r[1] === 'id')).toBe(true);
    for (const r of rows) expect(r[2].length).toBeGreaterThan(3);
    expect(await page.textContent('[data-testid="catalog-used"]')).toBe('2');
    expect(await page.textContent('[data-testid="catalog-rejected"]')).toBe('4');
    await page.screenshot({ path: '/tmp/hw-rejects.png' });
    await context.close();
  });

  it('shows the same numbers as `haloweave plan` on the demo plan', async () => {
    const demo = demoOnDisk();
    const out = mkdtempSync(join(tmpdir(), 'hw-cli-'));
    const r = runCli(['plan', demo.planPath, '--out', out, '--quiet']);
    expect(r.status, r.stderr).toBe(0);
    const cli = numbersOfOutput(readFileSync(join(out, 'slits.csv'), 'utf8'), readFileSync(join(out, 'coverage.json'), 'utf8'));
    const { context, page } = await openEditor(harness());
    // Counts and reach equal to the bit: core's math is engine-independent (src/core/numeric/portableMath.ts).
    expect(await shownNumbers(page)).toStrictEqual(cli);
    await context.close();
  });

  it('draws the per-sector coverage rose whole at 1600 x 1000 (its caption beside it does not squeeze it)', async () => {
    const { context, page } = await openEditor(harness(), { width: 1600, height: 1000 });
    const svg = page.locator('[data-testid="sector-plot"]');
    await svg.scrollIntoViewIfNeeded();
    const shown = (await svg.boundingBox())!;
    const drawn = Number(await svg.getAttribute('width'));
    expect(drawn).toBeGreaterThan(0);
    // The laid-out box is the drawn size: a narrower box cuts part of the chart off.
    expect(shown.width).toBeCloseTo(drawn, 0);
    expect(shown.height).toBeCloseTo(Number(await svg.getAttribute('height')), 0);
    await context.close();
  });

  it('exports files that pass `haloweave check`, give the same numbers under `haloweave plan`, and load again', async () => {
    const demo = demoOnDisk();
    const { context, page } = await openEditor(harness());
    const ids = (await anchors(page)).map((m) => m.id);
    await dragMask(page, ids[1], 70, -40);
    await waitSolved(page);
    await dragMask(page, ids[2], -55, 35);
    await waitSolved(page);
    const shown = await shownNumbers(page);
    const dir = mkdtempSync(join(tmpdir(), 'hw-export-'));
    for (const f of ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv', 'manifest.json']) await clickExport(page, `export-${f}`, dir);
    await page.keyboard.press('Escape');
    // The CLI's folder layout: the plan's catalog beside it.
    copyFileSync(demo.catalogPath, join(dir, demo.catalogName));
    // Checked, and solved again by the CLI to the very same files (Chromium and node compute the same weights,
    // projections and allocation to the bit).
    expectFolderAgreesWithCli(dir, shown);

    // Save the plan file too, then open the exported plan with its catalog in a fresh editor: same numbers.
    const saved = await clickExport(page, 'save-plan', dir).catch(async () => {
      const [d] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="save-plan"]')]);
      const p = join(dir, d.suggestedFilename());
      await d.saveAs(p);
      return p;
    });
    expect(JSON.parse(readFileSync(saved, 'utf8')).format).toBe('haloweave.plan/1');
    await context.close();
    const fresh = await openEditor(harness());
    fresh.page.on('dialog', (d) => void d.accept());
    await fresh.page.setInputFiles('[data-testid="open-input"]', [join(dir, 'solved.plan.json'), join(dir, demo.catalogName)]);
    await fresh.page.waitForFunction(() => document.querySelector('[data-testid="doc-name"]')?.textContent?.startsWith('solved.plan.json'));
    await waitSolved(fresh.page);
    expect(await shownNumbers(fresh.page)).toStrictEqual(shown);
    // The solved plan carries the solve's observing report; opened for editing, the document keeps the inputs only
    // (a stale report would otherwise be saved after the masks move), and the panels show the fresh solve's.
    const solvedFile = JSON.parse(readFileSync(join(dir, 'solved.plan.json'), 'utf8'));
    expect(solvedFile.observingReport).toBeDefined();
    expect(solvedFile.masks.every((m: object) => 'hourAngleWindowH' in m)).toBe(true);
    const opened = await fresh.page.evaluate(() => {
      const c = (window as unknown as { haloweave: { store: { doc: { plan: { observingReport?: unknown; masks: object[] } } }; session: { solution: { result: { plan: { observingReport?: unknown } } } } } }).haloweave;
      return { report: 'observingReport' in c.store.doc.plan, windows: c.store.doc.plan.masks.some((m) => 'hourAngleWindowH' in m), solvedReport: c.session.solution.result.plan.observingReport !== undefined };
    });
    expect(opened).toStrictEqual({ report: false, windows: false, solvedReport: true });
    await fresh.context.close();
  }, 150_000); // two command-line runs and two editors: about a minute on two shared cores

  it('shows a FITS image under the plan where its TAN WCS puts it, and says clearly when an image has no usable WCS', async () => {
    const { context, page } = await openEditor(harness());
    const galaxy = await page.evaluate(() => {
      const w = (window as unknown as { haloweave: { session: { solution: { result: { galaxy: { raDeg: number; decDeg: number } } } } } }).haloweave;
      return w.session.solution.result.galaxy;
    });
    const dir = mkdtempSync(join(tmpdir(), 'hw-fits-'));
    // 2 arcsec pixels, East to the left (CD1_1 < 0), a bright blob at the reference pixel = the galaxy centre.
    const blob = (x: number, y: number) => 10 + 1000 * Math.exp(-((x - 50.5) ** 2 + (y - 40.5) ** 2) / (2 * 4 ** 2));
    const wcs = { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: galaxy.raDeg, CRVAL2: galaxy.decDeg, CRPIX1: 50.5, CRPIX2: 40.5, CD1_1: -2 / 3600, CD1_2: 0, CD2_1: 0, CD2_2: 2 / 3600 };
    writeFileSync(join(dir, 'field.fits'), fitsImageBytes(wcs, 100, 80, blob));
    writeFileSync(join(dir, 'nowcs.fits'), fitsImageBytes({}, 100, 80, blob));

    await page.setInputFiles('[data-testid="open-input"]', [join(dir, 'nowcs.fits')]);
    await page.waitForSelector('[data-testid="notice-error"]');
    const msg = await page.textContent('[data-testid="notice-error"]');
    expect(msg).toMatch(/nowcs\.fits/);
    expect(msg).toMatch(/CTYPE1|WCS/);

    await page.setInputFiles('[data-testid="open-input"]', [join(dir, 'field.fits')]);
    await page.waitForSelector('[data-testid="backdrop-canvas"]');
    expect(await page.textContent('[data-testid="backdrop-name"]')).toBe('field.fits');
    // The blob sits at the galaxy centre on the screen; 60 px away (more than 4 sigma at this zoom) it is dark.
    const cam = await page.evaluate(() => Number(document.querySelector('[data-testid="camera"]')!.getAttribute('data-px-per-arcsec')));
    const px = await page.evaluate(() => {
      const c = document.querySelector('[data-testid="backdrop-canvas"]') as HTMLCanvasElement;
      const ctx = c.getContext('2d')!;
      const box = document.querySelector('[data-testid="sky-view"]')!.getBoundingClientRect();
      const cx = Math.round(box.width / 2), cy = Math.round(box.height / 2);
      const at = (x: number, y: number) => ctx.getImageData(x, y, 1, 1).data[0];
      return { centre: at(cx, cy), away: at(cx + 60, cy), inside: at(cx - Math.round(30), cy) };
    });
    expect(cam * 8).toBeLessThan(60); // 4 sigma of the blob (8 arcsec) is well inside 60 px
    expect(px.centre).toBeGreaterThan(150);
    expect(px.away).toBeLessThan(px.centre / 2);
    await page.screenshot({ path: '/tmp/hw-fits.png' });
    await context.close();
  });
});
