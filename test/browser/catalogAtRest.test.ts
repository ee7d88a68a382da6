/**
 * The sky view's cached drawing is exact at rest: while the view pans and zooms the catalog raster is only moved and
 * scaled (and a moved mask's layer only translated), and once the motion stops the catalog canvas holds, pixel for pixel,
 * what a raster made from scratch for the current view holds, placed without any offset or scale. After a drag of a mask
 * (real mouse events, a live re-solve on every frame) the editor's solution is the command line's: `haloweave plan` on
 * the exported solved plan writes the very same slits.csv. A generated catalog of 20 000 rows, so the raster visits part
 * of the catalog through its grid index when zoomed in.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { generateScenario } from '../../src/core/scenario/generator';
import { anchors, dragMask, harnessForFile, openEditor, runCli, waitSolved } from './harness';

const harness = harnessForFile();
const ROWS = 20_000;

/** Scripted wheel events, one per animation frame: `n` pan steps or zoom steps about the view's middle. */
async function wheel(page: Page, mode: 'pan' | 'zoom', n: number, sign = 1): Promise<void> {
  await page.evaluate(({ mode, n, sign }) => new Promise<void>((resolve) => {
    const el = document.querySelector('[data-testid="sky-view"]') as HTMLElement;
    const r = el.getBoundingClientRect();
    let i = 0;
    const step = () => {
      const common = { bubbles: true, cancelable: true, clientX: r.left + r.width * 0.4, clientY: r.top + r.height * 0.6, deltaMode: 0 };
      el.dispatchEvent(mode === 'pan'
        ? new WheelEvent('wheel', { ...common, deltaX: 23 * sign, deltaY: -17 * sign })
        : new WheelEvent('wheel', { ...common, ctrlKey: true, deltaY: -6 * sign }));
      if (++i < n) requestAnimationFrame(step); else resolve();
    };
    requestAnimationFrame(step);
  }), { mode, n, sign });
}

/** At rest: the catalog canvas placed without offset beyond its margin or scale, and its pixels against a fresh raster. */
async function catalogAtRest(page: Page): Promise<{ placement: string; expected: string; differing: number; painted: number; first?: string }> {
  // Past the layer's settle time (140 ms) and the view's (120 ms), until the raster for the view is on the canvas (its
  // placement then has no offset beyond the margin and no scale), or 20 s.
  await page.waitForTimeout(400);
  await page.waitForFunction(() => {
    const c = document.querySelector('[data-testid="catalog-canvas"]') as HTMLCanvasElement;
    const v = document.querySelector('[data-testid="sky-view"]') as HTMLElement;
    return c.dataset.placement === `${-Math.max(200, Math.floor(v.clientWidth)) / 2},${-Math.max(200, Math.floor(v.clientHeight)) / 2},1`;
  }, undefined, { timeout: 20_000 }).catch(() => { /* the placement is checked below, with its value */ });
  return page.evaluate(() => {
    const c = document.querySelector('[data-testid="catalog-canvas"]') as HTMLCanvasElement & { catalogLayer: { compareWithFresh(): { differing: number; painted: number; first?: string } } };
    const v = document.querySelector('[data-testid="sky-view"]') as HTMLElement;
    const w = Math.max(200, Math.floor(v.clientWidth)), h = Math.max(200, Math.floor(v.clientHeight));
    return { placement: c.dataset.placement!, expected: `${-w / 2},${-h / 2},1`, ...c.catalogLayer.compareWithFresh() };
  });
}

describe('the sky view at rest after pan, zoom and drag', () => {
  it('shows exactly a fresh catalog raster, and after a drag solves to the command line\'s slits', async () => {
    const s = generateScenario({ seed: 5, candidates: ROWS });
    const dir = mkdtempSync(join(tmpdir(), 'hw-rest-'));
    const planName = 'rest.plan.json', catName = String((s.plan as { catalog: string }).catalog);
    writeFileSync(join(dir, planName), JSON.stringify(s.plan));
    writeFileSync(join(dir, catName), s.catalogCsv);
    const { context, page } = await openEditor(harness(), { width: 1400, height: 900 });
    page.on('dialog', (d) => void d.accept());
    await page.setInputFiles('[data-testid="open-input"]', [join(dir, planName), join(dir, catName)]);
    await page.waitForFunction((n) => document.querySelector('[data-testid="catalog-used"]')?.textContent === String(n), ROWS, { timeout: 120_000 });
    await waitSolved(page, 300_000);

    const fitted = await catalogAtRest(page);
    expect(fitted.placement).toBe(fitted.expected);
    expect(fitted.painted).toBeGreaterThan(1000);
    expect(fitted.differing, fitted.first).toBe(0);

    // Zoom in (past the scale a raster is stretched to), pan far enough to leave the raster's margin, zoom out a little.
    await wheel(page, 'zoom', 25);
    await wheel(page, 'pan', 40);
    await wheel(page, 'zoom', 8, -1);
    await wheel(page, 'pan', 12, -1);
    const moved = await catalogAtRest(page);
    expect(moved.placement).toBe(moved.expected);
    expect(moved.painted).toBeGreaterThan(100);
    expect(moved.differing, moved.first).toBe(0);

    // Back to the fitted view, drag a mask (its own layer translated while it moves), and wait for the exact solve.
    await page.locator('[data-testid="sky-view"]').press('0');
    const [first] = await anchors(page);
    await dragMask(page, first.id, 60, -35);
    await waitSolved(page, 300_000);
    const dragged = await catalogAtRest(page);
    expect(dragged.placement).toBe(dragged.expected);
    expect(dragged.differing, dragged.first).toBe(0);
    // The mask is drawn where it was dropped: its anchor moved by the drag.
    const after = (await anchors(page)).find((m) => m.id === first.id)!;
    expect(Math.hypot(after.x - first.x - 60, after.y - first.y + 35)).toBeLessThan(3);

    // The solution shown is the command line's for the same plan (the exported solved plan, its catalog beside it).
    const save = async (name: string) => {
      if (!(await page.locator(`[data-testid="export-${name}"]`).isVisible())) await page.click('[data-testid="export-menu"]');
      const [d] = await Promise.all([page.waitForEvent('download'), page.click(`[data-testid="export-${name}"]`)]);
      await d.saveAs(join(dir, name));
    };
    await save('slits.csv');
    await save('solved.plan.json');
    const out = join(dir, 'cli');
    const r = runCli(['plan', join(dir, 'solved.plan.json'), '--out', out, '--quiet']);
    expect(r.status, r.stderr).toBe(0);
    expect(readFileSync(join(out, 'slits.csv'), 'utf8')).toBe(readFileSync(join(dir, 'slits.csv'), 'utf8'));
    await context.close();
  }, 600_000);
});
