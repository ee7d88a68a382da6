// The editor on a plan with several spectrographs (examples/mixed: two masks on ridge10-narrow, two on broad65-wide),
// in Debian's chromium through playwright-core: each mask drawn with its own instrument's footprint (the Konva outline
// against the profile file and the contract's mask frame), a mask given another instrument (footprint and slits
// change, undo restores exactly), the per-instrument yield equal to `haloweave plan`'s, the nights panel at each
// site equal to `haloweave sky`, and the exported folder (each row with its instrument, one slit list per instrument)
// accepted by `haloweave check` and solved again by the command line to the same files after a live drag.
import { beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Download, Page } from 'playwright-core';
import { anchors, dragMask, expectFolderAgreesWithCli, harnessForFile, maskCounts, numbersOfOutput, openEditor, ROOT, runCli, shownNumbers, waitSolved, type Anchor } from './harness';
import { maskToScreen } from './maskFrame';

const harness = harnessForFile();
const T = 240_000;
const EXAMPLE = join(ROOT, 'examples/mixed');
const PLAN = join(EXAMPLE, 'two-telescopes.plan.json');
const CATALOG = join(EXAMPLE, 'two-telescopes.catalog.csv');
const profileFile = (id: string) => JSON.parse(readFileSync(join(ROOT, 'instrument-profiles', `${id}.json`), 'utf8')) as { footprint: [number, number][]; site: { latDeg: number } };

/** The CLI's solve of the example: its output folder and printed summary. */
let cliOut: string;
let cliSummary: string;
beforeAll(() => {
  cliOut = mkdtempSync(join(tmpdir(), 'hw-mixed-cli-'));
  const r = runCli(['plan', PLAN, '--out', cliOut]);
  if (r.status !== 0) throw new Error(r.stderr);
  cliSummary = r.stdout + r.stderr;
}, T);

/** A fresh editor with the mixed example opened (plan and catalog) and solved. */
async function openMixed(): Promise<{ context: Awaited<ReturnType<typeof openEditor>>['context']; page: Page }> {
  const opened = await openEditor(harness());
  opened.page.on('dialog', (d) => void d.accept());
  await opened.page.setInputFiles('[data-testid="open-input"]', [PLAN, CATALOG]);
  await expect.poll(() => opened.page.textContent('[data-testid="doc-name"]'), { timeout: 30_000 }).toContain('two-telescopes');
  await opened.page.waitForSelector('[data-testid="instrument-yield"]', { timeout: 120_000 });
  await waitSolved(opened.page, 120_000);
  return opened;
}

/** Each mask's instrument as the solved result gives it. */
async function maskInstruments(page: Page): Promise<Record<string, string>> {
  return page.evaluate(() => {
    const c = (window as unknown as { haloweave: { session: { solution: { result: { masks: { mask: { id: string; instrument?: string } }[] } } } } }).haloweave;
    return Object.fromEntries(c.session.solution.result.masks.map((m) => [m.mask.id, m.mask.instrument ?? '']));
  });
}

/** The drawn outline of mask `id`: its Konva polygon (mask frame, arcsec) and its corners on the screen (px in the sky view). */
async function drawnOutline(page: Page, id: string): Promise<{ points: number[]; screen: { x: number; y: number }[] }> {
  return page.evaluate((mid) => {
    type Node = { id(): string; points(): number[]; getAbsoluteTransform(): { point(p: { x: number; y: number }): { x: number; y: number } } };
    const K = (window as unknown as { Konva: { stages: { find(f: (n: Node) => boolean): Node[]; container(): HTMLElement }[] } }).Konva;
    const stage = K.stages.find((s) => s.find((n) => n.id() === `body:${mid}`).length > 0)!;
    const body = stage.find((n) => n.id() === `body:${mid}`)[0];
    const view = document.querySelector('[data-testid="sky-view"]')!.getBoundingClientRect();
    const box = stage.container().getBoundingClientRect();
    const pts = body.points();
    const screen = [];
    for (let i = 0; i < pts.length; i += 2) {
      const p = body.getAbsoluteTransform().point({ x: pts[i], y: pts[i + 1] });
      screen.push({ x: p.x + box.left - view.left, y: p.y + box.top - view.top });
    }
    return { points: pts, screen };
  }, id);
}

const pxPerArcsec = (page: Page) => page.evaluate(() => Number((document.querySelector('[data-testid="camera"]') as HTMLElement).dataset.pxPerArcsec));

/** Every mask's drawn outline is its own profile's footprint, placed by the contract's mask frame. */
async function expectOwnFootprints(page: Page): Promise<void> {
  const own = await maskInstruments(page);
  const s = await pxPerArcsec(page);
  for (const a of await anchors(page)) {
    const fp = profileFile(own[a.id]).footprint;
    const drawn = await drawnOutline(page, a.id);
    expect(drawn.points, `${a.id} on ${own[a.id]}`).toStrictEqual(fp.flat());
    // Each corner where the contract's mask frame puts it (y = xi sin PA + eta cos PA, North up, East left), 0.5 px.
    fp.forEach(([x, y], k) => {
      const want = maskToScreen(a as Anchor, s, x, y);
      expect(Math.hypot(drawn.screen[k].x - want.x, drawn.screen[k].y - want.y), `${a.id} corner ${k}`).toBeLessThan(0.5);
    });
  }
}

/** Click an export button and keep every file it downloads (one or several) in `dir`. */
async function exportFiles(page: Page, testId: string, dir: string, count = 1): Promise<string[]> {
  if (!(await page.locator(`[data-testid="${testId}"]`).isVisible())) await page.click('[data-testid="export-menu"]');
  const got: Download[] = [];
  const onDownload = (d: Download) => void got.push(d);
  page.on('download', onDownload);
  await page.click(`[data-testid="${testId}"]`);
  await expect.poll(() => got.length, { timeout: 30_000 }).toBe(count);
  page.off('download', onDownload);
  const paths: string[] = [];
  for (const d of got) {
    const path = join(dir, d.suggestedFilename());
    await d.saveAs(path);
    paths.push(path);
  }
  return paths;
}

describe('the editor on a plan with two spectrographs', () => {
  it('draws each mask with its own footprint, shows the CLI\'s numbers and yield per instrument, and each site\'s nights', async () => {
    const { context, page } = await openMixed();
    const own = await maskInstruments(page);
    expect(Object.values(own).sort()).toStrictEqual(['broad65-wide', 'broad65-wide', 'ridge10-narrow', 'ridge10-narrow']);
    // The two footprints differ (a 300" x 1000" strip and a 942" wide field), so drawing the wrong one would fail here.
    expect(profileFile('ridge10-narrow').footprint.flat()).not.toStrictEqual(profileFile('broad65-wide').footprint.flat());
    await expectOwnFootprints(page);
    await page.screenshot({ path: '/tmp/hw-mixed.png' });

    // The same slits and reach as `haloweave plan` (core math is engine-independent: src/core/numeric/portableMath.ts).
    expect(await shownNumbers(page)).toStrictEqual(numbersOfOutput(readFileSync(join(cliOut, 'slits.csv'), 'utf8'), readFileSync(join(cliOut, 'coverage.json'), 'utf8')));
    const cliMasks = readFileSync(join(cliOut, 'masks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    expect(own).toStrictEqual(Object.fromEntries(cliMasks.map((r) => [r[0], r[1]])));

    // The yield table: one row per instrument with the masks, tracer slits, weight and starlight slits the CLI prints.
    const lines = cliSummary.split('\n').filter((l) => /^ {2}\S+ \(masks .*\): \d+ tracer slits/.test(l));
    expect(lines).toHaveLength(2);
    for (const line of lines) {
      const m = /^ {2}(\S+) \(masks ([^ ]+(?:, [^ ]+)*) at .*\): (\d+) tracer slits \(weight ([\d.]+).*\), (\d+) starlight slits/.exec(line)!;
      expect(m, line).not.toBeNull();
      const cells = await page.$$eval(`[data-testid="instrument-yield-${m[1]}"] td`, (tds) => tds.map((td) => td.textContent ?? ''));
      expect(cells[0]).toBe(m[1]);
      expect(cells[1]).toBe(m[2]);
      expect(Number(cells[2])).toBe(Number(m[3]));
      // The panel shows one decimal, the summary two: equal within the rounding of both.
      expect(Math.abs(Number(cells[3]) - Number(m[4]))).toBeLessThanOrEqual(0.051);
      expect(Number(cells[4])).toBe(Number(m[5]));
    }

    // The nights panel: one choice per site; each shows the dark hours `haloweave sky` gives at that site.
    const options = await page.$$eval('[data-testid="nights-site"] option', (os) => os.map((o) => o.textContent ?? ''));
    expect(options).toStrictEqual([`ridge10-narrow (lat ${profileFile('ridge10-narrow').site.latDeg.toFixed(1)}°)`, `broad65-wide (lat ${profileFile('broad65-wide').site.latDeg.toFixed(1)}°)`]);
    const darkTitles = () => page.$$eval('[data-testid="nights-plot"] rect title', (ts) => ts.map((t) => t.textContent ?? ''));
    await expect.poll(async () => (await darkTitles()).length, { timeout: 60_000 }).toBeGreaterThan(100);
    const shown: Record<string, string[]> = {};
    for (const [k, id] of ['ridge10-narrow', 'broad65-wide'].entries()) {
      if (k > 0) {
        const before = (await darkTitles()).join('|');
        await page.selectOption('[data-testid="nights-site"]', String(k));
        await expect.poll(async () => (await darkTitles()).join('|'), { timeout: 60_000 }).not.toBe(before);
      }
      shown[id] = await darkTitles();
    }
    // The night with the most dark hours at the first site: the sky command's darkHours at each site, to the panel's 0.1 h.
    const hoursOf = (t: string) => Number(/: ([\d.]+) h dark/.exec(t)![1]);
    const hours0 = shown['ridge10-narrow'].map(hoursOf);
    const i = hours0.indexOf(Math.max(...hours0));
    const date = shown['ridge10-narrow'][i].slice(0, 10);
    const sky = runCli(['sky', PLAN, '--from', date, '--to', date, '--json']);
    expect(sky.status, sky.stderr).toBe(0);
    const rows = JSON.parse(sky.stdout) as { instrument: string; date: string; darkHours: number }[];
    for (const id of ['ridge10-narrow', 'broad65-wide']) {
      const cli = rows.find((r) => r.instrument === id && r.date === date)!;
      const panel = hoursOf(shown[id][i]);
      // Both from src/core/observe/night.ts; the panel samples every 10 minutes and prints 0.1 h.
      expect(Math.abs(panel - cli.darkHours), `${id} ${date}`).toBeLessThanOrEqual(0.2);
    }
    expect(shown['ridge10-narrow']).not.toStrictEqual(shown['broad65-wide']);
    await context.close();
  }, T);

  it('gives a mask another instrument: its footprint and slits change, and undo restores everything exactly', async () => {
    const { context, page } = await openMixed();
    const own = await maskInstruments(page);
    const id = Object.keys(own).find((k) => own[k] === 'ridge10-narrow')!;
    const before = { numbers: await shownNumbers(page), counts: await maskCounts(page, id), anchors: await anchors(page), outline: await drawnOutline(page, id) };
    const docBefore = await page.evaluate(() => JSON.stringify((window as unknown as { haloweave: { store: { doc: { plan: unknown } } } }).haloweave.store.doc.plan));

    await page.selectOption(`[data-testid="mask-${id}-instrument"]`, 'broad65-wide');
    await waitSolved(page);
    await expect.poll(async () => (await maskInstruments(page))[id]).toBe('broad65-wide');
    const plan = await page.evaluate(() => (window as unknown as { haloweave: { store: { doc: { plan: { instruments: { profile: string; masks: number }[] } } } } }).haloweave.store.doc.plan.instruments);
    expect(plan).toStrictEqual([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 3 }]);
    expect((await drawnOutline(page, id)).points).toStrictEqual(profileFile('broad65-wide').footprint.flat());
    await expectOwnFootprints(page);
    const after = await maskCounts(page, id);
    expect(after).not.toStrictEqual(before.counts);
    // The yield table follows: three masks on the wide field.
    expect((await page.$$eval('[data-testid="instrument-yield-broad65-wide"] td', (tds) => tds.map((td) => td.textContent ?? '')))[1].split(', ')).toHaveLength(3);

    await page.locator('[data-testid="sky-view"]').focus();
    await page.keyboard.press('Control+z');
    await waitSolved(page);
    await expect.poll(async () => (await maskInstruments(page))[id]).toBe('ridge10-narrow');
    expect(await page.evaluate(() => JSON.stringify((window as unknown as { haloweave: { store: { doc: { plan: unknown } } } }).haloweave.store.doc.plan))).toBe(docBefore);
    expect((await drawnOutline(page, id)).points).toStrictEqual(before.outline.points);
    expect(await anchors(page)).toStrictEqual(before.anchors);
    expect(await maskCounts(page, id)).toStrictEqual(before.counts);
    expect(await shownNumbers(page)).toStrictEqual(before.numbers);
    await context.close();
  }, T);

  it('after a live drag, exports a folder `haloweave check` accepts, with each row\'s instrument and one list per instrument', async () => {
    const { context, page } = await openMixed();
    const own = await maskInstruments(page);
    const wideId = Object.keys(own).find((k) => own[k] === 'broad65-wide')!;
    // The drag goes through the live one-mask re-solve with per-mask contexts (worker/liveSolve.ts); count the previews.
    const previews = await page.evaluate(() => {
      const w = window as unknown as { __previews: number; haloweave: { session: { solution: { result: { extra: { preview?: boolean } } } } } };
      w.__previews = 0;
      const tick = () => { if (w.haloweave.session.solution?.result.extra.preview) w.__previews++; requestAnimationFrame(tick); };
      requestAnimationFrame(tick);
      return 0;
    });
    expect(previews).toBe(0);
    const beforeDrag = await maskCounts(page, wideId);
    await dragMask(page, wideId, 60, -45);
    await waitSolved(page);
    expect(await page.evaluate(() => (window as unknown as { __previews: number }).__previews)).toBeGreaterThan(0);
    expect(await maskInstruments(page)).toStrictEqual(own);
    await expectOwnFootprints(page);
    expect(await maskCounts(page, wideId)).not.toStrictEqual(beforeDrag);
    const shown = await shownNumbers(page);

    const dir = mkdtempSync(join(tmpdir(), 'hw-mixed-export-'));
    for (const f of ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv', 'manifest.json']) await exportFiles(page, `export-${f}`, dir);
    copyFileSync(CATALOG, join(dir, 'two-telescopes.catalog.csv'));
    const masksCsv = readFileSync(join(dir, 'masks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    expect(Object.fromEntries(masksCsv.map((r) => [r[0], r[1]]))).toStrictEqual(own);
    // Checked, and solved again by the command line to the very same files (the editor's kept numbers are the
    // pipeline's after the drag, and Chromium and node compute them to the bit).
    const again = expectFolderAgreesWithCli(dir, shown);

    // The slit list with the instrument on every row, and one list per instrument named as `export --per-instrument` does.
    const [ecsv] = await exportFiles(page, 'export-slits.ecsv', dir);
    const body = readFileSync(ecsv, 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
    // ECSV with "," as its delimiter (the ids of the example have no commas or quotes).
    const head = body[0].split(',');
    const col = head.indexOf('instrument'), maskCol = head.indexOf('mask_id');
    expect(col).toBeGreaterThanOrEqual(0);
    expect(body.length - 1).toBe(readFileSync(join(dir, 'slits.csv'), 'utf8').trim().split('\n').length - 1);
    for (const row of body.slice(1)) { const cells = row.split(','); expect(cells[col]).toBe(own[cells[maskCol]]); }
    const perInstrument = await exportFiles(page, 'export-per-instrument-slits.vot', dir, 2);
    expect(perInstrument.map((p) => p.split('/').pop()).sort()).toStrictEqual(['slits-broad65-wide.vot', 'slits-ridge10-narrow.vot']);
    const cliPer = runCli(['export', dir, '--format', 'votable', '--out', join(again, 'slits.vot'), '--per-instrument']);
    expect(cliPer.status, cliPer.stderr).toBe(0);
    for (const p of perInstrument) {
      const name = p.split('/').pop()!;
      const text = readFileSync(p, 'utf8');
      const id = name.replace(/^slits-/, '').replace(/\.vot$/, '');
      expect(text).toContain(`value="${id}"`);
      // Row for row the command line's per-instrument list of the same folder.
      const rows = (t: string) => t.match(/<TR>[\s\S]*?<\/TR>/g) ?? [];
      expect(rows(text).length).toBeGreaterThan(0);
      expect(rows(text)).toStrictEqual(rows(readFileSync(join(again, `slits-${id}.vot`), 'utf8')));
    }
    await context.close();
  }, T);
});
