// The editor's layout in real Chromium at 1024 x 700 and 1600 x 1000: no element spills out of its panel (toolbar,
// side panels, target-table tools, sky legend), the toolbar stays one row, the page never scrolls sideways, and the
// sky view's overlays (compass, scale bar, pointer read-out, PA read-out) stay inside it without covering one another.
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { harnessForFile, openEditor } from './harness';

const harness = harnessForFile();
const T = 180_000;

interface Spill { container: string; element: string; by: number }

/** Elements whose box leaves their container's box sideways (more than 1 px), for every container matching `containers`. */
async function spills(page: Page, containers: string): Promise<Spill[]> {
  return page.evaluate((selector) => {
    const out: { container: string; element: string; by: number }[] = [];
    for (const c of document.querySelectorAll(selector)) {
      const cr = c.getBoundingClientRect();
      if (cr.width === 0) continue;
      for (const el of c.querySelectorAll('*')) {
        if (el.closest('svg') && el.tagName.toLowerCase() !== 'svg') continue; // an SVG's parts scale with it
        if ((el as HTMLElement).hidden || el.closest('[hidden]')) continue;
        const r = el.getBoundingClientRect();
        if (r.width === 0 || r.height === 0) continue;
        const style = getComputedStyle(el);
        if (style.visibility === 'hidden' || style.display === 'none') continue;
        const by = Math.max(r.right - cr.right, cr.left - r.left);
        // Text cut by an ellipsis stays inside: only what sticks out counts.
        if (by > 1) out.push({ container: `${c.className || c.tagName} ${c.getAttribute('data-testid') ?? ''}`.trim(), element: `${el.tagName.toLowerCase()}.${el.className} ${el.getAttribute('data-testid') ?? ''} "${(el.textContent ?? '').slice(0, 30)}"`, by: Math.round(by) });
      }
    }
    return out;
  }, containers);
}

async function rect(page: Page, selector: string) {
  return page.locator(selector).first().boundingBox();
}
function intersects(a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}
function inside(a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }): boolean {
  return a.x >= b.x - 1 && a.y >= b.y - 1 && a.x + a.width <= b.x + b.width + 1 && a.y + a.height <= b.y + b.height + 1;
}

describe('editor layout', () => {
  for (const [w, h] of [[1024, 700], [1600, 1000]] as const) {
    it(`${w} x ${h}: nothing spills out of its panel, the toolbar is one row, the sky's overlays stay apart`, async () => {
      const { context, page } = await openEditor(harness(), { width: w, height: h });
      // Show an active mask (PA read-out and the typed-value editor) and the hour-angle windows, as a user would.
      const firstMask = await page.locator('[data-testid^="mask-row-"]').first().getAttribute('data-testid');
      await page.click(`[data-testid="${firstMask}"]`);
      await page.waitForSelector('[data-testid="nights-plot"]', { timeout: 60_000 });
      await page.locator('[data-testid="target-row"]').first().click(); // the table's edit buttons enabled

      const found = await spills(page, '.toolbar, .panel, .tt-tools, .sky-legend, .tt-head');
      expect(found, JSON.stringify(found.slice(0, 8), null, 1)).toStrictEqual([]);
      // The page itself never scrolls sideways.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(w);
      // The toolbar is one row of controls.
      const bar = (await rect(page, '.toolbar'))!;
      expect(bar.height).toBeLessThan(48);
      const barItems = await page.$$eval('.toolbar > *', (els) => els.filter((e) => e.getBoundingClientRect().width > 0).map((e) => e.getBoundingClientRect().top));
      expect(Math.max(...barItems) - Math.min(...barItems)).toBeLessThan(12);
      // Every target-table button is fully visible inside the table.
      const table = (await rect(page, '[data-testid="target-table"]'))!;
      for (const id of ['weight-apply', 'force-in', 'force-out', 'release']) {
        const b = (await rect(page, `[data-testid="${id}"]`))!;
        expect(inside(b, table), `${id} inside the target table`).toBe(true);
      }
      // Sky overlays: inside the sky view and clear of one another and of the legend.
      const sky = (await rect(page, '[data-testid="sky-view"]'))!;
      const legend = (await rect(page, '.sky-legend'))!;
      const overlays: [string, NonNullable<Awaited<ReturnType<typeof rect>>>][] = [];
      for (const s of ['[data-testid="compass"]', '[data-testid="scale-bar"] span', '[data-testid="sky-readout"]', '[data-testid="pa-readout"]']) {
        const r = await rect(page, s);
        expect(r, s).toBeTruthy();
        overlays.push([s, r!]);
        expect(inside(r!, sky), `${s} inside the sky view`).toBe(true);
        expect(intersects(r!, legend), `${s} clear of the legend`).toBe(false);
      }
      for (let i = 0; i < overlays.length; i++) for (let j = i + 1; j < overlays.length; j++) {
        expect(intersects(overlays[i][1], overlays[j][1]), `${overlays[i][0]} and ${overlays[j][0]}`).toBe(false);
      }
      await context.close();
    }, T);
  }
});
