/**
 * Browser test harness: Vite's dev server started in-process on a free port, and Debian's chromium
 * driven by playwright-core in a fresh context (nothing downloads a browser).
 */
import { afterAll, beforeAll, expect } from 'vitest';
import { createServer, type ViteDevServer } from 'vite';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { fileURLToPath } from 'node:url';
import { dirname, resolve } from 'node:path';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const CHROMIUM = '/usr/bin/chromium';
export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

export interface Harness {
  server: ViteDevServer;
  url: string;
  browser: Browser;
  close(): Promise<void>;
}

/** Start Vite on a free port and launch chromium. */
export async function startHarness(): Promise<Harness> {
  const server = await createServer({
    root: ROOT,
    configFile: resolve(ROOT, 'vite.config.ts'),
    logLevel: 'error',
    server: { port: 0, strictPort: false, host: '127.0.0.1', open: false, hmr: false, watch: null },
    optimizeDeps: { noDiscovery: false },
  });
  await server.listen();
  const addr = server.httpServer!.address();
  const port = typeof addr === 'object' && addr ? addr.port : 5173;
  const url = `http://127.0.0.1:${port}/`;
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
  return {
    server, url, browser,
    async close() {
      await browser.close().catch(() => {});
      await server.close().catch(() => {});
    },
  };
}

/**
 * One harness for the calling test file: started before its tests, closed after them. Returns a getter, since the
 * harness exists only once the file's tests run.
 */
export function harnessForFile(): () => Harness {
  let h: Harness | undefined;
  beforeAll(async () => { h = await startHarness(); }, 180_000);
  afterAll(async () => { await h?.close(); });
  return () => h!;
}

/** A fresh context (its own storage) and page at the editor, waiting until the demo is solved. */
export async function openEditor(h: Harness, opts: { context?: BrowserContext; width?: number; height?: number } = {}): Promise<{ context: BrowserContext; page: Page }> {
  const context = opts.context ?? (await h.browser.newContext({ viewport: { width: opts.width ?? 1500, height: opts.height ?? 950 }, acceptDownloads: true }));
  // tsx (esbuild keepNames) wraps functions handed to page.evaluate with a __name helper: give the page one.
  await context.addInitScript({ content: 'window.__name = (f) => f;' });
  const page = await context.newPage();
  page.on('pageerror', (e) => console.error('[page error]', e.message));
  await page.goto(h.url);
  await waitSolved(page);
  return { context, page };
}

/** Wait until the shown solution is the exact solve of the current document (no preview, nothing pending). */
export async function waitSolved(page: Page, timeoutMs = 90_000): Promise<void> {
  await page.waitForFunction(() => {
    const el = document.querySelector('[data-testid="count-tracer"]');
    const current = document.querySelector('[data-testid="solve-status"]')?.getAttribute('data-current');
    return el && /^\d+$/.test(el.textContent ?? '') && current === 'yes';
  }, undefined, { timeout: timeoutMs });
}

/** A mask's centre on the screen (px relative to the sky-view box) and its PA, from the hidden mask-anchors list. */
export interface Anchor { id: string; x: number; y: number; pa: number }

/** Every mask's screen anchor, in the order the sky view lists them. */
export async function anchors(page: Page): Promise<Anchor[]> {
  return page.$$eval('[data-testid="mask-anchors"] li', (lis) =>
    lis.map((li) => ({ id: li.getAttribute('data-mask-id')!, x: Number(li.getAttribute('data-x')), y: Number(li.getAttribute('data-y')), pa: Number(li.getAttribute('data-pa')) })));
}

/** Slits per role on mask `id`, as the Masks panel shows them. */
export async function maskCounts(page: Page, id: string): Promise<Record<string, number>> {
  return page.evaluate((mid) => {
    const out: Record<string, number> = {};
    for (const r of ['tracer', 'starlight', 'sky', 'alignment']) out[r] = Number(document.querySelector(`[data-testid="mask-${mid}-${r}"]`)?.textContent);
    return out;
  }, id);
}

/** Drag mask `id` by (dx, dy) screen pixels with real mouse events on the canvas, one step per frame. */
export async function dragMask(page: Page, id: string, dx: number, dy: number): Promise<void> {
  const box = (await page.locator('[data-testid="sky-view"]').boundingBox())!;
  const a = (await anchors(page)).find((m) => m.id === id)!;
  const x0 = box.x + a.x, y0 = box.y + a.y;
  await page.mouse.move(x0, y0);
  await page.mouse.down();
  for (let i = 1; i <= 12; i++) {
    await page.mouse.move(x0 + (dx * i) / 12, y0 + (dy * i) / 12);
    await page.waitForTimeout(16);
  }
  await page.mouse.up();
  await page.waitForTimeout(50); // let the page render the commit before anyone waits for its solve
}

/** The numbers the editor shows: slits and reach per role. */
export async function shownNumbers(page: Page): Promise<{ counts: Record<string, number>; reach: Record<string, number> }> {
  return page.evaluate(() => {
    const counts: Record<string, number> = {}, reach: Record<string, number> = {};
    for (const r of ['tracer', 'starlight', 'sky', 'alignment']) {
      counts[r] = Number(document.querySelector(`[data-testid="count-${r}"]`)?.textContent);
      reach[r] = Number(document.querySelector(`[data-testid="reach-${r}"]`)?.getAttribute('data-value'));
    }
    return { counts, reach };
  });
}

import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { generatedDemo } from '../../src/editor/io/generatedDemo';

/** The demo plan and catalog as files: examples/demo when present (what the editor bundles), else the generated demo in a temp folder. */
export function demoOnDisk(): { planPath: string; catalogPath: string; catalogName: string } {
  const dir = join(ROOT, 'examples/demo');
  const plan = existsSync(dir) ? readdirSync(dir).find((f) => f.endsWith('.plan.json')) : undefined;
  if (plan) {
    const planPath = join(dir, plan);
    const cat = String(JSON.parse(readFileSync(planPath, 'utf8')).catalog);
    const catalogPath = resolve(dir, cat);
    if (existsSync(catalogPath)) return { planPath, catalogPath, catalogName: cat.split(/[\\/]/).pop()! };
  }
  const g = generatedDemo();
  const tmp = mkdtempSync(join(tmpdir(), 'hw-demo-'));
  writeFileSync(join(tmp, g.planName), g.planText);
  writeFileSync(join(tmp, g.catalogName), g.catalogText);
  return { planPath: join(tmp, g.planName), catalogPath: join(tmp, g.catalogName), catalogName: g.catalogName };
}

/** Run the haloweave CLI (bin/haloweave.js) and return its exit status and output. */
export function runCli(args: string[]): { status: number; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/haloweave.js'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 240_000 });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/**
 * An exported output folder (its catalog beside it) passes `haloweave check`, holds the `shown` numbers, and
 * `haloweave plan` on its solved.plan.json writes the very same masks.csv, slits.csv and coverage.json: the editor's
 * worker and the command line run the same src/core, whose transcendental functions are engine-independent
 * (src/core/numeric/portableMath.ts). Returns the command line's folder.
 */
export function expectFolderAgreesWithCli(dir: string, shown: ReturnType<typeof numbersOfOutput>): string {
  const check = runCli(['check', dir]);
  expect(check.status, check.stderr + check.stdout).toBe(0);
  expect(numbersOfOutput(readFileSync(join(dir, 'slits.csv'), 'utf8'), readFileSync(join(dir, 'coverage.json'), 'utf8'))).toStrictEqual(shown);
  const again = mkdtempSync(join(tmpdir(), 'hw-again-'));
  const r = runCli(['plan', join(dir, 'solved.plan.json'), '--out', again, '--quiet']);
  expect(r.status, r.stderr).toBe(0);
  for (const f of ['masks.csv', 'slits.csv', 'coverage.json']) expect(readFileSync(join(again, f), 'utf8'), f).toBe(readFileSync(join(dir, f), 'utf8'));
  return again;
}

/** Slit counts per role from a slits.csv text and reach per role from a coverage.json text (as the CLI writes them). */
export function numbersOfOutput(slitsCsv: string, coverageJson: string): { counts: Record<string, number>; reach: Record<string, number> } {
  const lines = slitsCsv.trim().split(/\r?\n/);
  const roleCol = lines[0].split(',').indexOf('role');
  const counts: Record<string, number> = { tracer: 0, starlight: 0, sky: 0, alignment: 0 };
  // Roles are plain words, so the role cell never holds a quoted comma; ids before it may, so count from a CSV split.
  for (const line of lines.slice(1)) counts[splitCsvLine(line)[roleCol]]++;
  const cov = JSON.parse(coverageJson) as { roles: Record<string, { maxReachRe: number }> };
  const reach: Record<string, number> = {};
  for (const r of Object.keys(counts)) reach[r] = cov.roles[r]?.maxReachRe ?? 0;
  return { counts, reach };
}

function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let cur = '', q = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (q) {
      if (ch === '"' && line[i + 1] === '"') { cur += '"'; i++; }
      else if (ch === '"') q = false;
      else cur += ch;
    } else if (ch === '"') q = true;
    else if (ch === ',') { out.push(cur); cur = ''; }
    else cur += ch;
  }
  out.push(cur);
  return out;
}

/** Build the editor (vite build into a temp folder) and serve it with vite preview; for benchmarks of the shipped bundle. */
export async function startBuiltHarness(): Promise<Harness> {
  const { build, preview } = await import('vite');
  const outDir = mkdtempSync(join(tmpdir(), 'hw-build-'));
  await build({ root: ROOT, configFile: resolve(ROOT, 'vite.config.ts'), logLevel: 'error', build: { outDir, emptyOutDir: true } });
  const server = await preview({ root: ROOT, configFile: resolve(ROOT, 'vite.config.ts'), logLevel: 'error', build: { outDir }, preview: { port: 0, host: '127.0.0.1', open: false } });
  const addr = server.httpServer.address();
  const port = typeof addr === 'object' && addr ? addr.port : 4173;
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });
  return {
    server: server as unknown as ViteDevServer, url: `http://127.0.0.1:${port}/`, browser,
    async close() {
      await browser.close().catch(() => {});
      await new Promise<void>((r) => server.httpServer.close(() => r()));
    },
  };
}
