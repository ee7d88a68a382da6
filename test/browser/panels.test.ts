// The editor's panels in real Chromium (Debian's /usr/bin/chromium via playwright-core), served by Vite in-process:
// turning a mask by its handle, locking, the target table linked with the sky view, weights and forcing, galaxy
// and goal edits (with refused input), the pointing search (progress, cancel, one undoable step), nights and
// hour-angle windows, the SVG mask charts, the question before discarding edits, the masks goal, a catalog opened
// after its plan, keyboard pan and zoom, and the brightness scaling of a FITS backdrop. Edits are undone and the
// shown numbers compared exactly.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Dialog, Download, Page } from 'playwright-core';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { fitsImageBytes } from './fitsImage';
import { inPolygon, maskToScreen, screenToMask, type Poly, type Pt } from './maskFrame';
import { anchors, demoOnDisk, dragMask, maskCounts, openEditor, shownNumbers, harnessForFile, waitSolved, type Anchor } from './harness';

const harness = harnessForFile();

const T = 150_000; // per-test timeout: two cores shared with other work

interface Cam { xi: number; eta: number; px: number }

const ROLES = ['tracer', 'starlight', 'sky', 'alignment'] as const;
const sel = (id: string) => `[data-testid="${id}"]`;

async function camera(page: Page): Promise<Cam> {
  return page.$eval(sel('camera'), (el) => ({ xi: Number(el.getAttribute('data-xi')), eta: Number(el.getAttribute('data-eta')), px: Number(el.getAttribute('data-px-per-arcsec')) }));
}

async function skyBox(page: Page): Promise<{ x: number; y: number; width: number; height: number }> {
  return (await page.locator(sel('sky-view')).boundingBox())!;
}

/** The loaded profile's footprint (mask frame, arcsec). */
async function footprint(page: Page): Promise<Poly> {
  return page.evaluate(() => (window as unknown as { haloweave: { store: { doc: { profile: { footprint: [number, number][] } } } } }).haloweave.store.doc.profile.footprint);
}

async function undoTitle(page: Page): Promise<string> {
  return (await page.getAttribute(sel('undo'), 'title')) ?? '';
}

/** True when screen point p, and every point 8 px around it, lies outside every mask footprint. */
function clearOfMasks(p: Pt, masks: Anchor[], fp: Poly, s: number): boolean {
  for (const [dx, dy] of [[0, 0], [8, 0], [-8, 0], [0, 8], [0, -8], [6, 6], [-6, 6], [6, -6], [-6, -6]]) {
    for (const m of masks) {
      const q = screenToMask(m, s, { x: p.x + dx, y: p.y + dy });
      if (inPolygon(fp, q.x, q.y)) return false;
    }
  }
  return true;
}

const ARCSEC_PER_RAD = (180 / Math.PI) * 3600;

/** Gnomonic (TAN) projection about (ra0, dec0), degrees in, arcsec out (xi East, eta North); Calabretta & Greisen (2002) eq. 54-55 in standard-coordinate form. */
function gnomonic(ra0: number, dec0: number, ra: number, dec: number): { xi: number; eta: number } {
  const r = Math.PI / 180;
  const da = (ra - ra0) * r, d = dec * r, d0 = dec0 * r;
  const den = Math.sin(d) * Math.sin(d0) + Math.cos(d) * Math.cos(d0) * Math.cos(da);
  return {
    xi: ((Math.cos(d) * Math.sin(da)) / den) * ARCSEC_PER_RAD,
    eta: ((Math.sin(d) * Math.cos(d0) - Math.cos(d) * Math.sin(d0) * Math.cos(da)) / den) * ARCSEC_PER_RAD,
  };
}

interface ScreenTarget { index: number; id: string; role: string; x: number; y: number; slit: string }

/**
 * Every catalog target on the screen (px relative to the sky-view box), projected here about the galaxy centre with the
 * camera the page reports; `slit` is the table's status text for targets on a slit ("m2 S011"), else ''.
 */
async function screenTargets(page: Page): Promise<ScreenTarget[]> {
  const data = await page.evaluate(() => {
    type S = { objectId: string; role: string; maskId: string; slitId: string };
    const c = (window as unknown as { haloweave: { session: { catalog: { targets: { id: string; raDeg: number; decDeg: number; role: string }[] }; solution: { result: { galaxy: { raDeg: number; decDeg: number }; masks: { slits: S[] }[] } } } } }).haloweave;
    const slits: [string, string][] = [];
    for (const m of c.session.solution.result.masks) for (const s of m.slits) if (s.role === 'tracer' || s.role === 'alignment') slits.push([s.objectId, `${s.maskId} ${s.slitId}`]);
    return {
      galaxy: c.session.solution.result.galaxy,
      targets: c.session.catalog.targets.map((t) => [t.id, t.raDeg, t.decDeg, t.role] as [string, number, number, string]),
      slits,
    };
  });
  const cam = await camera(page);
  const box = await skyBox(page);
  const slitOf = new Map(data.slits);
  return data.targets.map(([id, ra, dec, role], index) => {
    const p = gnomonic(data.galaxy.raDeg, data.galaxy.decDeg, ra, dec);
    return { index, id, role, x: Math.floor(box.width) / 2 - (p.xi - cam.xi) * cam.px, y: Math.floor(box.height) / 2 - (p.eta - cam.eta) * cam.px, slit: slitOf.get(id) ?? '' };
  });
}

/** Count of pure-white pixels (the selection ring) on the catalog canvas in a square of half-size r about p. */
async function whitePixelsNear(page: Page, p: Pt, r = 12): Promise<number> {
  return page.evaluate(({ x, y, r }) => {
    const c = document.querySelector('[data-testid="catalog-canvas"]') as HTMLCanvasElement;
    // The canvas holds a raster larger than the view, placed at (dx, dy) on it (data-placement; scale 1 at rest).
    const [dx, dy] = c.dataset.placement!.split(',').map(Number);
    const d = c.getContext('2d')!.getImageData(Math.round(x - dx) - r, Math.round(y - dy) - r, 2 * r + 1, 2 * r + 1).data;
    let n = 0;
    for (let i = 0; i < d.length; i += 4) if (d[i] === 255 && d[i + 1] === 255 && d[i + 2] === 255 && d[i + 3] === 255) n++;
    return n;
  }, { x: p.x, y: p.y, r });
}

/** Rows the table shows now: id, weight text and status text. */
async function tableRows(page: Page): Promise<{ id: string; mag: number; weight: string; status: string; selected: boolean }[]> {
  return page.$$eval('[data-testid="target-row"]', (rows) => rows
    .map((r) => ({ top: parseFloat((r as HTMLElement).style.top), r }))
    .sort((a, b) => a.top - b.top)
    .map(({ r }) => {
      const cells = [...r.children].map((c) => c.textContent ?? '');
      return { id: r.getAttribute('data-id')!, mag: Number(cells[1]), weight: cells[4], status: cells[5], selected: r.classList.contains('sel') };
    }));
}

async function rowOf(page: Page, id: string) {
  return (await tableRows(page)).find((r) => r.id === id);
}

/** Filter the table to the rows whose id contains `text`. */
async function filterTable(page: Page, text: string): Promise<void> {
  await page.fill(sel('target-filter'), text);
  await page.waitForFunction((t) => [...document.querySelectorAll('[data-testid="target-row"]')].every((r) => r.getAttribute('data-id')!.toLowerCase().includes(t)), text.toLowerCase());
}

async function selectionCount(page: Page): Promise<number> {
  return parseInt((await page.textContent(sel('selection-count'))) ?? '', 10);
}

/** Slits per role summed over the rows of the Masks panel (every slit the yield counts belongs to a listed mask). */
async function panelTotals(page: Page): Promise<Record<string, number>> {
  const ids = (await anchors(page)).map((a) => a.id);
  const out: Record<string, number> = { tracer: 0, starlight: 0, sky: 0, alignment: 0 };
  for (const id of ids) {
    const c = await maskCounts(page, id);
    for (const r of ROLES) out[r] += c[r];
  }
  return out;
}

/** Wait until the document has changed (a new undo entry or a new solve started) and the solve of it is shown. */
async function solvedAfter(page: Page, before: string): Promise<void> {
  await page.waitForFunction((b) => document.querySelector('[data-testid="undo"]')?.getAttribute('title') !== b, before, { timeout: 30_000 });
  await waitSolved(page);
}

describe('editor panels in chromium', () => {
  it('turns a mask with its round handle: PA and that mask\'s slits change, Ctrl+Z restores both exactly', async () => {
    const { context, page } = await openEditor(harness());
    const fp = await footprint(page);
    const yMax = Math.max(...fp.map((c) => c[1]));
    const box = await skyBox(page);
    // The last mask is drawn on top, so no other mask's body covers its handle. The handle sits on the mask's +y axis,
    // 26 + 7 px beyond the footprint (SkyView.tsx); zoom out with '-' until it is well inside the view.
    const handleOf = async () => {
      const masks = await anchors(page);
      const m = masks[masks.length - 1];
      const cam = await camera(page);
      return { masks, m, cam, p: maskToScreen(m, cam.px, 0, yMax + 33 / cam.px) };
    };
    const inView = (p: Pt, margin: number) => p.x > margin && p.y > margin + 20 && p.x < box.width - margin && p.y < box.height - margin;
    let hd = await handleOf();
    for (let k = 0; k < 4 && !inView(hd.p, 40); k++) {
      const px = hd.cam.px, drawn = JSON.stringify(hd.masks);
      await page.locator(sel('sky-view')).focus();
      await page.keyboard.press('-');
      await page.waitForFunction((p) => Number(document.querySelector('[data-testid="camera"]')!.getAttribute('data-px-per-arcsec')) < p, px);
      await expect.poll(async () => JSON.stringify(await anchors(page))).not.toBe(drawn);
      hd = await handleOf();
    }
    expect(inView(hd.p, 40), `handle of ${hd.m.id} at ${JSON.stringify(hd.p)}`).toBe(true);
    const { masks: before, m, cam } = hd;
    const countsBefore = await maskCounts(page, m.id);
    const numbersBefore = await shownNumbers(page);
    const paCellBefore = await page.textContent(sel(`mask-${m.id}-pa`));
    expect(Number(paCellBefore)).toBeCloseTo(m.pa, 1);
    const lockBefore = await page.textContent(sel(`lock-${m.id}`));

    // Turn by 40 degrees (either way, whichever keeps the pointer in the view), ending 110 px from the centre.
    const r0 = Math.hypot(hd.p.x - m.x, hd.p.y - m.y);
    const dir = (pa: number, r: number) => ({ x: m.x - r * Math.sin((pa * Math.PI) / 180), y: m.y - r * Math.cos((pa * Math.PI) / 180) });
    const turn = inView(dir(m.pa + 40, 110), 30) ? 40 : -40;
    const target = (((m.pa + turn) % 360) + 360) % 360;
    await page.mouse.move(box.x + hd.p.x, box.y + hd.p.y);
    await page.mouse.down();
    for (let i = 1; i <= 16; i++) {
      const q = dir(m.pa + (turn * i) / 16, r0 + ((110 - r0) * i) / 16);
      await page.mouse.move(box.x + q.x, box.y + q.y);
    }
    await page.mouse.up();
    await page.waitForFunction(({ id, pa }) => Math.abs(Number(document.querySelector(`[data-testid="mask-anchors"] li[data-mask-id="${id}"]`)!.getAttribute('data-pa')) - pa) > 5, { id: m.id, pa: m.pa });
    await waitSolved(page);

    const after = await anchors(page);
    const turned = after.find((a) => a.id === m.id)!;
    // 1 px at 110 px is 0.5 degree; the editor rounds the PA to 0.1 degree.
    expect(Math.abs(((turned.pa - target + 540) % 360) - 180)).toBeLessThan(1);
    // Turning is not moving: the centre stays, and no other mask changed.
    expect({ x: turned.x, y: turned.y }).toStrictEqual({ x: m.x, y: m.y });
    expect(after.filter((a) => a.id !== m.id)).toStrictEqual(before.filter((a) => a.id !== m.id));
    expect(await page.textContent(sel(`mask-${m.id}-pa`))).toBe(turned.pa.toFixed(1));
    expect(await page.textContent(sel('pa-readout'))).toContain(`${m.id} · PA ${turned.pa.toFixed(1)}°`);
    const countsAfter = await maskCounts(page, m.id);
    expect(countsAfter).not.toStrictEqual(countsBefore);
    expect(await page.textContent(sel(`lock-${m.id}`))).toBe('locked'); // a mask turned by hand is locked
    expect(await undoTitle(page)).toContain(`rotate mask ${m.id}`);
    expect(cam.px).toBe((await camera(page)).px);

    // Ctrl+Z on the focused sky view: PA, counts and every number exactly as before.
    await page.locator(sel('sky-view')).focus();
    await page.keyboard.press('Control+z');
    await page.waitForFunction(({ id, pa }) => Number(document.querySelector(`[data-testid="mask-anchors"] li[data-mask-id="${id}"]`)!.getAttribute('data-pa')) === pa, { id: m.id, pa: m.pa });
    await waitSolved(page);
    expect(await anchors(page)).toStrictEqual(before);
    expect(await maskCounts(page, m.id)).toStrictEqual(countsBefore);
    expect(await shownNumbers(page)).toStrictEqual(numbersBefore);
    expect(await page.textContent(sel(`mask-${m.id}-pa`))).toBe(paCellBefore);
    expect(await page.textContent(sel(`lock-${m.id}`))).toBe(lockBefore);
    await context.close();
  }, T);

  it('locks and unlocks masks from the Masks panel; the search offers the free ones; undo and redo follow', async () => {
    const { context, page } = await openEditor(harness());
    const ids = (await anchors(page)).map((a) => a.id);
    const numbers = await shownNumbers(page);
    const lockText = (id: string) => page.textContent(sel(`lock-${id}`));
    const state0 = await Promise.all(ids.map(lockText));
    const flip = (t: string | null) => (t === 'free' ? 'locked' : 'free');
    const offer = (free: number) => `Place ${free} free mask${free === 1 ? '' : 's'}`;
    const free0 = state0.filter((t) => t === 'free').length;
    const step = (k: number) => (state0[k] === 'free' ? -1 : 1); // change of the free count when mask k is toggled
    await expect.poll(() => page.textContent(sel('search-start'))).toBe(offer(free0));
    const name = await page.textContent(sel('doc-name'));
    expect(name).not.toContain('•');

    await page.click(sel(`lock-${ids[0]}`));
    await expect.poll(() => lockText(ids[0])).toBe(flip(state0[0]));
    expect(await page.getAttribute(sel(`lock-${ids[0]}`), 'aria-pressed')).toBe(String(flip(state0[0]) === 'locked'));
    expect(await page.textContent(sel('search-start'))).toBe(offer(free0 + step(0)));
    expect(await undoTitle(page)).toContain(`${flip(state0[0]) === 'locked' ? 'lock' : 'unlock'} mask ${ids[0]}`);
    expect(await page.textContent(sel('doc-name'))).toBe(`${name} •`);
    await page.click(sel(`lock-${ids[1]}`));
    await expect.poll(() => page.textContent(sel('search-start'))).toBe(offer(free0 + step(0) + step(1)));
    // Locking or freeing keeps every mask where it is: the solve of the edited plan gives the same numbers.
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers);

    await page.keyboard.press('Control+z');
    await expect.poll(() => lockText(ids[1])).toBe(state0[1]);
    expect(await lockText(ids[0])).toBe(flip(state0[0]));
    await page.keyboard.press('Control+z');
    await expect.poll(() => lockText(ids[0])).toBe(state0[0]);
    expect(await page.getAttribute(sel(`lock-${ids[0]}`), 'aria-pressed')).toBe(String(state0[0] === 'locked'));
    expect(await page.textContent(sel('search-start'))).toBe(offer(free0));
    expect(await page.textContent(sel('doc-name'))).toBe(name);
    expect(await page.isDisabled(sel('undo'))).toBe(true);
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(() => lockText(ids[0])).toBe(flip(state0[0]));
    expect(await lockText(ids[1])).toBe(state0[1]);
    await context.close();
  }, T);

  it('links the target table and the sky view both ways; filters and sorts the table', async () => {
    const { context, page } = await openEditor(harness());
    const box = await skyBox(page);
    const fp = await footprint(page);
    const cam = await camera(page);
    const masks = await anchors(page);
    const targets = await screenTargets(page);
    // The projection here matches the one the view draws: mask centres land on the page's anchors.
    const placed = await page.evaluate(() => {
      const c = (window as unknown as { haloweave: { store: { doc: { plan: { masks: { id: string; raDeg: number; decDeg: number }[] } } }; session: { solution: { result: { galaxy: { raDeg: number; decDeg: number } } } } } }).haloweave;
      return { masks: c.store.doc.plan.masks, galaxy: c.session.solution.result.galaxy };
    });
    for (const m of placed.masks) {
      const p = gnomonic(placed.galaxy.raDeg, placed.galaxy.decDeg, m.raDeg, m.decDeg);
      const a = masks.find((x) => x.id === m.id)!;
      expect(Math.abs(Math.floor(box.width) / 2 - (p.xi - cam.xi) * cam.px - a.x)).toBeLessThan(0.06);
      expect(Math.abs(Math.floor(box.height) / 2 - (p.eta - cam.eta) * cam.px - a.y)).toBeLessThan(0.06);
    }
    const inView = (p: Pt, m: number) => p.x > m && p.y > m + 24 && p.x < box.width - m && p.y < box.height - m;
    const isolated = (t: ScreenTarget, r: number) => targets.every((u) => u === t || Math.hypot(u.x - t.x, u.y - t.y) > r);

    // Sky -> table: click a lone target outside every mask (a click on a mask grabs the mask).
    const lone = targets.find((t) => inView(t, 40) && isolated(t, 16) && clearOfMasks(t, masks, fp, cam.px));
    expect(lone, 'a lone target outside the masks').toBeDefined();
    await page.mouse.click(box.x + lone!.x, box.y + lone!.y);
    await expect.poll(() => selectionCount(page)).toBe(1);
    // The table brings the selected row into view and marks it.
    await expect.poll(async () => (await rowOf(page, lone!.id))?.selected).toBe(true);
    const rowBox = (await page.locator(`[data-testid="target-row"][data-id="${lone!.id}"]`).boundingBox())!;
    const bodyBox = (await page.locator('.tt-body').boundingBox())!;
    expect(rowBox.y).toBeGreaterThanOrEqual(bodyBox.y - 1);
    expect(rowBox.y + rowBox.height).toBeLessThanOrEqual(bodyBox.y + bodyBox.height + 1);
    expect(await whitePixelsNear(page, lone!)).toBeGreaterThan(10);

    // Table -> sky: click another lone on-screen target's row; the sky rings it in white and drops the first ring.
    const other = targets.find((t) => t !== lone && inView(t, 40) && isolated(t, 30) && Math.hypot(t.x - lone!.x, t.y - lone!.y) > 60)!;
    expect(await whitePixelsNear(page, other)).toBe(0);
    await filterTable(page, other.id);
    await page.click(`[data-testid="target-row"][data-id="${other.id}"]`);
    await expect.poll(() => whitePixelsNear(page, other)).toBeGreaterThan(10);
    expect(await selectionCount(page)).toBe(1);
    expect((await rowOf(page, other.id))?.selected).toBe(true);
    expect(await whitePixelsNear(page, lone!)).toBe(0);
    await filterTable(page, '');

    // Shift-drag a box from empty sky: the targets inside join the selection (expected set computed here).
    let boxSel: { p0: Pt; p1: Pt; inside: ScreenTarget[] } | null = null;
    search: for (let y = 60; y < box.height - 60; y += 10) {
      for (let x = 40; x < box.width - 40; x += 10) {
        const p0 = { x, y };
        if (!clearOfMasks(p0, masks, fp, cam.px)) continue;
        for (const [sx, sy] of [[1, 1], [-1, 1], [1, -1], [-1, -1]]) {
          const p1 = { x: x + sx * 90, y: y + sy * 90 };
          if (!inView(p1, 20)) continue;
          const [xa, xb] = [Math.min(p0.x, p1.x), Math.max(p0.x, p1.x)], [ya, yb] = [Math.min(p0.y, p1.y), Math.max(p0.y, p1.y)];
          // No target within 1.5 px of an edge, so rounding cannot decide membership.
          if (targets.some((t) => (Math.abs(t.x - xa) < 1.5 || Math.abs(t.x - xb) < 1.5) && t.y > ya - 2 && t.y < yb + 2)) continue;
          if (targets.some((t) => (Math.abs(t.y - ya) < 1.5 || Math.abs(t.y - yb) < 1.5) && t.x > xa - 2 && t.x < xb + 2)) continue;
          const inside = targets.filter((t) => t.x > xa && t.x < xb && t.y > ya && t.y < yb && t !== other);
          if (inside.length >= 2 && inside.length <= 12) { boxSel = { p0, p1, inside }; break search; }
        }
      }
    }
    expect(boxSel, 'an empty corner for a box selection').not.toBeNull();
    const { p0, p1, inside } = boxSel!;
    await page.keyboard.down('Shift');
    await page.mouse.move(box.x + p0.x, box.y + p0.y);
    await page.mouse.down();
    for (let i = 1; i <= 8; i++) await page.mouse.move(box.x + p0.x + ((p1.x - p0.x) * i) / 8, box.y + p0.y + ((p1.y - p0.y) * i) / 8);
    await page.mouse.up();
    await page.keyboard.up('Shift');
    const expected = [other.id, ...inside.map((t) => t.id)].sort();
    await expect.poll(() => selectionCount(page)).toBe(expected.length);
    // Scroll the table to its last rows, then shorten it with the 'selected' filter and read the rows at once, in the
    // same task: the browser's scroll event for the clamped offset has not come yet, and the rows must show anyway.
    await page.$eval('.tt-body', (el) => { el.scrollTop = el.scrollHeight; });
    await expect.poll(() => page.$eval('.tt-body', (el) => el.querySelector('[data-testid="target-row"]') !== null
      && parseFloat((el.querySelector('[data-testid="target-row"]') as HTMLElement).style.top) > el.clientHeight)).toBe(true);
    const shownAtOnce = await page.evaluate(async () => {
      const s = document.querySelector('[data-testid="target-status-filter"]') as HTMLSelectElement;
      let scrolled = false;
      document.querySelector('.tt-body')!.addEventListener('scroll', () => { scrolled = true; }, { once: true });
      s.value = 'selected';
      s.dispatchEvent(new Event('change', { bubbles: true }));
      for (let k = 0; k < 5; k++) await Promise.resolve(); // React renders a discrete event's update in a microtask
      return { scrolled, ids: [...document.querySelectorAll('[data-testid="target-row"]')].map((r) => r.getAttribute('data-id')!).sort() };
    });
    expect(shownAtOnce).toStrictEqual({ scrolled: false, ids: expected }); // microtasks only: no scroll event in between
    await expect.poll(() => page.textContent(sel('target-count'))).toBe(`${expected.length} of ${targets.length}`);
    const shown = await tableRows(page);
    expect(shown.map((r) => r.id).sort()).toStrictEqual(expected);
    expect(shown.every((r) => r.selected)).toBe(true);
    await page.selectOption(sel('target-status-filter'), 'all');

    // Filter by id text, then sort by magnitude both ways and by id.
    const q = targets[Math.floor(targets.length / 3)].id.slice(0, -1);
    const match = targets.filter((t) => t.id.toLowerCase().includes(q.toLowerCase()));
    expect(match.length).toBeGreaterThan(1);
    await filterTable(page, q);
    await expect.poll(() => page.textContent(sel('target-count'))).toBe(`${match.length} of ${targets.length}`);
    let rows = await tableRows(page);
    expect(rows.map((r) => r.id).sort()).toStrictEqual(match.map((t) => t.id).sort());
    await page.click(sel('sort-mag'));
    await expect.poll(() => page.textContent(sel('sort-mag'))).toContain('▲');
    rows = await tableRows(page);
    const mags = rows.map((r) => r.mag);
    expect(mags).toStrictEqual([...mags].sort((a, b) => a - b));
    expect(mags[0]).toBeLessThan(mags[mags.length - 1]);
    await page.click(sel('sort-mag'));
    await expect.poll(() => page.textContent(sel('sort-mag'))).toContain('▼');
    rows = await tableRows(page);
    expect(rows.map((r) => r.mag)).toStrictEqual([...mags].sort((a, b) => b - a));
    await page.click(sel('sort-id'));
    rows = await tableRows(page);
    expect(rows.map((r) => r.id)).toStrictEqual(match.map((t) => t.id).sort((a, b) => a.localeCompare(b, undefined, { numeric: true })));
    await context.close();
  }, T);

  it('sets weights and forces targets out and in from the table; undo restores every number exactly', async () => {
    const { context, page } = await openEditor(harness());
    const numbers0 = await shownNumbers(page);
    const fp = await footprint(page);
    const cam = await camera(page);
    const masks = await anchors(page);
    const targets = await screenTargets(page);
    const history0 = await undoTitle(page);

    // Force out the highest-weight target on a tracer slit: it loses its slit and shows as excluded.
    await page.selectOption(sel('target-status-filter'), 'slit');
    const onSlit = (await tableRows(page)).find((r) => /^m\S+ \S+$/.test(r.status) && targets.find((t) => t.id === r.id)!.role !== 'alignment')!;
    expect(onSlit).toBeDefined();
    await page.selectOption(sel('target-status-filter'), 'all');
    await filterTable(page, onSlit.id);
    await page.click(`[data-testid="target-row"][data-id="${onSlit.id}"]`);
    await expect.poll(() => selectionCount(page)).toBe(1);
    let before = await undoTitle(page);
    await page.click(sel('force-out'));
    await solvedAfter(page, before);
    await expect.poll(async () => (await rowOf(page, onSlit.id))?.status).toBe('excluded');
    expect((await rowOf(page, onSlit.id))?.weight).toBe('0.00');
    const numbers1 = await shownNumbers(page);
    const outSlits = await page.evaluate((id) => (window as unknown as { haloweave: { session: { solution: { result: { masks: { slits: { objectId: string }[] }[] } } } } })
      .haloweave.session.solution.result.masks.flatMap((m) => m.slits).filter((s) => s.objectId === id).length, onSlit.id);
    expect(outSlits).toBe(0);

    // Force in a target that has no slit and lies well inside a mask, near the mask's centre line (so its lines land
    // on the detector): it gets a slit. Tried on a few such targets, in case one cannot fit.
    const candidates = targets.filter((t) => t.role !== 'alignment' && !t.slit && masks.some((m) => {
      const q = screenToMask(m, cam.px, t);
      return Math.abs(q.x) < 40 && inPolygon(fp, q.x, q.y) && inPolygon(fp, q.x, q.y + 30) && inPolygon(fp, q.x, q.y - 30);
    }));
    expect(candidates.length).toBeGreaterThan(0);
    let forcedIn: string | null = null;
    for (const t of candidates.slice(0, 6)) {
      await filterTable(page, t.id);
      const row = await rowOf(page, t.id);
      if (!row || row.weight === '0.00' || row.status !== '') continue;
      await page.click(`[data-testid="target-row"][data-id="${t.id}"]`);
      before = await undoTitle(page);
      await page.click(sel('force-in'));
      await solvedAfter(page, before);
      const status = (await rowOf(page, t.id))?.status ?? '';
      if (/^m\S+ \S+ \(forced\)$/.test(status)) { forcedIn = t.id; break; }
      expect(status).toBe('forced in'); // forced but fits on no mask: the table says so
      await page.click(sel('undo'));
      await waitSolved(page);
    }
    expect(forcedIn, 'a forced-in target inside a mask gets a slit').not.toBeNull();
    const numbers2 = await shownNumbers(page);

    // A weight for a selection of two (Ctrl+click adds): both cells show it, marked as set by hand.
    await filterTable(page, '');
    await page.selectOption(sel('target-status-filter'), 'noslit');
    const two = (await tableRows(page)).filter((r) => r.weight !== '0.00' && r.id !== forcedIn).slice(0, 2);
    await page.click(`[data-testid="target-row"][data-id="${two[0].id}"]`);
    await page.click(`[data-testid="target-row"][data-id="${two[1].id}"]`, { modifiers: ['Control'] });
    await expect.poll(() => selectionCount(page)).toBe(2);
    await page.fill(sel('weight-input'), '1000');
    before = await undoTitle(page);
    await page.click(sel('weight-apply'));
    await solvedAfter(page, before);
    await page.selectOption(sel('target-status-filter'), 'selected');
    await expect.poll(async () => (await tableRows(page)).map((r) => r.weight)).toStrictEqual(['1000', '1000']);
    expect(await page.locator('[data-testid="target-row"] .num.edited').count()).toBe(2);
    expect(await undoTitle(page)).toContain('weight 1000 for 2 targets');
    expect(await page.inputValue(sel('weight-input'))).toBe('');

    // Undo the three edits with the Undo button: the numbers of each earlier state come back exactly.
    await page.click(sel('undo'));
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers2);
    await page.click(sel('undo'));
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers1);
    await page.click(sel('undo'));
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    expect(await undoTitle(page)).toBe(history0);
    await page.selectOption(sel('target-status-filter'), 'all');
    await filterTable(page, onSlit.id);
    await expect.poll(async () => (await rowOf(page, onSlit.id))?.status).toBe(onSlit.status);
    await filterTable(page, forcedIn!);
    expect((await rowOf(page, forcedIn!))?.status).toBe('');
    await context.close();
  }, T);

  it('edits the galaxy and the goals: numbers change, undo restores them exactly, bad input is refused', async () => {
    const { context, page } = await openEditor(harness());
    const numbers0 = await shownNumbers(page);
    expect(numbers0.counts.starlight).toBeGreaterThan(0);
    const name = await page.textContent(sel('doc-name'));
    const shown0: Record<string, string> = {};
    for (const f of ['galaxy-vsys', 'galaxy-axis-ratio', 'goal-starlight-reach']) shown0[f] = await page.inputValue(sel(f));
    expect(Number(shown0['galaxy-vsys'])).toBeLessThan(5000);

    // No starlight goal: no starlight slits.
    let before = await undoTitle(page);
    await page.fill(sel('goal-starlight-reach'), '0');
    await page.press(sel('goal-starlight-reach'), 'Enter');
    await solvedAfter(page, before);
    const numbers1 = await shownNumbers(page);
    expect(numbers1.counts.starlight).toBe(0);
    expect(numbers1.reach.starlight).toBe(0);

    // vsys 30 000 km/s shifts the calcium triplet (8498-8662 A) by z = 0.1 to 9348-9528 A, past the red end of the
    // spectrum of slits far along the dispersion on this detector (8192 px at 0.33 A/px about 8400 A): fewer tracers fit.
    before = await undoTitle(page);
    await page.fill(sel('galaxy-vsys'), '30000');
    await page.press(sel('galaxy-vsys'), 'Enter');
    await solvedAfter(page, before);
    const numbers2 = await shownNumbers(page);
    expect(numbers2.counts.tracer).toBeLessThan(numbers1.counts.tracer);
    expect(await undoTitle(page)).toContain('set systemic velocity to 30000 km/s');

    await page.locator(sel('sky-view')).focus();
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.inputValue(sel('galaxy-vsys'))).toBe(shown0['galaxy-vsys']);
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers1);
    await page.keyboard.press('Control+z');
    await expect.poll(() => page.inputValue(sel('goal-starlight-reach'))).toBe(shown0['goal-starlight-reach']);
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    expect(await page.isDisabled(sel('undo'))).toBe(true);
    expect(await page.textContent(sel('doc-name'))).toBe(name);

    // Refused input: text, a number out of range, and a blank field. Each is marked bad, Enter keeps it marked and
    // changes nothing, leaving the field shows the value in effect again; no edit is recorded and the numbers stay.
    // (vsys is limited to -1000 .. 30 000 km/s and b/a to 0.01 .. 1 in GalaxyPanel.tsx.)
    for (const [field, text] of [['galaxy-vsys', 'fast'], ['galaxy-vsys', '40000'], ['galaxy-axis-ratio', '1.5'], ['goal-starlight-reach', ''], ['galaxy-vsys', ' ']] as const) {
      const value = shown0[field];
      await page.fill(sel(field), text);
      expect(await page.getAttribute(sel(field), 'aria-invalid'), `${field} = "${text}"`).toBe('true');
      expect(await page.locator(`label.field.bad:has(${sel(field)})`).count()).toBe(1);
      await page.press(sel(field), 'Enter');
      expect(await page.inputValue(sel(field))).toBe(text);
      expect(await page.getAttribute(sel(field), 'aria-invalid')).toBe('true');
      await page.press(sel(field), 'Tab');
      await expect.poll(() => page.inputValue(sel(field))).toBe(value);
      expect(await page.getAttribute(sel(field), 'aria-invalid')).toBe('false');
      expect(await page.isDisabled(sel('undo')), `${field} = "${text}" made an edit`).toBe(true);
    }
    expect(await page.getAttribute(sel('solve-status'), 'data-current')).toBe('yes');
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    await context.close();
  }, T);

  it('runs the pointing search with a moving progress bar; cancel changes nothing; a full run is one undoable step', async () => {
    const { context, page } = await openEditor(harness());
    const ids = (await anchors(page)).map((a) => a.id);
    // Free every mask first (the search keeps locked ones).
    for (const id of ids) if ((await page.textContent(sel(`lock-${id}`))) === 'locked') await page.click(sel(`lock-${id}`));
    // Give the search something to change: move one mask by hand (this locks it), then free it again.
    const box = await skyBox(page);
    // The last mask is drawn on top, so a grab at its centre takes it and no other.
    const a = (await anchors(page)).at(-1)!;
    await dragMask(page, a.id, Math.sign(box.width / 2 - a.x) * 90, Math.sign(box.height / 2 - a.y) * 60);
    await expect.poll(() => page.textContent(sel(`lock-${a.id}`))).toBe('locked');
    await page.click(sel(`lock-${a.id}`));
    await expect.poll(() => page.textContent(sel(`lock-${a.id}`))).toBe('free');
    await waitSolved(page);
    const layout1 = await anchors(page);
    expect(layout1.find((m) => m.id === a.id)).not.toStrictEqual(a);
    const numbers1 = await shownNumbers(page);
    const history1 = await undoTitle(page);
    expect(history1).toContain(`unlock mask ${a.id}`);
    expect(await page.textContent(sel('search-start'))).toBe(`Place ${ids.length} free masks`);

    // Start and cancel at once: the masks stay exactly where they were and no edit is recorded.
    // (Clicked from the page as soon as the button shows: the search may take only a second, and the pointer's
    // scroll-and-settle checks could otherwise outlast it.)
    await page.click(sel('search-start'));
    const cancelledAt = await page.evaluate(() => new Promise<number>((resolve) => {
      const tick = () => {
        const b = document.querySelector('[data-testid="search-cancel"]') as HTMLButtonElement | null;
        if (!b) { requestAnimationFrame(tick); return; }
        const v = (document.querySelector('[data-testid="search-progress"]') as HTMLProgressElement).value;
        b.click();
        resolve(v);
      };
      tick();
    }));
    expect(cancelledAt).toBeLessThan(1);
    await page.waitForSelector(sel('search-start'));
    expect(await page.locator(sel('search-progress')).count()).toBe(0);
    await expect.poll(() => page.textContent(sel('notices'))).toContain('pointing search cancelled');
    expect(await anchors(page)).toStrictEqual(layout1);
    expect(await undoTitle(page)).toBe(history1);
    expect(await shownNumbers(page)).toStrictEqual(numbers1);

    // Start again and watch the bar until the search ends: its value rises through several steps, and the Cancel
    // button stays put (it used to jump by a line whenever the progress message wrapped).
    await page.click(sel('search-start'));
    const run = await page.evaluate(() => new Promise<{ values: number[]; cancelAt: string[] }>((resolve) => {
      const values: number[] = [], cancelAt: string[] = [];
      const tick = () => {
        const p = document.querySelector('[data-testid="search-progress"]') as HTMLProgressElement | null;
        if (!p && values.length) { resolve({ values, cancelAt }); return; }
        if (p) {
          if (values[values.length - 1] !== p.value) values.push(p.value);
          const r = document.querySelector('[data-testid="search-cancel"]')!.getBoundingClientRect();
          const at = `${r.x},${r.y}`;
          if (!cancelAt.includes(at)) cancelAt.push(at);
        }
        requestAnimationFrame(tick);
      };
      tick();
    }));
    const seen = run.values;
    expect(seen.length).toBeGreaterThanOrEqual(3);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThan(seen[i - 1]);
    expect(seen.every((v) => v >= 0 && v <= 1)).toBe(true);
    expect(run.cancelAt).toHaveLength(1);
    await expect.poll(() => undoTitle(page)).toContain('pointing search');
    await waitSolved(page);
    const layout2 = await anchors(page);
    expect(layout2.map((m) => m.id)).toStrictEqual(ids);
    expect(layout2.some((m, i) => Math.hypot(m.x - layout1[i].x, m.y - layout1[i].y) > 1 || m.pa !== layout1[i].pa)).toBe(true);

    // One undo returns to the layout before the search, exactly.
    await page.locator(sel('sky-view')).focus();
    await page.keyboard.press('Control+z');
    await expect.poll(() => undoTitle(page)).toBe(history1);
    await waitSolved(page);
    expect(await anchors(page)).toStrictEqual(layout1);
    expect(await shownNumbers(page)).toStrictEqual(numbers1);
    await context.close();
  }, T);

  it('shows the nights of the semester and an hour-angle window for every mask', async () => {
    const { context, page } = await openEditor(harness());
    const ids = (await anchors(page)).map((a) => a.id);
    const nightsOf = (label: string) => {
      // "2026 Aug–2027 Jan" or "2027 Feb–Jul": the days from the first day of the first month to the last of the last.
      const m = /^(\d{4}) (\w{3})–(?:(\d{4}) )?(\w{3})$/.exec(label);
      expect(m, label).not.toBeNull();
      const mon = (s: string) => ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'].indexOf(s);
      const y0 = Number(m![1]), y1 = m![3] ? Number(m![3]) : y0;
      const from = Date.UTC(y0, mon(m![2]), 1), end = Date.UTC(y1, mon(m![4]) + 1, 1);
      const day = (t: number) => new Date(t).toISOString().slice(0, 10);
      return { count: Math.round((end - from) / 86_400_000), first: day(from), last: day(end - 86_400_000) };
    };
    for (let k = 0; k < 2; k++) {
      const label = (await page.textContent(sel('semester')))!;
      const { count: nights, first, last } = nightsOf(label);
      expect([181, 182, 184]).toContain(nights);
      await page.waitForFunction((n) => document.querySelectorAll('[data-testid="nights-plot"] rect').length === n, nights, { timeout: 60_000 });
      await expect.poll(() => page.textContent(sel('nights-info'))).toContain(`${nights} nights in`);
      const titles = await page.$$eval('[data-testid="nights-plot"] rect title', (ts) => ts.map((t) => t.textContent ?? ''));
      expect(titles[0].startsWith(`${first}:`)).toBe(true);
      expect(titles[titles.length - 1].startsWith(`${last}:`)).toBe(true);
      const hours = titles.map((t) => Number(/: ([\d.]+) h dark/.exec(t)?.[1]));
      expect(hours.every((x) => x >= 0 && x < 14)).toBe(true);
      expect(Math.max(...hours)).toBeGreaterThan(0);
      if (k === 0) {
        await page.click('[aria-label="next semester"]');
        await expect.poll(() => page.textContent(sel('semester'))).not.toBe(label);
      }
    }

    await page.waitForSelector(sel('ha-windows'));
    for (const id of ids) {
      const el = page.locator(sel(`ha-window-${id}`));
      const from = Number(await el.getAttribute('data-from')), to = Number(await el.getAttribute('data-to'));
      expect(await el.getAttribute('data-from'), id).not.toBe('');
      expect(Number.isFinite(from) && Number.isFinite(to)).toBe(true);
      expect(from).toBeGreaterThanOrEqual(-12);
      expect(to).toBeLessThanOrEqual(12);
      expect(from).toBeLessThan(to);
    }
    expect(await page.locator('[data-testid="ha-windows"] [data-testid^="ha-window-"]').count()).toBe(ids.length);
    await context.close();
  }, T);

  it('exports an SVG chart per mask with its footprint, every slit by id, isophotes, N and E, and a true scale bar', async () => {
    const { context, page } = await openEditor(harness());
    const masks = await anchors(page);
    const fp = await footprint(page);
    const reachRe = Number(await page.inputValue(sel('goal-tracer-reach')));
    const dir = mkdtempSync(join(tmpdir(), 'hw-charts-'));
    const files: string[] = [];
    let onDownload: (d: Download) => Promise<void> = async () => {};
    const got = new Promise<void>((resolve) => {
      onDownload = async (d) => {
        const p = join(dir, d.suggestedFilename());
        await d.saveAs(p);
        files.push(p);
        if (files.length === masks.length) resolve();
      };
      page.on('download', onDownload);
    });
    await page.click(sel('export-menu'));
    await page.click(sel('export-charts'));
    await got;
    // Stop collecting: the single-chart download below must not overwrite these files while they are read.
    page.off('download', onDownload);
    expect(files.map((f) => f.split('/').pop()).sort()).toStrictEqual(masks.map((m) => `mask-${m.id}.svg`).sort());

    // preserveOrder keeps attributes apart from child elements: each node is { tag: children, ':@': attributes }.
    const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', preserveOrder: true, parseTagValue: false, trimValues: true });
    interface El { tag: string; attrs: Record<string, string>; text: string; children: El[] }
    const toEl = (node: Record<string, unknown>): El => {
      const tag = Object.keys(node).find((k) => k !== ':@')!;
      const attrs = Object.fromEntries(Object.entries((node[':@'] ?? {}) as Record<string, unknown>).map(([k, v]) => [k, String(v)]));
      const kids = (Array.isArray(node[tag]) ? node[tag] : []) as Record<string, unknown>[];
      const children = kids.filter((k) => !('#text' in k)).map(toEl);
      const text = kids.filter((k) => '#text' in k).map((k) => String(k['#text'])).join('');
      return { tag, attrs, text, children };
    };
    const all = (e: El): El[] => [e, ...e.children.flatMap(all)];
    const cls = (e: El, c: string) => (e.attrs.class ?? '').split(/\s+/).includes(c);
    const points = (e: El) => e.attrs.points.trim().split(/\s+/).map((p) => p.split(',').map(Number) as [number, number]);

    for (const m of masks) {
      const text = readFileSync(join(dir, `mask-${m.id}.svg`), 'utf8');
      expect(XMLValidator.validate(text), m.id).toBe(true);
      const svg = (parser.parse(text) as Record<string, unknown>[]).map(toEl).find((e) => e.tag === 'svg')!;
      const els = all(svg);
      expect(els.find((e) => e.tag === 'text' && e.text.startsWith('Mask '))?.text).toContain(`Mask ${m.id}`);
      expect(text).toContain(`PA ${m.pa.toFixed(2)}° E of N`);

      // Footprint: one polygon with the profile's corners, turned by the mask's PA as in the sky view (North up,
      // East left), at the scale the scale bar states.
      const foot = els.filter((e) => e.tag === 'polygon' && cls(e, 'footprint'));
      expect(foot).toHaveLength(1);
      const corners = points(foot[0]);
      expect(corners).toHaveLength(fp.length);
      const bar = els.find((e) => e.tag === 'g' && cls(e, 'scale-bar'))!;
      expect(bar).toBeDefined();
      const barLine = bar.children.find((e) => e.tag === 'line')!;
      const barArcmin = Number(bar.attrs['data-arcmin']);
      expect(bar.children.find((e) => e.tag === 'text')?.text).toBe(barArcmin >= 1 ? `${barArcmin} arcmin` : `${Math.round(barArcmin * 60)} arcsec`);
      const s = (Number(barLine.attrs.x2) - Number(barLine.attrs.x1)) / (barArcmin * 60); // px per arcsec by the bar
      expect(s).toBeGreaterThan(0);
      const o = { ...m, x: 0, y: 0 };
      for (let i = 1; i < fp.length; i++) {
        const want = maskToScreen(o, s, fp[i][0] - fp[0][0], fp[i][1] - fp[0][1]);
        // Coordinates are written to 0.01 px, so the bar's scale is known to about 1e-4: 0.15 px over the chart.
        expect(Math.abs(corners[i][0] - corners[0][0] - want.x), `${m.id} corner ${i} x`).toBeLessThan(0.15);
        expect(Math.abs(corners[i][1] - corners[0][1] - want.y), `${m.id} corner ${i} y`).toBeLessThan(0.15);
      }

      // One group per slit or box, carrying its id and role; as many of each role as the Masks panel shows; each
      // drawn inside the footprint and labelled with its id.
      const slits = els.filter((e) => e.tag === 'g' && cls(e, 'slit'));
      const counts = await maskCounts(page, m.id);
      for (const r of ROLES) expect(slits.filter((e) => e.attrs['data-role'] === r).length, `${m.id} ${r}`).toBe(counts[r]);
      expect(slits.length).toBe(ROLES.reduce((n, r) => n + counts[r], 0));
      const ids = slits.map((e) => e.attrs['data-slit-id']);
      expect(new Set(ids).size).toBe(ids.length);
      const footPoly = corners.map(([x, y]) => [x, y] as [number, number]);
      for (const e of slits) {
        expect(e.children.find((c) => c.tag === 'text')?.text).toBe(e.attrs['data-slit-id']);
        const line = e.children.find((c) => c.tag === 'line');
        const box = e.children.find((c) => c.tag === 'polygon');
        const centre = line
          ? [(Number(line.attrs.x1) + Number(line.attrs.x2)) / 2, (Number(line.attrs.y1) + Number(line.attrs.y2)) / 2]
          : points(box!).reduce((acc, p) => [acc[0] + p[0] / 4, acc[1] + p[1] / 4], [0, 0]);
        expect(inPolygon(footPoly, centre[0], centre[1]), `${m.id} ${e.attrs['data-slit-id']} inside the footprint`).toBe(true);
      }

      // Galaxy isophotes at 1 .. ceil(goal) Re, each with major axis / minor axis = 1 / (b/a).
      const isophotes = els.filter((e) => e.tag === 'ellipse' && cls(e, 'isophote'));
      expect(isophotes.map((e) => Number(e.attrs['data-re']))).toStrictEqual(Array.from({ length: Math.ceil(reachRe) }, (_, i) => i + 1));
      const q = Number(await page.inputValue(sel('galaxy-axis-ratio')));
      for (const e of isophotes) expect(Number(e.attrs.ry) / Number(e.attrs.rx)).toBeCloseTo(q, 2);

      // North arrow up, East arrow left, each labelled.
      const compass = els.find((e) => e.tag === 'g' && cls(e, 'compass'))!;
      const north = all(compass).find((e) => cls(e, 'arrow-north'))!.children.find((e) => e.tag === 'line')!;
      const east = all(compass).find((e) => cls(e, 'arrow-east'))!.children.find((e) => e.tag === 'line')!;
      expect(north.attrs.x2).toBe(north.attrs.x1);
      expect(Number(north.attrs.y2)).toBeLessThan(Number(north.attrs.y1));
      expect(east.attrs.y2).toBe(east.attrs.y1);
      expect(Number(east.attrs.x2)).toBeLessThan(Number(east.attrs.x1));
      expect(all(compass).find((e) => cls(e, 'label-north'))?.text).toBe('N');
      expect(all(compass).find((e) => cls(e, 'label-east'))?.text).toBe('E');
    }

    // The per-mask button gives the same chart.
    if (!(await page.locator(sel(`export-mask-${masks[0].id}.svg`)).isVisible())) await page.click(sel('export-menu'));
    const [one] = await Promise.all([page.waitForEvent('download'), page.click(sel(`export-mask-${masks[0].id}.svg`))]);
    const onePath = join(dir, `single-${one.suggestedFilename()}`);
    await one.saveAs(onePath);
    expect(readFileSync(onePath, 'utf8')).toBe(readFileSync(join(dir, `mask-${masks[0].id}.svg`), 'utf8'));
    await context.close();
  }, T);

  it('asks before opening another file over unsaved edits: dismissing keeps them, accepting replaces them', async () => {
    const { context, page } = await openEditor(harness());
    const numbers0 = await shownNumbers(page);
    const name0 = (await page.textContent(sel('doc-name')))!;
    const starlight0 = await page.inputValue(sel('goal-starlight-reach'));
    const before = await undoTitle(page);
    await page.fill(sel('goal-starlight-reach'), '0');
    await page.press(sel('goal-starlight-reach'), 'Enter');
    await solvedAfter(page, before);
    const edited = await shownNumbers(page);
    expect(edited.counts.starlight).toBe(0);
    expect(await page.textContent(sel('doc-name'))).toBe(`${name0} •`);

    // Resolves once the page has the answer (the page's open handler then runs on before the next check).
    const answer = (accept: boolean) => new Promise<Dialog>((resolve) => page.once('dialog', async (d) => {
      await (accept ? d.accept() : d.dismiss());
      resolve(d);
    }));
    const keptEdit = async () => {
      expect(await page.inputValue(sel('goal-starlight-reach'))).toBe('0');
      expect(await page.textContent(sel('doc-name'))).toBe(`${name0} •`);
      expect(await undoTitle(page)).toContain('set starlight reach goal to 0 Re');
      await waitSolved(page);
      expect(await shownNumbers(page)).toStrictEqual(edited);
    };

    // The Demo button, dismissed.
    let asked = answer(false);
    await page.click(sel('open-demo'));
    let d = await asked;
    expect(d.type()).toBe('confirm');
    expect(d.message()).toMatch(/not saved/);
    await keptEdit();

    // A plan file (with its catalog) from the Open button, dismissed.
    const demo = demoOnDisk();
    asked = answer(false);
    await page.setInputFiles(sel('open-input'), [demo.planPath, demo.catalogPath]);
    d = await asked;
    expect(d.type()).toBe('confirm');
    await keptEdit();

    // The Demo button, accepted: the demo replaces the edited plan.
    asked = answer(true);
    await page.click(sel('open-demo'));
    await asked;
    await expect.poll(() => page.inputValue(sel('goal-starlight-reach'))).toBe(starlight0);
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    expect(await page.textContent(sel('doc-name'))).toBe(name0);
    expect(await page.isDisabled(sel('undo'))).toBe(true);

    // Nothing unsaved now: opening another plan (the demo plan under another name) asks nothing.
    const dialogs: string[] = [];
    page.on('dialog', (x) => { dialogs.push(x.message()); void x.dismiss(); });
    const dir = mkdtempSync(join(tmpdir(), 'hw-reopen-'));
    writeFileSync(join(dir, 'reopened.plan.json'), readFileSync(demo.planPath));
    await page.setInputFiles(sel('open-input'), [join(dir, 'reopened.plan.json'), demo.catalogPath]);
    await expect.poll(() => page.textContent(sel('doc-name'))).toBe('reopened.plan.json');
    await waitSolved(page);
    expect(dialogs).toStrictEqual([]);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    await context.close();
  }, T);

  it('raises the masks goal: the listed masks keep the yield until the search places the new one; fewer than listed is refused', async () => {
    const { context, page } = await openEditor(harness());
    const ids = (await anchors(page)).map((a) => a.id);
    const numbers0 = await shownNumbers(page);
    expect(await panelTotals(page)).toStrictEqual(numbers0.counts);
    const n = ids.length;
    expect(await page.inputValue(sel('goal-masks'))).toBe(String(n));

    // Fewer masks than the plan lists would make a plan file the command line refuses: the field refuses it.
    await page.fill(sel('goal-masks'), String(n - 1));
    expect(await page.getAttribute(sel('goal-masks'), 'aria-invalid')).toBe('true');
    await page.press(sel('goal-masks'), 'Enter');
    await page.press(sel('goal-masks'), 'Escape');
    expect(await page.inputValue(sel('goal-masks'))).toBe(String(n));
    expect(await page.isDisabled(sel('undo'))).toBe(true);

    // One more: until it is placed, every counted slit is on a mask the editor draws and lists (it used to count the
    // slits of a mask placed unseen by each re-solve).
    const before = await undoTitle(page);
    await page.fill(sel('goal-masks'), String(n + 1));
    await page.press(sel('goal-masks'), 'Enter');
    await solvedAfter(page, before);
    expect((await anchors(page)).map((a) => a.id)).toStrictEqual(ids);
    expect(await page.textContent(sel('masks-unplaced'))).toContain(`1 more mask for the goal of ${n + 1}`);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    expect(await panelTotals(page)).toStrictEqual(numbers0.counts);
    expect(await page.textContent(sel('search-start'))).toBe(`Place ${n + 1} free masks`);

    // The search places all of them as one step; undo takes the new mask away again.
    const layout = await anchors(page);
    await page.click(sel('search-start'));
    await expect.poll(() => undoTitle(page), { timeout: 60_000 }).toContain('pointing search');
    await waitSolved(page);
    const placed = await anchors(page);
    expect(placed).toHaveLength(n + 1);
    expect(await page.locator(sel('masks-unplaced')).count()).toBe(0);
    const numbers1 = await shownNumbers(page);
    expect(await panelTotals(page)).toStrictEqual(numbers1.counts);
    expect(numbers1.counts.alignment).toBeGreaterThan(numbers0.counts.alignment);
    await page.locator(sel('sky-view')).focus();
    await page.keyboard.press('Control+z');
    await expect.poll(() => anchors(page)).toStrictEqual(layout);
    await waitSolved(page);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    await context.close();
  }, T);

  it('places and shows the masks of a plan whose catalog is opened after it', async () => {
    const { context, page } = await openEditor(harness());
    const numbers0 = await shownNumbers(page);
    const ids = (await anchors(page)).map((a) => a.id);
    // The demo plan naming a catalog that is not loaded yet.
    const demo = demoOnDisk();
    const dir = mkdtempSync(join(tmpdir(), 'hw-later-'));
    const plan = JSON.parse(readFileSync(demo.planPath, 'utf8'));
    plan.catalog = 'later.csv';
    writeFileSync(join(dir, 'later.plan.json'), JSON.stringify(plan, null, 2));
    writeFileSync(join(dir, 'later.csv'), readFileSync(demo.catalogPath));
    await page.setInputFiles(sel('open-input'), [join(dir, 'later.plan.json')]);
    await expect.poll(() => page.textContent(sel('doc-name'))).toBe('later.plan.json');
    await expect.poll(() => page.textContent(sel('notices'))).toContain('open the catalog "later.csv"');
    expect(await page.textContent(sel('count-tracer'))).toBe('–');
    expect(await anchors(page)).toHaveLength(0);

    await page.setInputFiles(sel('open-input'), [join(dir, 'later.csv')]);
    await expect.poll(() => anchors(page).then((a) => a.length), { timeout: 60_000 }).toBe(ids.length);
    await waitSolved(page);
    // The same plan and catalog as the demo: the same masks and numbers as when both open together, and every
    // counted slit on a mask that is drawn and listed.
    expect((await anchors(page)).map((a) => a.id)).toStrictEqual(ids);
    expect(await shownNumbers(page)).toStrictEqual(numbers0);
    expect(await panelTotals(page)).toStrictEqual(numbers0.counts);
    await context.close();
  }, T);

  it('with "re-solve while dragging" off, solves a dragged mask only when it is dropped, to the same numbers', async () => {
    const { context, page } = await openEditor(harness());
    const times = () => page.evaluate(() => (window as unknown as { haloweave: { solveTimes: { mode: string }[] } }).haloweave.solveTimes.map((t) => t.mode));
    const start = await anchors(page);
    const id = start[0].id;
    await page.uncheck(sel('live-drag'));
    const n0 = (await times()).length;
    await dragMask(page, id, 70, -40);
    await waitSolved(page);
    const off = await shownNumbers(page);
    const modes = (await times()).slice(n0);
    expect(modes).not.toContain('preview'); // nothing solved during the drag
    expect(modes.length).toBeGreaterThan(0); // the drop was solved
    // The same drag again with the setting on, from the same start (undo): live previews, then the same numbers.
    await page.click(sel('undo'));
    await waitSolved(page);
    expect(await anchors(page)).toStrictEqual(start);
    await page.check(sel('live-drag'));
    const n1 = (await times()).length;
    await dragMask(page, id, 70, -40);
    await waitSolved(page);
    expect((await times()).slice(n1)).toContain('preview');
    expect(await shownNumbers(page)).toStrictEqual(off);
    await context.close();
  }, T);

  it('finishes placing the masks of a newly opened plan when an edit comes first, and keeps a mask moved meanwhile', async () => {
    const { context, page } = await openEditor(harness());
    const demo = demoOnDisk();
    const planText = readFileSync(demo.planPath, 'utf8'), catText = readFileSync(demo.catalogPath, 'utf8');
    const plan = JSON.parse(planText);
    const nMasks = plan.goals.masks as number;
    type Pose = { id: string; raDeg?: number; decDeg?: number; paDeg?: number; locked?: boolean };
    type C = {
      store: { doc: { plan: { masks?: Pose[]; targetOverrides?: Record<string, unknown> } }; canUndo: boolean };
      previewMask(p: object): void; commitMask(p: object, how: string): void;
      openPlanText(p: object, c: object, o: object): boolean; run(make: (d: unknown) => object): void;
    };
    const docMasks = () => page.evaluate(() => (window as unknown as { haloweave: C }).haloweave.store.doc.plan.masks ?? []);
    const placedCount = (ms: Pose[]) => ms.filter((m) => m.raDeg !== undefined && m.decDeg !== undefined && m.paDeg !== undefined).length;

    // 1. The worker is busy with a drag preview when the plan opens, so its placing solve waits in the single pending
    //    slot; an edit made at once (a weight) takes that slot before it is sent. The masks must still be placed.
    const firstId = String(catText.split('\n')[1].split(',')[0]);
    await page.evaluate(({ planText, catText, firstId }) => {
      const c = (window as unknown as { haloweave: C }).haloweave;
      const m = c.store.doc.plan.masks![0];
      c.previewMask({ id: m.id, raDeg: m.raDeg! + 0.002, decDeg: m.decDeg, paDeg: m.paDeg });
      c.openPlanText({ name: 'again.plan.json', content: planText }, { name: 'halo-demo.catalog.csv', content: catText }, { ask: false });
      c.run(() => ({
        label: 'weight',
        do: (d: { plan: object }) => ({ ...d, plan: { ...d.plan, targetOverrides: { [firstId]: { weight: 3 } } } }),
        undo: (d: { plan: { targetOverrides?: unknown } }) => ({ ...d, plan: { ...d.plan, targetOverrides: undefined } }),
      }));
    }, { planText, catText, firstId });
    await expect.poll(async () => placedCount(await docMasks()), { timeout: 60_000 }).toBe(nMasks);
    await expect.poll(() => anchors(page).then((a) => a.length)).toBe(nMasks);
    await waitSolved(page);
    expect(await page.evaluate(() => (window as unknown as { haloweave: C }).haloweave.store.doc.plan.targetOverrides)).toStrictEqual({ [firstId]: { weight: 3 } });
    const placed = await docMasks();

    // 2. A plan with its first mask placed but free and the others to place: the user moves that mask while the
    //    placing solve runs (the search would move it too). The move stands; the other masks are placed.
    const partial = { ...plan, masks: placed.map((m, i) => (i === 0 ? { id: m.id, raDeg: m.raDeg, decDeg: m.decDeg, paDeg: m.paDeg } : { id: m.id })) };
    const target = { id: placed[0].id, raDeg: placed[0].raDeg! + 0.01, decDeg: placed[0].decDeg! - 0.005, paDeg: placed[0].paDeg! };
    await page.evaluate(({ text, catText, target }) => {
      const c = (window as unknown as { haloweave: C }).haloweave;
      c.openPlanText({ name: 'partial.plan.json', content: text }, { name: 'halo-demo.catalog.csv', content: catText }, { ask: false });
      c.commitMask(target, 'move');
    }, { text: JSON.stringify(partial), catText, target });
    await expect.poll(async () => placedCount(await docMasks()), { timeout: 60_000 }).toBe(nMasks);
    await waitSolved(page);
    const after = await docMasks();
    expect(after[0]).toMatchObject({ id: target.id, raDeg: target.raDeg, decDeg: target.decDeg, paDeg: target.paDeg, locked: true });
    expect((await anchors(page)).map((a) => a.id)).toStrictEqual(after.map((m) => m.id));

    // 3. The same during a pointing search: a free mask turned while the search runs keeps the user's PA.
    const free = after.find((m) => !m.locked)!;
    const turned = { id: free.id, raDeg: free.raDeg, decDeg: free.decDeg, paDeg: (free.paDeg! + 40) % 360 };
    await page.evaluate((turned) => {
      const c = (window as unknown as { haloweave: C & { startSearch(): void } }).haloweave;
      c.startSearch();
      c.commitMask(turned, 'rotate');
    }, turned);
    await expect.poll(() => undoTitle(page), { timeout: 60_000 }).toContain('pointing search');
    const searched = (await docMasks()).find((m) => m.id === free.id)!;
    expect(searched).toMatchObject({ raDeg: turned.raDeg, decDeg: turned.decDeg, paDeg: turned.paDeg, locked: true });
    await context.close();
  }, T);

  it('pans with the arrow keys and zooms with + and - on the focused sky view; 0 fits the view again', async () => {
    const { context, page } = await openEditor(harness());
    const box = await skyBox(page);
    const cam0 = await camera(page);
    const a0 = await anchors(page);
    const view = page.locator(sel('sky-view'));
    await view.focus();
    const next = async (key: string, check: (c: Cam) => boolean) => {
      const before = await camera(page);
      await page.keyboard.press(key);
      await expect.poll(async () => { const c = await camera(page); return c.xi !== before.xi || c.eta !== before.eta || c.px !== before.px; }).toBe(true);
      const c = await camera(page);
      expect(check(c), `${key}: ${JSON.stringify(before)} -> ${JSON.stringify(c)}`).toBe(true);
      return c;
    };
    const near = (a: number, b: number, tol = 1e-9) => Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));

    // Arrows: 60 px a press (East is left: ArrowLeft brings the sky East of the centre into view, xi grows).
    let c = await next('ArrowLeft', (x) => near(x.xi, cam0.xi + 60 / cam0.px) && x.eta === cam0.eta && x.px === cam0.px);
    // Every mask follows on the screen: 60 px to the right.
    await expect.poll(async () => (await anchors(page))[0].x).not.toBe(a0[0].x);
    for (const [i, m] of (await anchors(page)).entries()) {
      expect(Math.abs(m.x - (a0[i].x + 60))).toBeLessThan(0.11);
      expect(Math.abs(m.y - a0[i].y)).toBeLessThan(0.11);
    }
    c = await next('ArrowUp', (x) => near(x.eta, cam0.eta + 60 / cam0.px) && near(x.xi, c.xi));
    c = await next('ArrowRight', (x) => near(x.xi, cam0.xi) && near(x.eta, c.eta));
    c = await next('ArrowDown', (x) => near(x.eta, cam0.eta, 1e-6) && near(x.xi, c.xi));
    c = await next('Shift+ArrowDown', (x) => near(x.eta, c.eta - 200 / c.px));

    // + and - zoom by 1.25 and 0.8 about the view centre (the sky point there stays).
    const z = await next('+', (x) => near(x.px, c.px * 1.25) && near(x.xi, c.xi) && near(x.eta, c.eta));
    const before = await anchors(page);
    const cx = Math.floor(box.width) / 2, cy = Math.floor(box.height) / 2;
    // The mask farthest from the view centre moves most under a zoom about that centre (one on it does not move).
    const far = before.reduce((k, m, i) => (Math.abs(m.x - cx) > Math.abs(before[k].x - cx) ? i : k), 0);
    const zz = await next('+', (x) => near(x.px, z.px * 1.25));
    await expect.poll(async () => (await anchors(page))[far].x).not.toBe(before[far].x);
    for (const [i, m] of (await anchors(page)).entries()) {
      expect(Math.abs(m.x - (cx + (before[i].x - cx) * 1.25))).toBeLessThan(0.2);
      expect(Math.abs(m.y - (cy + (before[i].y - cy) * 1.25))).toBeLessThan(0.2);
    }
    await next('-', (x) => near(x.px, zz.px * 0.8));
    await next('-', (x) => near(x.px, zz.px * 0.64));
    await next('0', (x) => x.xi === cam0.xi && x.eta === cam0.eta && x.px === cam0.px);
    await expect.poll(() => anchors(page)).toStrictEqual(a0);
    // Keys typed in a field do not move the view.
    await page.focus(sel('target-filter'));
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('-');
    expect(await camera(page)).toStrictEqual(cam0);
    await context.close();
  }, T);

  it('changes the brightness of a FITS backdrop with its stretch, black point and opacity controls', async () => {
    const { context, page } = await openEditor(harness());
    const galaxy = await page.evaluate(() => (window as unknown as { haloweave: { session: { solution: { result: { galaxy: { raDeg: number; decDeg: number } } } } } }).haloweave.session.solution.result.galaxy);
    const dir = mkdtempSync(join(tmpdir(), 'hw-fits-scale-'));
    // A ramp along FITS x (10 per pixel, 10..1000) with 2 arcsec pixels and East to the left (CD1_1 < 0), centred on the galaxy.
    const wcs = { CTYPE1: 'RA---TAN', CTYPE2: 'DEC--TAN', CRVAL1: galaxy.raDeg, CRVAL2: galaxy.decDeg, CRPIX1: 50.5, CRPIX2: 40.5, CD1_1: -2 / 3600, CD1_2: 0, CD2_1: 0, CD2_2: 2 / 3600 };
    writeFileSync(join(dir, 'ramp.fits'), fitsImageBytes(wcs, 100, 80, (x) => 10 * x));
    await page.setInputFiles(sel('open-input'), [join(dir, 'ramp.fits')]);
    await page.waitForSelector(sel('backdrop-canvas'));
    await page.waitForSelector(sel('backdrop-stretch'));
    const box = await skyBox(page);
    const cx = Math.round(box.width / 2), cy = Math.round(box.height / 2);
    // Mean RGBA of a 5 x 5 patch of the backdrop canvas at (x, y).
    const patch = (dx: number) => page.evaluate(({ x, y }) => {
      const c = document.querySelector('[data-testid="backdrop-canvas"]') as HTMLCanvasElement;
      const d = c.getContext('2d')!.getImageData(x - 2, y - 2, 5, 5).data;
      const m = [0, 0, 0, 0];
      for (let i = 0; i < d.length; i += 4) for (let k = 0; k < 4; k++) m[k] += d[i + k] / 25;
      return m;
    }, { x: cx + dx, y: cy });
    const grey = async (dx = 0) => (await patch(dx))[0];
    const settle = async (prev: number, dx = 0) => {
      await expect.poll(() => grey(dx)).not.toBe(prev);
      return grey(dx);
    };

    // West (higher FITS x, brighter) is to the right on the screen.
    const asinh = await grey();
    expect(await grey(40)).toBeGreaterThan(await grey(-40));
    // The centre holds 505, normalised between the 5 % and 99.5 % points of the ramp (59.5 and 995):
    // t = 0.476; grey 255 * stretch(t): linear 121, sqrt 176, asinh(10 t)/asinh(10) 193, log10(1 + 999 t)/3 228.
    expect(Math.abs(asinh - 193)).toBeLessThan(10);
    await page.selectOption(sel('backdrop-stretch'), 'linear');
    const linear = await settle(asinh);
    expect(Math.abs(linear - 121)).toBeLessThan(10);
    await page.selectOption(sel('backdrop-stretch'), 'sqrt');
    const sqrt = await settle(linear);
    expect(Math.abs(sqrt - 176)).toBeLessThan(10);
    await page.selectOption(sel('backdrop-stretch'), 'log');
    const log = await settle(sqrt);
    expect(Math.abs(log - 228)).toBeLessThan(10);
    expect(linear < sqrt && sqrt < asinh && asinh < log).toBe(true);

    // Black point to 50 % (linear): the median (the centre, 505-510) and everything East of it turn black; the West
    // side stays lit (40 px West holds about 785: t = (785 - 510) / (995 - 510) = 0.57, grey 145).
    await page.selectOption(sel('backdrop-stretch'), 'linear');
    expect(await settle(log)).toBe(linear);
    const left = await grey(-40);
    expect(left).toBeGreaterThan(30);
    await page.focus(sel('backdrop-low'));
    await page.keyboard.press('End');
    await expect.poll(() => page.textContent(sel('backdrop-controls'))).toContain('black at 50.0 %');
    await settle(left, -40);
    expect(await grey(-40)).toBeLessThan(5);
    expect(await grey()).toBeLessThan(12);
    expect(Math.abs((await grey(40)) - 145)).toBeLessThan(12);

    // Opacity: the canvas alpha follows the slider (0.85 -> 0.1 of 255).
    expect(Math.abs((await patch(40))[3] - 0.85 * 255)).toBeLessThan(2);
    await page.focus(sel('backdrop-opacity'));
    await page.keyboard.press('Home');
    await expect.poll(async () => (await patch(40))[3]).toBeLessThan(30);
    expect(Math.abs((await patch(40))[3] - 0.1 * 255)).toBeLessThan(2);
    await context.close();
  }, T);
});
