/**
 * The editor controller: owns the document store, the solver workers and autosave, and turns user
 * actions (open, drag, edit, search, save) into store commands and solve requests. No React here.
 */
import type { CatalogReadResult } from '../core/catalog/types';
import type { PlanFile, PlanMask } from '../core/plan/schema';
import { galaxyModel, parsePlanText } from '../core/plan/validate';
import { snapCentreDeg } from './view/centreSnap';
import { maskPlaced, planFullyPlaced } from '../core/pipeline/pipeline';
import { withoutSolveOutputs } from '../core/pipeline/refractionReport';
import { parseProfileText } from '../core/profile/load';
import type { InstrumentProfile } from '../core/profile/schema';
import { InputError, type Problem } from '../core/result';
import { readCatalog } from '../core/catalog/read';
import { DocumentStore } from './store/store';
import type { EditorDoc } from './store/document';
import { moveMaskCommand, openCatalogCommand, rotateMaskCommand, setMasksCommand, setProfileCommand, type Command } from './store/commands';
import { catalogCoverageNote } from './derive';
import { emptySession, type LoadedFile, type Notice, type Session } from './session';
import { SolverClient, type SolveOutcome } from './worker/solverClient';
import { bundledProfileFor } from './io/profiles';
import { missingEditorProfiles } from './io/planProfiles';
import { planInstrumentRefs } from '../core/plan/instruments';
import { demoFiles } from './io/demo';
import { classifyFile } from './io/classify';
import { decodeText, type TextEncodingName } from '../core/catalog/textDecoding';
import { emptyStart, galaxyFromForm, latin1Note, type StartKey, type StartState } from './io/startForm';
import { draftFromFile } from './io/draftFromFile';
import { ownProfileFileName, savedPlanFiles } from './io/profileFile';
import { readAutosave, writeAutosave, clearAutosave } from './io/autosave';
import type { MaskPose } from './view/SkyView';

export type Listener = () => void;

/** Problems of an error, or one problem holding its message. */
function problemsOf(e: unknown, where: string): Problem[] {
  if (e instanceof InputError) return e.problems;
  return [{ where, what: e instanceof Error ? e.message : String(e) }];
}

/** Read a browser File into text (text formats) or bytes (FITS). */
export async function loadedFileFrom(file: File): Promise<{ file: LoadedFile; bytes: Uint8Array; encoding: TextEncodingName | null }> {
  const bytes = new Uint8Array(await file.arrayBuffer());
  const isFits = new TextDecoder().decode(bytes.subarray(0, 9)) === 'SIMPLE  =';
  if (isFits) return { file: { name: file.name, content: bytes }, bytes, encoding: null };
  // The decoder the command line uses: UTF-16/UTF-8 by byte-order mark, else UTF-8 when valid, else Latin-1.
  const { text, encoding } = decodeText(bytes);
  return { file: { name: file.name, content: text }, bytes, encoding };
}

/** The rest wavelengths a plan started in the editor asks for: the calcium triplet in air, Angstrom (common practice). */
const CALCIUM_TRIPLET_A = [8498.0, 8542.1, 8662.1];

export interface ControllerOptions {
  /** Ask the user a yes/no question (default window.confirm). */
  confirm?(question: string): boolean;
  /** Make a solver client (tests may inject one). */
  makeSolver?(cb: ConstructorParameters<typeof SolverClient>[0]): SolverClient;
  /** Delay before an autosave write, ms. */
  autosaveDelayMs?: number;
}

export class EditorController {
  store: DocumentStore<Session> | null = null;
  private listeners = new Set<Listener>();
  private solver: SolverClient;
  private searcher: SolverClient;
  private noticeId = 1;
  private lastDoc: EditorDoc | null = null;
  private lastInputs: { profile: InstrumentProfile; catalog: CatalogReadResult } | null = null;
  /** The request whose 'plan' result should place the masks of a freshly opened plan. */
  private adoptRequestId = -1;
  /** The plan the placing solve (adoptRequestId) and the running pointing search were asked for. */
  private adoptFrom: PlanFile | null = null;
  private searchFrom: PlanFile | null = null;
  private autosaveTimer: ReturnType<typeof setTimeout> | null = null;
  private readonly confirm: (q: string) => boolean;
  private readonly autosaveDelayMs: number;
  /** The document each sent request was made for (null for drag previews), by request id. */
  private requestedFor = new Map<number, EditorDoc | null>();
  /** Worker compute time of recent solves by mode, ms (read by the benchmark). */
  readonly solveTimes: { mode: string; ms: number }[] = [];

  constructor(opts: ControllerOptions = {}) {
    this.confirm = opts.confirm ?? ((q) => window.confirm(q));
    this.autosaveDelayMs = opts.autosaveDelayMs ?? 300;
    const make = opts.makeSolver ?? ((cb) => new SolverClient(cb));
    this.solver = make({
      onResult: (o) => this.onSolved(o),
      onError: (message, problems, id) => this.onSolveError(message, problems, id),
      onBusy: (busy) => this.patch({ solving: busy }),
    });
    this.searcher = make({
      onResult: (o) => this.onSearched(o),
      onError: (message, problems) => {
        this.patch({ search: null });
        this.notify('error', `pointing search failed: ${message}`, problems);
      },
      onProgress: (fraction, message) => this.patch({ search: { running: true, fraction, message } }),
    });
  }

  // ---- subscription (for React) ----
  subscribe = (fn: Listener): (() => void) => {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  };
  private version = 0;
  /** Changes whenever anything shown changes. */
  getVersion = (): number => this.version;
  private emit(): void {
    this.version++;
    for (const fn of [...this.listeners]) fn();
  }

  get session(): Session {
    return this.store?.session ?? emptySession();
  }

  /** Change session fields; no change (and no re-render) when every given value is already there. */
  private patch(p: Partial<Session>): void {
    if (!this.store) return;
    const cur = this.store.session as unknown as Record<string, unknown>;
    if (Object.entries(p).every(([k, v]) => cur[k] === v)) return;
    this.store.updateSession((s) => ({ ...s, ...p }));
  }

  /**
   * Show a message: information goes after 6 s, a warning after 30 s, an error stays until dismissed (each has a
   * close button, and Escape closes them all); at most five at a time.
   */
  notify(level: Notice['level'], text: string, problems?: Problem[], action?: Notice['action']): void {
    const n: Notice = { id: this.noticeId++, level, text, problems, ...(action ? { action } : {}) };
    if (!this.store) {
      console[level === 'error' ? 'error' : 'log'](text, problems ?? '');
      return;
    }
    this.patch({ notices: [...this.session.notices.slice(-4), n] });
    if (level !== 'error') setTimeout(() => this.dismissNotice(n.id), level === 'info' ? 6000 : 30000);
  }

  /** Close every message. */
  dismissAllNotices(): void {
    if (this.session.notices.length) this.patch({ notices: [] });
  }

  /** Open the catalog's row report and bring it into view. */
  showRejects(): void {
    this.patch({ revealRejects: this.session.revealRejects + 1 });
  }

  /** Ask the sky view to bring catalog target `index` into view. */
  focusTarget(index: number): void {
    this.patch({ focus: { index, n: (this.session.focus?.n ?? 0) + 1 } });
  }

  /** Set the PA snap for turning masks by their handle (0: off). */
  setPaSnap(deg: number): void {
    this.patch({ paSnapDeg: deg });
  }

  /** Set the centre steps for typed and dragged mask centres, arcsec (0: exact). */
  setCentreSnap(stepArcsec: number): void {
    this.patch({ centreSnapArcsec: stepArcsec });
  }

  /** Move a mask to a typed centre (degrees), on the centre steps about the galaxy centre: one undoable edit. */
  moveMaskTyped(id: string, raDeg: number, decDeg: number): void {
    if (!this.store) return;
    const to = snapCentreDeg(galaxyModel(this.store.doc.plan), raDeg, decDeg, this.session.centreSnapArcsec);
    this.store.run((d) => moveMaskCommand(d, id, to.raDeg, to.decDeg));
  }

  // ---- the pose of a mask being dragged or turned, for read-outs that follow it live (not an edit) ----
  private livePose: MaskPose | null = null;
  private liveListeners = new Set<Listener>();
  /** Register a listener of the live pose; returns the function that removes it. */
  subscribeLive = (fn: Listener): (() => void) => {
    this.liveListeners.add(fn);
    return () => this.liveListeners.delete(fn);
  };
  /** The pose of the mask being dragged or turned, or null. */
  getLivePose = (): MaskPose | null => this.livePose;
  /** Set (or clear, null) the live pose and tell its listeners. */
  setLivePose(pose: MaskPose | null): void {
    if (pose === this.livePose) return;
    this.livePose = pose;
    for (const fn of [...this.liveListeners]) fn();
  }

  dismissNotice(id: number): void {
    this.patch({ notices: this.session.notices.filter((n) => n.id !== id) });
  }

  // ---- start-up ----
  /** Restore the autosaved work, or open the demo plan when there is none. */
  async boot(): Promise<void> {
    const saved = await readAutosave();
    if (saved) {
      try {
        const catalog = saved.catalogFile ? readCatalog(saved.catalogFile.content, saved.catalogFile.name, saved.plan.catalogColumns) : null;
        this.install({ plan: saved.plan, profile: saved.profile }, catalog, saved.catalogFile, saved.planName, { dirty: saved.unsaved, place: false });
        this.patch({ autosavedAt: saved.savedAt });
        this.notify('info', `restored your work from ${new Date(saved.savedAt).toLocaleString()}`);
        return;
      } catch (e) {
        console.error('autosave could not be restored', e);
      }
    }
    this.openDemo(false);
  }

  /** Open the built-in demo plan (asks first when there is unsaved work). */
  openDemo(ask = true): void {
    if (ask && !this.mayDiscard()) return;
    const d = demoFiles();
    this.openPlanText(d.plan, d.catalog, { ask: false });
  }

  /** Start afresh: forget the autosave and open the demo. */
  async resetToDemo(): Promise<void> {
    if (!this.mayDiscard()) return;
    await clearAutosave();
    this.openDemo(false);
  }

  private mayDiscard(): boolean {
    if (!this.store || !this.store.dirty) return true;
    return this.confirm('The plan has changes that are not saved to a file. Discard them and open the other file?');
  }

  // ---- opening files ----
  /** Open files picked or dropped together: plan, catalog, profile and/or FITS image, each told apart by content. */
  async openFiles(files: File[]): Promise<{ imageFiles: File[] }> {
    const read = await Promise.all(files.map(async (f) => ({ f, ...(await loadedFileFrom(f)) })));
    for (const r of read) if (r.encoding === 'latin1') this.notify('warning', latin1Note(r.f.name));
    const classified = read.map((r) => ({ ...r, kind: classifyFile(r.f.name, r.bytes) }));
    const plan = classified.find((c) => c.kind === 'plan');
    const profile = classified.find((c) => c.kind === 'profile');
    const catalogs = classified.filter((c) => c.kind === 'catalog');
    const imageFiles = classified.filter((c) => c.kind === 'image').map((c) => c.f);
    let profileObj: InstrumentProfile | undefined;
    if (profile) {
      try {
        profileObj = parseProfileText(String(profile.file.content), profile.f.name);
      } catch (e) {
        this.notify('error', `${profile.f.name} is not a usable instrument profile`, problemsOf(e, profile.f.name));
      }
    }
    if (plan) {
      // A catalog dropped with the plan is used when its name matches the plan's `catalog` (or it is the only one).
      let planCatalogName = '';
      try { planCatalogName = String(JSON.parse(String(plan.file.content)).catalog ?? ''); } catch { /* reported below */ }
      const base = planCatalogName.split(/[\\/]/).pop();
      const cat = catalogs.find((c) => c.f.name === base) ?? (catalogs.length === 1 ? catalogs[0] : undefined);
      this.openPlanText(plan.file, cat?.file ?? null, { ask: true, profile: profileObj });
    } else {
      if (profileObj && this.store) this.store.dispatch(setProfileCommand(this.store.doc, profileObj));
      for (const c of catalogs) this.openCatalog(c.file);
    }
    return { imageFiles };
  }

  /** Open a plan; its catalog is `catalogFile`, or the one already loaded when the names match. */
  openPlanText(planFile: LoadedFile, catalogFile: LoadedFile | null, opts: { ask: boolean; profile?: InstrumentProfile; dirty?: boolean }): boolean {
    if (opts.ask && !this.mayDiscard()) return false;
    let plan: PlanFile;
    try {
      plan = withoutSolveOutputs(parsePlanText(String(planFile.content), planFile.name));
    } catch (e) {
      this.notify('error', `${planFile.name} could not be opened`, problemsOf(e, planFile.name));
      return false;
    }
    // A plan with several spectrographs opens on its first; the others are bundled profiles (io/planProfiles.ts).
    const instrument = planInstrumentRefs(plan)[0];
    const profile = opts.profile ?? bundledProfileFor(instrument) ?? (this.store?.doc.profile.id === instrument ? this.store.doc.profile : undefined);
    if (!profile) {
      this.notify('error', `${planFile.name}: instrument "${instrument}" is not a bundled profile`, [
        { where: `${planFile.name}: instrument`, what: `no profile "${instrument}" is known to the editor`, fix: 'open the profile file together with the plan (drop both at once)' },
      ]);
      return false;
    }
    const unknown = missingEditorProfiles(plan, profile);
    if (unknown.length) {
      this.notify('error', `${planFile.name}: instruments not known to the editor`, unknown.map((ref) => (
        { where: `${planFile.name}: instruments`, what: `no profile "${ref}" is bundled with the editor`, fix: 'use the bundled profile ids for every instrument of a plan with several' })));
      return false;
    }
    if (opts.profile && plan.instrument !== undefined && plan.instrument !== opts.profile.id) plan = { ...plan, instrument: opts.profile.id };
    let catalog: CatalogReadResult | null = null;
    let catFile = catalogFile;
    if (!catFile && this.session.catalogFile) {
      const want = plan.catalog.split(/[\\/]/).pop();
      if (this.session.catalogFile.name === want) catFile = this.session.catalogFile;
    }
    if (catFile) {
      try {
        catalog = readCatalog(catFile.content, catFile.name, plan.catalogColumns);
      } catch (e) {
        this.notify('error', `${catFile.name} could not be read`, problemsOf(e, catFile.name));
      }
    } else {
      this.notify('warning', `open the catalog "${plan.catalog}" (file picker or drop it on the window) to solve this plan`);
    }
    this.install({ plan, profile }, catalog, catalog ? catFile : null, planFile.name, { dirty: opts.dirty ?? false, place: true });
    return true;
  }

  /** Open a catalog for the current plan (any format the core reads); rejected rows are listed, never hidden. */
  openCatalog(file: LoadedFile): void {
    if (!this.store) return;
    let catalog: CatalogReadResult;
    try {
      catalog = readCatalog(file.content, file.name, this.store.doc.plan.catalogColumns);
    } catch (e) {
      this.notify('error', `${file.name} could not be read as a catalog`, problemsOf(e, file.name));
      return;
    }
    const used = catalog.targets.length;
    if (used === 0) {
      this.notify('error', `${file.name}: no row of the catalog is usable; nothing to solve`, undefined, catalog.rejects.length ? 'show-rejects' : undefined);
      return;
    }
    // A plan opened before its catalog (nothing solved yet) may still have masks to place: place them now and adopt
    // the placements, as when the plan and its catalog are opened together (an allocation alone would place them
    // unseen: solved and counted, but neither drawn nor listed). A catalog replacing another keeps the layout.
    const fresh = !this.session.solution;
    // One undoable edit: the document change makes onStoreChange mirror the catalog, send it and ask for a solve.
    this.store.dispatch(openCatalogCommand(this.store.doc, { file, read: catalog }));
    const rejectedRows = new Set(catalog.rejects.map((r) => r.line)).size;
    this.notify(catalog.rejects.length ? 'warning' : 'info',
      `${file.name}: ${catalog.rowsRead} rows read, ${used} used, ${rejectedRows} not used (undo reopens the previous catalog)`, undefined,
      catalog.rejects.length ? 'show-rejects' : undefined);
    this.warnIfCatalogMissesGalaxy(file.name);
    const doc = this.store.doc;
    if (fresh && !planFullyPlaced(doc.plan)) this.requestPlacement(doc);
  }

  private installing = false;

  private install(doc: EditorDoc, catalog: CatalogReadResult | null, catalogFile: LoadedFile | null, planName: string, o: { dirty: boolean; place: boolean }): void {
    this.installing = true;
    try {
      this.installInner(doc, catalog, catalogFile, planName, o);
    } finally {
      this.installing = false;
    }
    if (catalog) {
      this.sendInputs(false);
      // A fresh plan: the solver places masks that have no position yet; the result is adopted below.
      if (o.place) this.requestPlacement(this.store!.doc);
      else this.requestFor(this.store!.doc, 'allocate');
    }
    this.scheduleAutosave();
    this.emit();
  }

  private installInner(bare: EditorDoc, catalog: CatalogReadResult | null, catalogFile: LoadedFile | null, planName: string, o: { dirty: boolean; place: boolean }): void {
    const doc: EditorDoc = { ...bare, catalog: catalog && catalogFile ? { file: catalogFile, read: catalog } : null };
    if (!this.store) {
      this.store = new DocumentStore<Session>(doc, { ...emptySession(), catalog, catalogFile, planName });
      this.store.subscribe(() => this.onStoreChange());
    } else {
      this.store.replaceDocument(doc, { dirty: o.dirty });
      this.patch({ catalog, catalogFile, planName, solution: null, selection: new Set(), activeMaskId: null, preview: null, solveError: null });
    }
    if (o.dirty) this.store.replaceDocument(doc, { dirty: true });
    this.lastDoc = this.store.doc;
    if (catalog && catalogFile) this.warnIfCatalogMissesGalaxy(catalogFile.name);
  }

  /** Warn when no usable catalog object lies within the tracer goal radius of the galaxy (a catalog of another field). */
  private warnIfCatalogMissesGalaxy(fileName: string): void {
    const doc = this.store?.doc;
    if (!doc?.catalog) return;
    const note = catalogCoverageNote(doc.plan, doc.catalog.read.targets);
    if (note) this.notify('warning', `${fileName}: ${note}`);
  }

  private sendInputs(resolve: boolean): void {
    if (!this.store || !this.session.catalog) return;
    const inputs = { profile: this.store.doc.profile, catalog: this.session.catalog };
    if (this.lastInputs && this.lastInputs.profile === inputs.profile && this.lastInputs.catalog === inputs.catalog) return;
    this.lastInputs = inputs;
    this.solver.setInputs(inputs.profile, inputs.catalog);
    if (resolve) this.requestFor(this.store.doc, 'allocate');
  }

  private onStoreChange(): void {
    const doc = this.store!.doc;
    if (doc !== this.lastDoc && !this.installing) {
      this.lastDoc = doc;
      // The session mirrors the document's catalog (opening one is undoable): follow it after an edit, undo or redo.
      const entry = doc.catalog ?? null;
      if ((entry?.read ?? null) !== this.session.catalog) {
        this.patch({ catalog: entry?.read ?? null, catalogFile: entry?.file ?? null, selection: new Set(), ...(entry ? {} : { solution: null, solvedDoc: null }) });
      }
      this.sendInputs(false);
      if (this.session.catalog) this.requestFor(doc, 'allocate');
      this.scheduleAutosave();
    }
    this.emit();
  }

  // ---- solving ----
  /** Ask for a solve of `doc`'s plan and remember which document it was for. */
  private requestFor(doc: EditorDoc, mode: 'allocate' | 'plan'): number {
    const id = this.solver.request(doc.plan, mode);
    this.requestedFor.set(id, doc);
    if (this.requestedFor.size > 200) this.requestedFor.delete(this.requestedFor.keys().next().value!);
    return id;
  }

  /** Ask for the solve that places the masks without a position; its placements are adopted (onSolved). */
  private requestPlacement(doc: EditorDoc): void {
    this.adoptRequestId = this.requestFor(doc, 'plan');
    this.adoptFrom = doc.plan;
  }

  /** True when the shown solution is the exact solve of the current document and nothing is pending. */
  get solutionIsCurrent(): boolean {
    return !!this.store && !this.session.solving && this.session.solvedDoc === this.store.doc;
  }

  private onSolved(o: SolveOutcome): void {
    if (!this.store) return;
    this.solveTimes.push({ mode: o.mode, ms: o.computeMs });
    if (this.solveTimes.length > 2000) this.solveTimes.splice(0, 1000);
    if (o.requestId === this.adoptRequestId && o.mode === 'plan') {
      // Adopt the solver's placements as the opened document (not an edit: nothing to undo or save; the opening
      // ends here). A mask the user moved or turned while it ran stays where the user put it.
      this.adoptRequestId = -1;
      const placed = placementsOf(this.store.doc.plan, o.result.plan, this.adoptFrom);
      if (placed) {
        const doc = { ...this.store.doc, plan: { ...this.store.doc.plan, masks: placed } };
        const wasDirty = this.store.dirty;
        this.store.replaceDocument(doc, { dirty: wasDirty });
        this.lastDoc = this.store.doc;
        this.scheduleAutosave();
      }
    } else if (o.requestId === this.adoptRequestId) {
      // The placing request was replaced, before it was sent, by the solve of a later edit (a request id goes to
      // the request actually sent). Masks still without a position need placing: ask again.
      this.adoptRequestId = -1;
      if (!planFullyPlaced(this.store.doc.plan)) this.requestPlacement(this.store.doc);
    }
    const forDoc = o.mode === 'preview' ? null : this.requestedFor.get(o.requestId) ?? null;
    this.patch({ solution: o, solveError: null, solvedDoc: forDoc });
  }

  private onSolveError(message: string, problems: Problem[] | undefined, _id: number): void {
    this.patch({ solveError: { message, problems } });
  }

  /** Show a mask at a pose it is being dragged to, and re-solve for it (not yet an edit) unless live drag is off. */
  previewMask(pose: MaskPose): void {
    this.setLivePose(pose);
    if (!this.store || !this.session.catalog || !this.session.liveDrag) return;
    const plan = this.store.doc.plan;
    const masks = (plan.masks ?? []).map((m) => (m.id === pose.id ? { ...m, raDeg: pose.raDeg, decDeg: pose.decDeg, paDeg: pose.paDeg } : m));
    this.solver.request({ ...plan, masks }, 'preview');
  }

  /** Turn the re-solve on every step of a drag on or off (a view setting, not an edit). */
  setLiveDrag(on: boolean): void {
    this.patch({ liveDrag: on });
  }

  /** Commit a drag or rotation as one undoable command. */
  commitMask(pose: MaskPose, how: 'move' | 'rotate'): void {
    this.setLivePose(null);
    if (!this.store) return;
    this.store.run((d) => (how === 'move' ? moveMaskCommand(d, pose.id, pose.raDeg, pose.decDeg) : rotateMaskCommand(d, pose.id, pose.paDeg)));
  }

  /** Do any undoable command built from the current document. */
  run(make: (d: EditorDoc) => Command): void {
    this.store?.run(make);
  }

  undo(): void { this.store?.undo(); }
  redo(): void { this.store?.redo(); }

  // ---- pointing search ----
  /** Run the pointing search for every unlocked mask (in its own worker, so it can be cancelled). */
  startSearch(): void {
    if (!this.store || !this.session.catalog) return;
    const plan = this.store.doc.plan;
    const masks = (plan.masks ?? []).map((m) => (m.locked ? m : { id: m.id, ...withoutPlacement(m) }));
    this.searcher.setInputs(this.store.doc.profile, this.session.catalog);
    this.searchFrom = plan;
    this.searcher.request({ ...plan, masks }, 'plan');
    this.patch({ search: { running: true, fraction: 0, message: 'starting' } });
  }

  cancelSearch(): void {
    this.searcher.cancel();
    this.patch({ search: null });
    this.notify('info', 'pointing search cancelled; the masks are unchanged');
  }

  private onSearched(o: SolveOutcome): void {
    if (!this.store) return;
    this.patch({ search: null });
    const placed = placementsOf(this.store.doc.plan, o.result.plan, this.searchFrom);
    if (placed) this.store.dispatch(setMasksCommand(this.store.doc, placed, 'pointing search'));
  }

  // ---- starting a plan from the user's catalog and profile ----
  /** The start panel's fields, files and last draft; kept here so nothing typed is lost when the panel closes. */
  start: StartState = emptyStart();

  private patchStart(p: Partial<StartState>): void {
    this.start = { ...this.start, ...p };
    this.emit();
  }

  /** Set one typed field of the start panel. */
  setStartValue(key: StartKey, text: string): void {
    this.patchStart({ values: { ...this.start.values, [key]: text } });
  }

  /** Give the start panel files (dropped together or one after the other, any order): a catalog and/or a profile. */
  async addStartFiles(files: File[]): Promise<void> {
    const read = (await Promise.all(files.map(async (f) => ({ f, ...(await loadedFileFrom(f)) })))).map((r) => ({ ...r, kind: classifyFile(r.f.name, r.bytes) }));
    const next: Partial<StartState> = { result: null };
    const problems: StartState['fileProblems'] = [];
    const catalogs = read.filter((r) => r.kind === 'catalog');
    for (const r of read) {
      const kind = r.kind;
      if (kind === 'profile') {
        try {
          next.profile = { fileName: r.f.name, profile: parseProfileText(String(r.file.content), r.f.name) };
        } catch (e) {
          problems.push(...problemsOf(e, r.f.name));
        }
      } else if (kind === 'plan') {
        problems.push({ where: r.f.name, what: 'is a plan file, not a catalog or a profile', fix: 'open a plan with Open… or drop it on the window; give this panel your catalog and profile' });
      } else if (kind === 'image') {
        problems.push({ where: r.f.name, what: 'is a FITS image, not a catalog', fix: 'open it as the backdrop (drop it on the window); give this panel your catalog and profile' });
      }
    }
    if (catalogs.length > 1) problems.push({ where: catalogs.map((c) => c.f.name).join(', '), what: 'several catalogs given at once', fix: 'give one catalog: the last one given is used' });
    if (catalogs.length) {
      const taken = catalogs[catalogs.length - 1];
      next.catalog = taken.file;
      // The notes go with the catalog held: a profile given afterwards leaves them.
      next.fileNotes = taken.encoding === 'latin1' ? [latin1Note(taken.f.name)] : [];
    }
    this.patchStart({ ...next, fileProblems: problems });
  }

  /** Forget the profile file given in the start panel: the document's profile is used again. */
  clearStartProfile(): void {
    this.patchStart({ profile: null, result: null });
  }

  /**
   * Draft a plan from the start panel's catalog, profile and galaxy as `haloweave draft` would write it, show what was
   * found and chosen, and open it (asking first when there is unsaved work); the opened plan is solved and shown.
   * Returns true when the plan was opened. Whatever fails, the typed fields and the files given stay.
   */
  startPlan(): boolean {
    if (!this.store) return false;
    const st = this.start;
    const form = galaxyFromForm(st.values);
    const formProblems = [...form.problems];
    if (!st.catalog) formProblems.push({ where: 'start a plan: catalog', what: 'no catalog given', fix: 'drop your catalog file on this panel, or pick it with the file button' });
    if (!form.galaxy || !st.catalog) {
      this.patchStart({ formProblems, result: null });
      return false;
    }
    const profile = st.profile?.profile ?? this.store.doc.profile;
    // The plan names the profile as `haloweave draft` would with every file in one folder: a file by its name, a shipped one by id.
    const instrument = st.profile ? st.profile.fileName : ownProfileFileName(profile) ?? profile.id;
    const result = draftFromFile(st.catalog, profile, form.galaxy, CALCIUM_TRIPLET_A, { instrument });
    this.patchStart({ formProblems: [], result });
    if (!result.planText) return false;
    // A drafted plan is not in any file yet: it opens as unsaved work.
    return this.openPlanText({ name: result.planName, content: result.planText }, st.catalog, { ask: true, profile, dirty: true });
  }

  // ---- saving ----
  /** The files "Save plan" writes: the plan, and the profile file it names when the profile is the user's own. */
  savedFiles(): { name: string; content: string }[] {
    const name = this.session.planName.endsWith('.json') ? this.session.planName : `${this.session.planName}.plan.json`;
    return savedPlanFiles(this.store!.doc.plan, this.store!.doc.profile, name);
  }

  markSaved(): void {
    this.store?.markSaved();
    this.scheduleAutosave();
  }

  private scheduleAutosave(): void {
    if (this.autosaveTimer) clearTimeout(this.autosaveTimer);
    this.autosaveTimer = setTimeout(() => void this.autosaveNow(), this.autosaveDelayMs);
  }

  /** Write the autosave record now. */
  async autosaveNow(): Promise<void> {
    if (!this.store) return;
    const savedAt = new Date().toISOString();
    await writeAutosave({
      version: 1, savedAt, plan: this.store.doc.plan, profile: this.store.doc.profile, planName: this.session.planName,
      catalogFile: this.session.catalogFile, unsaved: this.store.dirty,
    });
    this.patch({ autosavedAt: savedAt });
  }

  dispose(): void {
    this.solver.dispose();
    this.searcher.dispose();
  }
}

/**
 * The mask list to adopt from a solve that placed masks: the solved placements, except for a mask that was changed
 * in `plan` since `askedFor` (the plan the solve was asked for): the user moved or turned it meanwhile, and keeps it.
 */
function placementsOf(plan: PlanFile, solved: PlanFile, askedFor: PlanFile | null): PlanMask[] | null {
  const solvedMasks = solved.masks ?? [];
  if (!solvedMasks.length) return null;
  const given = new Map((plan.masks ?? []).map((m) => [m.id, m]));
  const asked = new Map((askedFor?.masks ?? []).map((m) => [m.id, m]));
  return solvedMasks.map((s) => {
    const g = given.get(s.id);
    if (g && askedFor && g !== asked.get(s.id) && maskPlaced(g)) return g;
    // The placement only (the mask's other keys and lock kept): what else the solve wrote on a mask (its hour-angle
    // window) is output, not plan input.
    // A plan with several spectrographs: the spectrograph the share-out gave the mask becomes its own, so the document
    // draws and keeps it (and a later change of another mask's instrument does not move this one).
    const instrument = g?.instrument ?? (plan.instruments?.length ? s.instrument : undefined);
    return { ...(g ?? {}), id: s.id, raDeg: s.raDeg, decDeg: s.decDeg, paDeg: s.paDeg, locked: g?.locked ?? false, ...(instrument !== undefined ? { instrument } : {}) };
  });
}

function withoutPlacement(m: PlanMask): Omit<PlanMask, 'id'> {
  const { id: _id, raDeg: _r, decDeg: _d, paDeg: _p, ...rest } = m;
  return rest;
}
