// A new user's first session, through the real `npm start` (the project's own script, Vite's dev server; BROWSER=none
// keeps `--open` from looking for a desktop browser) and Debian's chromium: the solved demo is there at once; while a
// mask is dragged (mouse still held) the slits, yield and coverage follow live; the drop is one edit that Ctrl+Z undoes
// exactly; the slit list exports; a reload finds the work intact.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser } from 'playwright-core';
import { anchors, CHROMIUM, CHROMIUM_ARGS, maskCounts, openEditor, ROOT, shownNumbers, waitSolved, type Harness } from './harness';

let server: ChildProcess | null = null;
let browser: Browser | null = null;
let url = '';

beforeAll(async () => {
  server = spawn('npm', ['start', '--', '--port', '0', '--host', '127.0.0.1'], { cwd: ROOT, env: { ...process.env, BROWSER: 'none' }, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  url = await new Promise<string>((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`npm start printed no address within 120 s:\n${out}`)), 120_000);
    const take = (b: Buffer) => {
      out += b.toString();
      // eslint-disable-next-line no-control-regex
      const m = out.replace(/\x1b\[[0-9;]*m/g, '').match(/Local:\s+(http:\/\/\S+)/);
      if (m) { clearTimeout(timer); resolve(m[1]); }
    };
    server!.stdout!.on('data', take);
    server!.stderr!.on('data', take);
    server!.on('exit', (code) => reject(new Error(`npm start exited (${code}):\n${out}`)));
  });
  browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
}, 180_000);

afterAll(async () => {
  await browser?.close().catch(() => {});
  if (server?.pid) { try { process.kill(-server.pid, 'SIGTERM'); } catch { /* already gone */ } }
});

describe('a first session through `npm start`', () => {
  it('shows the solved demo, follows a drag live, undoes it exactly, exports, and keeps the work over a reload', async () => {
    const { context, page } = await openEditor({ browser: browser!, url } as unknown as Harness);
    // Loaded once: the dev server found every dependency at start-up (vite.config.ts optimizeDeps) and did not reload
    // the page under the user's hands (on a fresh clone it otherwise would, for the workers' dependencies).
    expect(await page.evaluate(() => (performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming).type)).toBe('navigate');
    const masks = await anchors(page);
    expect(masks.length).toBeGreaterThanOrEqual(4);
    const before = await shownNumbers(page);
    expect(before.counts.tracer).toBeGreaterThan(0);
    const radialBefore = await page.innerHTML('[data-testid="radial-plot"]');

    // Drag the first mask towards the view's centre, holding the mouse until the live preview has changed the numbers.
    const box = (await page.locator('[data-testid="sky-view"]').boundingBox())!;
    // The mask farthest from the view's centre (a mask already on the centre would not move towards it).
    const off = (a: { x: number; y: number }) => Math.hypot(box.width / 2 - a.x, box.height / 2 - a.y);
    const m = masks.reduce((a, b) => (off(b) > off(a) ? b : a));
    const dirX = box.width / 2 - m.x, dirY = box.height / 2 - m.y, n = Math.hypot(dirX, dirY) || 1;
    const x0 = box.x + m.x, y0 = box.y + m.y;
    await page.mouse.move(x0, y0);
    await page.mouse.down();
    for (let i = 1; i <= 16; i++) {
      await page.mouse.move(x0 + (dirX / n) * 10 * i, y0 + (dirY / n) * 10 * i);
      await page.waitForTimeout(16);
    }
    // Still held: the shown solution is a preview (not the exact solve of a document), and it differs from before.
    await page.waitForFunction((t) => document.querySelector('[data-testid="solve-status"]')?.getAttribute('data-current') === 'no'
      && document.querySelector('[data-testid="count-tracer"]')?.textContent !== t, String(before.counts.tracer), { timeout: 60_000 });
    const live = await shownNumbers(page);
    expect(live.counts).not.toStrictEqual(before.counts);
    expect(await page.innerHTML('[data-testid="radial-plot"]')).not.toBe(radialBefore);
    // Masks may overlap: the one on top where the mouse went down is the one that moves.
    const moving = (await anchors(page)).filter((a, i) => a.x !== masks[i].x || a.y !== masks[i].y);
    expect(moving).toHaveLength(1);
    await page.mouse.up();
    await waitSolved(page);
    const after = await shownNumbers(page);
    expect(after.counts).not.toStrictEqual(before.counts);
    const afterMask = await maskCounts(page, moving[0].id);

    // Undo: exactly as before.
    await page.locator('[data-testid="sky-view"]').focus();
    await page.keyboard.press('Control+z');
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(before);
    expect(await anchors(page)).toStrictEqual(masks);

    // Redo, export the slit list, reload: the moved mask and its numbers are back.
    await page.keyboard.press('Control+Shift+z');
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(after);
    await page.click('[data-testid="export-menu"]');
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('[data-testid="export-slits.csv"]')]);
    const file = join(mkdtempSync(join(tmpdir(), 'hw-journey-')), download.suggestedFilename());
    await download.saveAs(file);
    const rows = readFileSync(file, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('mask_id,slit_id,object_id,role,ra_deg,dec_deg,x_arcsec,y_arcsec,len_below_arcsec,len_above_arcsec,width_arcsec,tilt_deg,priority,mag');
    expect(rows.length - 1).toBe(Object.values(after.counts).reduce((a, b) => a + b, 0));
    await page.keyboard.press('Escape');
    await page.waitForFunction(() => /kept in this browser/.test(document.querySelector('[data-testid="autosave-status"]')?.textContent ?? ''));
    await page.waitForTimeout(600);
    await page.reload();
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(after);
    expect(await maskCounts(page, moving[0].id)).toStrictEqual(afterMask);
    await context.close();
  });
});
