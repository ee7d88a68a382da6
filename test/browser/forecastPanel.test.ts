/**
 * The editor's Science forecast panel: the forecast of the demo layout (default mocks) with the saved layout beside
 * it, the reduced live forecast while a mask is held in a drag, and the full forecast again once it is dropped, the
 * saved column unchanged by the unsaved edit. Plots switch and show SVG.
 */
import { describe, expect, it } from 'vitest';
import { anchors, harnessForFile, openEditor, waitSolved } from './harness';

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
