/**
 * Output folders written atomically. The place is checked and a temporary folder made before the solve
 * (`OutputFolder.open`): an --out under a file, in a place that cannot be written, or an existing folder holding files
 * this run does not write is refused at once, in one line. Every file then goes into the temporary folder, the
 * manifest (manifest.json: each file's size and SHA-256, the profiles used) last, and the folder is renamed into
 * place, so a failed or killed run never leaves a folder that looks complete (`haloweave check` refuses a folder
 * without a matching manifest). The temporary folder is DIR.tmp-<pid>-<time> beside DIR; when only DIR itself is
 * writable (not its parent) it is DIR/.haloweave-partial-<pid>-<time>, and the files are moved in one by one with the
 * old manifest removed first and the new one moved last. Temporary folders of runs that no longer exist are removed
 * (or, for a replaced folder whose new version never arrived, put back) by the next run. An existing DIR is replaced
 * only when every entry in it is a file being written or a file its own manifest lists (a previous run), so no file
 * of the user's is ever deleted.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmdirSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve, sep } from 'node:path';
import { InputError } from '../core/result';
import type { PlanSolution } from '../core/pipeline/pipeline';
import { masksToCsv, slitsToCsv } from '../core/export/slitsCsv';
import { catalogReportCsv } from '../core/export/catalogReport';
import { MANIFEST_FILE, buildManifest, manifestText, parseManifest, profileDigest, type ManifestProfile } from '../core/check/manifest';
import type { LoadedPlan } from './loadPlanInputs';
import { looksLikePath } from './loadPlanInputs';
import { fileOnPath, isSystemError, systemErrorProblem, withFsProblems } from './fsProblems';

/** Options of an output folder: entries of an existing DIR that may be replaced besides the files being written. */
export interface OutputFolderOptions {
  alsoReplaces?: (entry: string, dir: string) => boolean;
  /** Profiles the masks were designed with, recorded in the manifest (id and the profile file's path). */
  profiles?: { id: string; path: string }[];
}

/** SHA-256 of bytes as 64 lowercase hex digits. */
export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

const TMP_RE = /^(.*)\.(tmp|old)-(\d+)-([0-9a-z]+)$/;
const PARTIAL_RE = /^\.haloweave-partial-(\d+)-([0-9a-z]+)$/;
/** A temporary folder older than this is stale even when a process of its id runs (the id was reused). */
const STALE_AFTER_MS = 2 * 86_400_000;

/** True when the process that made a temporary folder (its pid and base-36 time in the name) is gone. */
function isStale(pid: number, stamp: string): boolean {
  if (pid === process.pid) return false;
  const t = parseInt(stamp, 36);
  if (Number.isFinite(t) && Date.now() - t > STALE_AFTER_MS) return true;
  try {
    process.kill(pid, 0);
    return false;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'ESRCH';
  }
}

/** The names an existing folder's manifest lists (a previous run wrote them), or none. */
function namesInManifest(dir: string): string[] {
  try {
    const m = parseManifest(readFileSync(join(dir, MANIFEST_FILE), 'utf8'), MANIFEST_FILE).manifest;
    return m ? [...m.files.map((f) => f.name), MANIFEST_FILE] : [];
  } catch {
    return [];
  }
}

/** Entries of `dir` this run may not replace: neither written by it, nor listed by the folder's manifest, nor ours. */
function foreignEntries(dir: string, names: ReadonlySet<string>, opts: OutputFolderOptions): string[] {
  const previous = new Set(namesInManifest(dir));
  return readdirSync(dir).filter((e) => !names.has(e) && !previous.has(e) && !PARTIAL_RE.test(e) && !opts.alsoReplaces?.(e, dir));
}

function refuseForeign(shown: string, foreign: string[]): never {
  const list = foreign.slice(0, 5).join(', ') + (foreign.length > 5 ? `, and ${foreign.length - 5} more` : '');
  throw new InputError([{ where: `--out ${shown}`, what: `the folder exists and is not a Haloweave output folder this run may replace (it holds ${list}, which this run does not write); it is left untouched`, fix: 'choose a new or empty folder for --out, or move those files away' }]);
}

/**
 * An output folder being written: `open` checks the place and makes the temporary folder before any long work;
 * `commit` writes the files and the manifest and moves them into place; `abandon` removes the temporary folder.
 */
export class OutputFolder {
  /** Notes for the user, e.g. temporary folders of interrupted runs that were cleaned up. */
  readonly notes: string[] = [];
  private tmp = '';
  private inside = false;
  private readonly createdParents: string[] = [];

  private constructor(readonly dir: string, readonly shown: string, private readonly names: Set<string>, private readonly opts: OutputFolderOptions) {}

  /** Check `--out dirArg` for the files `names` (known before the solve) and make the temporary folder. */
  static open(dirArg: string, names: Iterable<string>, opts: OutputFolderOptions = {}): OutputFolder {
    const f = new OutputFolder(resolve(dirArg), dirArg, new Set([...names, MANIFEST_FILE]), opts);
    f.checkPath();
    f.cleanStale();
    f.makeTemp();
    return f;
  }

  private checkPath(): void {
    const where = `--out ${this.shown}`;
    // The nearest existing ancestor must be a folder (an --out under a file can never be made).
    const file = fileOnPath(this.dir);
    if (file !== null) {
      throw new InputError([file === this.dir
        ? { where, what: 'exists and is a file', fix: 'choose a folder name for --out' }
        : { where, what: `${file} is a file, so no folder can be made under it`, fix: 'choose a path whose parent folders are folders' }]);
    }
    if (existsSync(this.dir)) {
      const foreign = withFsProblems(where, 'cannot read the existing output folder', () => foreignEntries(this.dir, this.names, this.opts));
      if (foreign.length) refuseForeign(this.shown, foreign);
    }
  }

  /** Remove temporary folders of runs that are gone; a replaced folder whose new version never arrived is put back. */
  private cleanStale(): void {
    const parent = dirname(this.dir);
    const base = basename(this.dir);
    const entries = (d: string): string[] => { try { return readdirSync(d); } catch { return []; } };
    for (const e of entries(parent)) {
      const m = TMP_RE.exec(e);
      if (!m || m[1] !== base || !isStale(Number(m[3]), m[4])) continue;
      const p = join(parent, e);
      try {
        if (m[2] === 'old' && !existsSync(this.dir)) {
          renameSync(p, this.dir);
          this.notes.push(`put back ${this.shown}, which an interrupted run had moved aside to ${e}`);
        } else {
          rmSync(p, { recursive: true, force: true });
          this.notes.push(`removed ${e}, a temporary folder left by an interrupted run`);
        }
      } catch {
        // not ours to remove (permissions): leave it
      }
    }
    for (const e of entries(this.dir)) {
      const m = PARTIAL_RE.exec(e);
      if (!m || !isStale(Number(m[1]), m[2])) continue;
      try {
        rmSync(join(this.dir, e), { recursive: true, force: true });
        this.notes.push(`removed ${join(this.shown, e)}, a temporary folder left by an interrupted run`);
      } catch {
        // leave it
      }
    }
  }

  private makeTemp(): void {
    const where = `--out ${this.shown}`;
    const stamp = `${process.pid}-${Date.now().toString(36)}`;
    const parent = dirname(this.dir);
    try {
      for (let p = parent; !existsSync(p); p = dirname(p)) this.createdParents.unshift(p);
      mkdirSync(parent, { recursive: true });
      this.tmp = `${this.dir}.tmp-${stamp}`;
      mkdirSync(this.tmp);
      return;
    } catch (e) {
      this.removeCreatedParents();
      if (!isSystemError(e)) throw e;
      const cannotBeside = ['EACCES', 'EPERM', 'EROFS'].includes(e.code ?? '');
      if (!cannotBeside || !existsSync(this.dir)) throw new InputError([systemErrorProblem(e, where, 'cannot make the output folder')]);
    }
    // The parent is not writable but the folder itself may be: work inside it.
    this.inside = true;
    this.tmp = join(this.dir, `.haloweave-partial-${stamp}`);
    withFsProblems(where, 'cannot write into the output folder (nor into the folder that holds it)', () => mkdirSync(this.tmp));
  }

  private removeCreatedParents(): void {
    for (const p of [...this.createdParents].reverse()) {
      try { rmdirSync(p); } catch { break; }
    }
  }

  /** Write `files` (name -> text or bytes) and the manifest, then move them into place. */
  commit(files: Record<string, string | Uint8Array>): void {
    const where = `--out ${this.shown}`;
    const bytes = new Map<string, Uint8Array>();
    for (const [name, content] of Object.entries(files)) bytes.set(name, typeof content === 'string' ? Buffer.from(content, 'utf8') : content);
    const profiles: ManifestProfile[] = (this.opts.profiles ?? []).map((p) => ({ id: p.id, sha256: profileDigest(JSON.parse(readFileSync(p.path, 'utf8')), sha256Hex) }));
    const manifest = buildManifest(bytes, sha256Hex, { writtenBy: 'haloweave 0.1.0', writtenUtc: new Date().toISOString(), profiles });
    withFsProblems(where, 'cannot write the output files', () => {
      for (const [name, b] of bytes) writeFileSync(join(this.tmp, name), b);
      writeFileSync(join(this.tmp, MANIFEST_FILE), manifestText(manifest));
    });
    const names = new Set([...bytes.keys(), MANIFEST_FILE]);
    // The folder may have changed during the solve: look again before replacing anything.
    if (existsSync(this.dir)) {
      const foreign = foreignEntries(this.dir, names, this.opts);
      if (foreign.length) refuseForeign(this.shown, foreign);
    }
    withFsProblems(where, 'cannot move the output files into place', () => (this.inside ? this.moveInside(names) : this.renameInto()));
  }

  private renameInto(): void {
    let old: string | null = null;
    if (existsSync(this.dir)) {
      old = this.tmp.replace(/\.tmp-([^/\\]+)$/, '.old-$1');
      renameSync(this.dir, old);
    }
    try {
      renameSync(this.tmp, this.dir);
    } catch (e) {
      if (old) renameSync(old, this.dir);
      throw e;
    }
    if (old) rmSync(old, { recursive: true, force: true });
  }

  private moveInside(names: Set<string>): void {
    const previous = namesInManifest(this.dir);
    // From here until the new manifest arrives, the folder is marked incomplete.
    rmSync(join(this.dir, MANIFEST_FILE), { force: true });
    for (const name of names) if (name !== MANIFEST_FILE) renameSync(join(this.tmp, name), join(this.dir, name));
    for (const name of previous) if (!names.has(name)) rmSync(join(this.dir, name), { force: true, recursive: true });
    renameSync(join(this.tmp, MANIFEST_FILE), join(this.dir, MANIFEST_FILE));
    rmdirSync(this.tmp);
  }

  /** Remove the temporary folder (and parent folders this run made), leaving the place as it was. */
  abandon(): void {
    if (this.tmp) rmSync(this.tmp, { recursive: true, force: true });
    if (!existsSync(this.dir)) this.removeCreatedParents();
  }
}

/** Write `files` (name -> text) as the folder `dir`, atomically, with its manifest. */
export function writeOutputFolder(dirArg: string, files: Record<string, string | Uint8Array>, opts: OutputFolderOptions = {}): void {
  const folder = OutputFolder.open(dirArg, Object.keys(files), opts);
  try {
    folder.commit(files);
  } catch (e) {
    folder.abandon();
    throw e;
  }
}

/** A path relative to `fromDir`, with forward slashes (as plan files write paths). */
function relativePath(fromDir: string, target: string): string {
  const r = relative(fromDir, target) || '.';
  return sep === '/' ? r : r.split(sep).join('/');
}

/**
 * The contract's output files of a solved plan: masks.csv, slits.csv, coverage.json, solved.plan.json (catalog
 * and instrument paths rewritten relative to the output folder so it loads again) and catalog-report.csv.
 * `catalogInFolder` names a copy of the catalog written into the folder itself, which solved.plan.json then names.
 */
export function planOutputFiles(solution: PlanSolution, loaded: LoadedPlan, outDir: string, catalogInFolder?: string): Record<string, string> {
  const dir = resolve(outDir);
  const masks = solution.masks.map((m) => ({ maskId: m.mask.id, instrument: m.mask.instrument ?? loaded.profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
  // Profile references that are paths are rewritten relative to the output folder, so solved.plan.json loads from there.
  const ref = (r: string) => (looksLikePath(r) ? relativePath(dir, loaded.profilePaths?.[r] ?? loaded.profilePath) : r);
  const slits = solution.masks.flatMap((m) => [...m.slits].sort((a, b) => a.yArcsec - b.yArcsec));
  const plan = {
    ...solution.plan,
    catalog: catalogInFolder ?? relativePath(dir, loaded.catalogPath),
    ...(solution.plan.instrument !== undefined ? { instrument: ref(solution.plan.instrument) } : {}),
    ...(solution.plan.instruments ? { instruments: solution.plan.instruments.map((i) => ({ ...i, profile: ref(i.profile) })) } : {}),
  };
  return {
    'masks.csv': masksToCsv(masks),
    'slits.csv': slitsToCsv(slits),
    'coverage.json': JSON.stringify({ ...solution.coverage, goals: solution.goals }, null, 2) + '\n',
    'solved.plan.json': JSON.stringify(plan, null, 2) + '\n',
    'catalog-report.csv': catalogReportCsv(loaded.catalog.rejects),
  };
}
