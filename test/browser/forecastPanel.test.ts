/**
 * The editor's Science forecast panel: the forecast of the demo layout (default mocks) with the saved layout beside
 * it, the reduced live forecast while a mask is held in a drag, and the full forecast again once it is dropped, the
 * saved column unchanged by the unsaved edit. Plots switch and show SVG.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { anchors, harnessForFile, openEditor, waitSolved } from './harness';
import { nightTable } from '../../src/core/observe/night';
import { nightsNeeded } from '../../src/core/forecast/hours';
import { galaxyModel, parsePlanText } from '../../src/core/plan/validate';

const get = harnessForFile();
const text = (page: import('playwright-core').Page, id: string) => page.locator(`[data-testid="${id}"]`).textContent();

describe('Science forecast panel', () => {
  it('shows the current and saved forecasts, the live one during a drag, and plots', async () => {
    const { page, context } = await openEditor(get());
    await waitSolved(page);
    const info = page.locator('[data-testid="forecast-info"]');
    await page.waitForFunction(() => document.querySelector('[data-testid="forecast-info"]')?.getAttribute('data-live') === 'no', undefined, { timeout: 90_000 });
    await page.waitForFunction(() => /^\d+$/.test(document.querySelector('[data-testid="fc-velocities-saved"]')?.textContent ?? ''), undefined, { timeout: 60_000 });
    const before = Number(await text(page, 'fc-velocities'));
    expect(before).toBeGreaterThan(50);
    expect(await text(page, 'fc-velocities-saved')).toBe(String(before));
    expect(await info.getAttribute('data-trials')).toBe('201');
    expect(await page.locator('[data-testid="forecast-plot"] svg').count()).toBe(1);

    // Nights of the semester: the panel's number is the one `haloweave forecast --from --to` computes from the same
    // hours, galaxy and site (observe/night.ts nights, best first until they cover the hours).
    await page.waitForFunction(() => /^(\d+ of \d+|> \d+)$/.test(document.querySelector('[data-testid="fc-nights"]')?.textContent ?? ''), undefined, { timeout: 120_000 });
    const cell = page.locator('[data-testid="fc-nights"]');
    const [hours, from, to, maxAirmass] = await Promise.all(['data-hours', 'data-from', 'data-to', 'data-max-airmass'].map((a) => cell.getAttribute(a)));
    const plan = parsePlanText(readFileSync('examples/demo/halo-demo.plan.json', 'utf8'), 'halo-demo.plan.json');
    const profile = JSON.parse(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'));
    const rows = nightTable(from!, to!, galaxyModel(plan), profile.site, { maxAirmass: Number(maxAirmass), stepMinutes: 10 });
    const n = nightsNeeded(Number(hours), rows, from!, to!);
    console.log(`forecast panel: ${Number(hours).toFixed(2)} h in ${from} to ${to}: panel "${await cell.textContent()}", CLI computation ${n.nightsNeeded} of ${n.nightsUsable}`);
    expect(await cell.textContent()).toBe(n.nightsNeeded === null ? `> ${n.nightsUsable}` : `${n.nightsNeeded} of ${n.nightsUsable}`);
    expect(n.nightsUsable).toBeGreaterThan(0);
    expect(await text(page, 'fc-nights-saved')).toBe(await cell.textContent());

    // Hold a mask in a drag: the panel switches to the reduced live forecast.
    const box = (await page.locator('[data-testid="sky-view"]').boundingBox())!;
    const a = (await anchors(page))[0];
    await page.mouse.move(box.x + a.x, box.y + a.y);
    await page.mouse.down();
    for (let i = 1; i <= 10; i++) {
      await page.mouse.move(box.x + a.x + 8 * i, box.y + a.y + 5 * i);
      await page.waitForTimeout(30);
    }
    await page.waitForFunction(() => document.querySelector('[data-testid="forecast-info"]')?.getAttribute('data-live') === 'yes', undefined, { timeout: 60_000 });
    expect(await info.getAttribute('data-trials')).toBe('20');
    expect(await info.textContent()).toMatch(/while dragging/);
    await page.mouse.up();
    await waitSolved(page);
    await page.waitForFunction(() => document.querySelector('[data-testid="forecast-info"]')?.getAttribute('data-live') === 'no', undefined, { timeout: 90_000 });
    // The saved layout's column stays that of the saved plan.
    expect(await text(page, 'fc-velocities-saved')).toBe(String(before));

    for (const p of ['rotation', 'starlight']) {
      await page.click(`[data-testid="forecast-plot-${p}"]`);
      expect(await page.locator('[data-testid="forecast-plot"] svg').count()).toBe(1);
    }
    expect(await page.locator('[data-testid="forecast-error"]').count()).toBe(0);
    await context.close();
  }, 240_000);
});
