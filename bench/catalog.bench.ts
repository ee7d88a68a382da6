/**
 * Catalog reading benchmark: a 1 000 000-row CSV (invented rows, fixed seed) read and validated by the streaming
 * file reader, and for comparison by the in-memory `readCatalog`, each in a fresh child process whose peak RSS
 * (process.resourceUsage().maxRSS) is reported. Goals (issue 3): under 5 s and under 1 GB for the streaming read.
 * The same catalog with every id in quotes shows the cost of quoted fields (simple ones such as "c12" are split by
 * the reader's own fast path; lines with `""`, line ends in quotes or stray quotes go to papaparse).
 * The same rows written as a FITS binary table and as a VOTable (TABLEDATA) by the project's writers are read the
 * same two ways: streamed from the file (FITS a block of rows at a time, VOTable in chunks) and whole in memory.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, openSync, readFileSync, rmSync, statSync, writeSync, closeSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { printTable, type BenchRow } from './harness';
import type { OutputTable } from '../src/core/export/outputTable';

const CHILD_FLAG = '--catalog-bench-child';
const TABLES_FLAG = '--catalog-bench-write-tables';
const ROWS = 1_000_000;

/** Write an invented catalog of `rows` rows (LCG with a fixed seed), about 60 bytes a row; ids in quotes if `quoteIds`. */
function writeCatalog(path: string, rows: number, quoteIds = false): void {
  let seed = 20261202;
  const rnd = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 4294967296;
  const fd = openSync(path, 'w');
  writeSync(fd, 'id,ra,dec,mag,color,priority,role\n');
  let buf: string[] = [];
  for (let i = 0; i < rows; i++) {
    const ra = (187.5 + (rnd() - 0.5) * 0.8).toFixed(6);
    const dec = (-5.2 + (rnd() - 0.5) * 0.8).toFixed(6);
    const mag = (19 + rnd() * 5).toFixed(3);
    const color = (0.6 + rnd() * 0.8).toFixed(3);
    const prio = i % 10 === 0 ? (1 + rnd() * 4).toFixed(2) : '';
    const role = i % 500 === 0 ? 'alignment' : 'tracer';
    buf.push(`${quoteIds ? `"c${i}"` : `c${i}`},${ra},${dec},${mag},${color},${prio},${role}`);
    if (buf.length === 10000) {
      writeSync(fd, buf.join('\n') + '\n');
      buf = [];
    }
  }
  if (buf.length > 0) writeSync(fd, buf.join('\n') + '\n');
  closeSync(fd);
}

/**
 * The same invented rows as an OutputTable (id, ra, dec, mag, color, priority with nulls, role), for the FITS and VOTable
 * writers of the project.
 */
function inventedTable(rows: number): OutputTable {
  let seed = 20261202;
  const rnd = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 4294967296;
  const out: OutputTable['rows'] = new Array(rows);
  for (let i = 0; i < rows; i++) {
    out[i] = [`c${i}`, 187.5 + (rnd() - 0.5) * 0.8, -5.2 + (rnd() - 0.5) * 0.8, 19 + rnd() * 5, 0.6 + rnd() * 0.8,
      i % 10 === 0 ? 1 + rnd() * 4 : null, i % 500 === 0 ? 'alignment' : 'tracer'];
  }
  return {
    name: 'bench',
    columns: [
      { name: 'id', datatype: 'string' }, { name: 'ra', datatype: 'float64', unit: 'deg' }, { name: 'dec', datatype: 'float64', unit: 'deg' },
      { name: 'mag', datatype: 'float64', unit: 'mag' }, { name: 'color', datatype: 'float64', unit: 'mag' },
      { name: 'priority', datatype: 'float64' }, { name: 'role', datatype: 'string' },
    ],
    rows: out,
    meta: [],
  };
}

/**
 * The invented rows as a VOTable BINARY2 document (built here: the project writes TABLEDATA only): string columns as
 * char arraysize="*", float64 columns as double, a null as the row's null flag.
 */
async function binary2Document(table: OutputTable): Promise<string> {
  const { encodeBase64 } = await import('../src/core/formats/base64');
  const flagBytes = Math.ceil(table.columns.length / 8);
  let out = new Uint8Array(1 << 20);
  let n = 0;
  const room = (k: number) => {
    if (n + k <= out.length) return;
    const next = new Uint8Array(2 * (n + k));
    next.set(out.subarray(0, n));
    out = next;
  };
  const dv = new DataView(new ArrayBuffer(8));
  for (const r of table.rows) {
    room(flagBytes + 64);
    const flagsAt = n;
    out.fill(0, n, n + flagBytes);
    n += flagBytes;
    table.columns.forEach((c, j) => {
      const cell = r[j];
      if (cell === null) out[flagsAt + (j >> 3)] |= 0x80 >> (j & 7);
      if (c.datatype === 'string') {
        const s = cell === null ? '' : String(cell);
        room(4 + s.length);
        dv.setUint32(0, s.length);
        out.set(new Uint8Array(dv.buffer, 0, 4), n);
        n += 4;
        for (let i = 0; i < s.length; i++) out[n++] = s.charCodeAt(i);
      } else {
        dv.setFloat64(0, cell === null ? NaN : Number(cell));
        out.set(new Uint8Array(dv.buffer, 0, 8), n);
        n += 8;
      }
    });
  }
  const fields = table.columns.map((c) => (c.datatype === 'string' ? `<FIELD name="${c.name}" datatype="char" arraysize="*"/>`
    : `<FIELD name="${c.name}" datatype="double"${c.unit ? ` unit="${c.unit}"` : ''}/>`)).join('\n');
  return `<?xml version="1.0" encoding="UTF-8"?>\n<VOTABLE version="1.4"><RESOURCE><TABLE name="${table.name}">\n${fields}\n`
    + `<DATA><BINARY2><STREAM encoding="base64">\n${encodeBase64(out.subarray(0, n))}\n</STREAM></BINARY2></DATA></TABLE></RESOURCE></VOTABLE>\n`;
}

/** Write the invented rows as a FITS binary table and a VOTable TABLEDATA document (the project's writers), and as BINARY2. */
async function writeTableFiles(fitsPath: string, votablePath: string, rows: number, binary2Path?: string): Promise<void> {
  const { writeFitsTable } = await import('../src/core/export/fitsWriter');
  const { writeVoTable } = await import('../src/core/export/votableWriter');
  const { writeFileSync } = await import('node:fs');
  const table = inventedTable(rows);
  writeFileSync(fitsPath, writeFitsTable(table));
  writeFileSync(votablePath, writeVoTable(table));
  if (binary2Path) writeFileSync(binary2Path, await binary2Document(table));
}

/** Child mode: read the file one way and print time, peak RSS and counts as JSON. */
async function child(mode: string, path: string): Promise<void> {
  const { usableRowCount } = await import('../src/core/catalog/validate');
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let result;
  if (mode === 'stream') {
    const { readCatalogFile } = await import('../src/cli/readCatalogFile');
    result = readCatalogFile(path);
  } else {
    const { readCatalog } = await import('../src/core/catalog/read');
    result = readCatalog(readFileSync(path), path);
  }
  const ms = performance.now() - t0;
  const c = process.cpuUsage(c0);
  const cpuMs = (c.user + c.system) / 1000;
  const maxRssMB = process.resourceUsage().maxRSS / 1024;
  // Memory the result holds once the reading's garbage is gone: the rows as columns, then as Target objects as well.
  setFlagsFromString('--expose-gc');
  const gc = runInNewContext('gc') as () => void;
  const live = () => {
    gc();
    const m = process.memoryUsage();
    return (m.heapUsed + m.arrayBuffers) / 2 ** 20;
  };
  const heldMB = live();
  const objects = result.targets.length;
  const heldWithObjectsMB = live();
  const out = { ms, cpuMs, maxRssMB, heldMB, heldWithObjectsMB, rowsRead: result.rowsRead, used: usableRowCount(result), objects, rejected: result.rejects.length };
  console.log(JSON.stringify(out));
}

interface ChildResult { ms: number; cpuMs: number; maxRssMB: number; heldMB: number; heldWithObjectsMB: number; rowsRead: number; used: number; rejected: number }

function runChild(mode: string, path: string): ChildResult {
  const r = spawnSync(process.execPath, [resolve('bin/run-ts.js'), resolve('bench/catalog.bench.ts'), CHILD_FLAG, mode, path], {
    encoding: 'utf8',
    maxBuffer: 1 << 20,
  });
  if (r.status !== 0) throw new Error(`child ${mode} failed: ${r.stderr}`);
  const line = r.stdout.trim().split('\n').pop()!;
  return JSON.parse(line);
}

export default async function bench(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'haloweave-catalog-bench-'));
  try {
    const loadAtStart = loadavg()[0];
    const path = join(dir, 'catalog-1m.csv');
    const quotedPath = join(dir, 'catalog-1m-quoted.csv');
    const g0 = performance.now();
    writeCatalog(path, ROWS);
    const genMs = performance.now() - g0;
    writeCatalog(quotedPath, ROWS, true);
    const fitsPath = join(dir, 'catalog-1m.fits');
    const votablePath = join(dir, 'catalog-1m.vot');
    const binary2Path = join(dir, 'catalog-1m-binary2.vot');
    const w = spawnSync(process.execPath, [resolve('bin/run-ts.js'), resolve('bench/catalog.bench.ts'), TABLES_FLAG, fitsPath, votablePath, String(ROWS), binary2Path], { encoding: 'utf8' });
    if (w.status !== 0) throw new Error(`writing the FITS and VOTable files failed: ${w.stderr}`);
    const stream = runChild('stream', path);
    const memory = runChild('memory', path);
    const quoted = runChild('stream', quotedPath);
    const tables = [
      { label: 'FITS', path: fitsPath, stream: runChild('stream', fitsPath), memory: runChild('memory', fitsPath) },
      { label: 'VOTable', path: votablePath, stream: runChild('stream', votablePath), memory: runChild('memory', votablePath) },
      { label: 'VOTable BINARY2', path: binary2Path, stream: runChild('stream', binary2Path), memory: runChild('memory', binary2Path) },
    ];
    for (const r of [stream, memory, quoted, ...tables.flatMap((t) => [t.stream, t.memory])]) {
      if (r.rowsRead !== ROWS || r.used !== ROWS) throw new Error(`the reader read ${r.rowsRead} rows, used ${r.used}`);
    }
    const rows: BenchRow[] = [
      { name: 'write 1e6-row CSV (setup)', value: genMs, unit: 'ms' },
      { name: 'stream read+validate 1e6 rows', value: stream.ms, unit: 'ms', goal: 5000, lowerIsBetter: true },
      { name: 'stream read+validate CPU time', value: stream.cpuMs, unit: 'ms', note: 'user+system, all threads; steadier than wall time on a shared machine' },
      { name: 'stream read peak RSS', value: stream.maxRssMB, unit: 'MB', goal: 1024, lowerIsBetter: true, note: 'whole child process' },
      { name: 'heap and typed arrays held by the read catalog (after a full GC)', value: stream.heldMB, unit: 'MB', note: 'rows as typed columns' },
      { name: 'held once the rows are also made into Target objects', value: stream.heldWithObjectsMB, unit: 'MB', note: 'what the editor holds' },
      { name: 'in-memory readCatalog 1e6 rows', value: memory.ms, unit: 'ms', note: 'file read whole' },
      { name: 'in-memory readCatalog CPU time', value: memory.cpuMs, unit: 'ms' },
      { name: 'in-memory readCatalog peak RSS', value: memory.maxRssMB, unit: 'MB' },
      { name: 'stream read+validate 1e6 rows, every id quoted', value: quoted.ms, unit: 'ms', note: 'simple quoted fields' },
      { name: 'stream read+validate CPU time, every id quoted', value: quoted.cpuMs, unit: 'ms' },
      { name: 'stream read peak RSS, every id quoted', value: quoted.maxRssMB, unit: 'MB' },
      { name: 'rows used (stream)', value: stream.used, unit: 'rows' },
    ];
    for (const t of tables) {
      const mb = (statSync(t.path).size / 1e6).toFixed(0);
      rows.push(
        { name: `${t.label} (${mb} MB) streamed read+validate CPU time`, value: t.stream.cpuMs, unit: 'ms', note: 'user+system' },
        { name: `${t.label} streamed read peak RSS`, value: t.stream.maxRssMB, unit: 'MB', note: 'whole child process' },
        { name: `${t.label} in-memory readCatalog CPU time`, value: t.memory.cpuMs, unit: 'ms', note: 'file read whole (the editor\'s path)' },
        { name: `${t.label} in-memory readCatalog peak RSS`, value: t.memory.maxRssMB, unit: 'MB' },
      );
    }
    rows.push({ name: 'machine load average (1 min) at the start', value: loadAtStart, unit: `on ${cpus().length} cores` });
    rows.push({ name: 'machine load average (1 min) at the end', value: loadavg()[0], unit: `on ${cpus().length} cores` });
    await printTable('catalog: 1 000 000 rows as CSV, FITS and VOTable, read and validated', rows);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const tablesFlag = process.argv.indexOf(TABLES_FLAG);
if (tablesFlag >= 0) {
  const [fitsPath, votablePath, rows, binary2Path] = process.argv.slice(tablesFlag + 1);
  await writeTableFiles(fitsPath, votablePath, Number(rows ?? ROWS), binary2Path);
}
const flag = process.argv.indexOf(CHILD_FLAG);
if (flag >= 0) await child(process.argv[flag + 1], process.argv[flag + 2]);
