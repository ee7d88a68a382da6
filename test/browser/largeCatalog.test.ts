/**
 * The editor with a 200 000-row catalog (generated, src/core/scenario/generator.ts): the plan and catalog open, every
 * row is counted as used, and the catalog layer draws the rows that fall in its raster (the view and half a view
 * around it). The rows expected there are counted here from the catalog file itself with the gnomonic (TAN)
 * projection about the galaxy centre, written out below from its textbook form (common practice; the same formula
 * as the contract's sky frame), not through the editor's code. Frame rates are measured in bench/editor.bench.ts.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateScenario } from '../../src/core/scenario/generator';
import { harnessForFile, openEditor } from './harness';

const harness = harnessForFile();
const ROWS = 200_000;

/** Gnomonic projection of (ra, dec) about (ra0, dec0), degrees in, arcsec out (xi East, eta North). */
function tan(ra0: number, dec0: number, ra: number, dec: number): { xi: number; eta: number } {
  const d = Math.PI / 180, a = (ra - ra0) * d;
  const cosc = Math.sin(dec0 * d) * Math.sin(dec * d) + Math.cos(dec0 * d) * Math.cos(dec * d) * Math.cos(a);
  const xi = (Math.cos(dec * d) * Math.sin(a)) / cosc;
  const eta = (Math.cos(dec0 * d) * Math.sin(dec * d) - Math.sin(dec0 * d) * Math.cos(dec * d) * Math.cos(a)) / cosc;
  return { xi: (xi / d) * 3600, eta: (eta / d) * 3600 };
}

describe('the editor with a 200 000-row catalog', () => {
  it('opens it and draws the dots that fall in view', async () => {
    const s = generateScenario({ seed: 11, candidates: ROWS });
    const dir = mkdtempSync(join(tmpdir(), 'hw-large-'));
    const planName = 'large.plan.json', catName = String((s.plan as { catalog: string }).catalog);
    writeFileSync(join(dir, planName), JSON.stringify(s.plan));
    writeFileSync(join(dir, catName), s.catalogCsv);
    const { context, page } = await openEditor(harness(), { width: 1500, height: 950 });
    page.on('dialog', (d) => void d.accept());
    await page.setInputFiles('[data-testid="open-input"]', [join(dir, planName), join(dir, catName)]);
    await page.waitForFunction((n) => document.querySelector('[data-testid="catalog-used"]')?.textContent === String(n), ROWS, { timeout: 300_000 });
    // The catalog layer rasters the new catalog: wait until its last raster counts more markers than the demo has rows.
    await page.waitForFunction(() => Number((document.querySelector('[data-testid="catalog-canvas"]') as HTMLElement)?.dataset.rasterDots ?? 0) > 20_000, undefined, { timeout: 120_000 });
    const shown = await page.evaluate(() => {
      const c = document.querySelector('[data-testid="catalog-canvas"]') as HTMLCanvasElement;
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let painted = 0;
      for (let i = 3; i < d.length; i += 4) if (d[i] > 0) painted++;
      return { dots: Number(c.dataset.rasterDots), area: c.dataset.rasterArea!.split(',').map(Number), painted, pixels: c.width * c.height };
    });
    const [cxi, ceta, wPx, hPx, pxPerArcsec] = shown.area;
    // Rows inside the raster by a clear margin must all be drawn; rows beyond it (plus the marker margin) never.
    const g = s.galaxy;
    let surelyIn = 0, maybeIn = 0;
    for (const t of s.targets) {
      const p = tan(g.raDeg, g.decDeg, t.raDeg, t.decDeg);
      const dx = Math.abs(p.xi - cxi) * pxPerArcsec, dy = Math.abs(p.eta - ceta) * pxPerArcsec;
      if (dx < wPx / 2 - 2 && dy < hPx / 2 - 2) surelyIn++;
      if (dx < wPx / 2 + 16 && dy < hPx / 2 + 16) maybeIn++;
    }
    expect(surelyIn).toBeGreaterThan(20_000);
    expect(shown.dots).toBeGreaterThanOrEqual(surelyIn);
    expect(shown.dots).toBeLessThanOrEqual(maybeIn);
    // And the dots are on the visible canvas: a good share of its pixels painted.
    expect(shown.painted / shown.pixels).toBeGreaterThan(0.05);
    await context.close();
  }, 600_000);
});
