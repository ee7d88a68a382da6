/**
 * The editor window: a tool bar (open, save, export, undo/redo), the sky view in the middle with the
 * target table under it, and side columns (left: the plan's galaxy, instrument, masks and search;
 * right: yield, coverage, nights and the catalog row report). Files can be dropped anywhere.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { EditorController } from './controller';
import { useControllerVersion } from './useController';
import { SkyView, type MaskPose } from './view/SkyView';
import { buildCatalogGeometry } from './view/catalogGeometry';
import { galaxyModel } from '../core/plan/validate';
import { galaxyRadiusAndAzimuth } from '../core/sky/galaxyRadius';
import { baseWeightsFor, slitOfObject, slitsByMask, weightsFor } from './derive';
import { GalaxyPanel } from './panels/GalaxyPanel';
import { ProfilePanel } from './panels/ProfilePanel';
import { ProfileCheckPanel } from './panels/ProfileCheckPanel';
import { StartPlanPanel } from './panels/StartPlanPanel';
import { MasksPanel } from './panels/MasksPanel';
import { SearchPanel } from './panels/SearchPanel';
import { YieldPanel } from './panels/YieldPanel';
import { CoveragePanel } from './panels/CoveragePanel';
import { ObservabilityPanel } from './panels/ObservabilityPanel';
import { ForecastPanel } from './panels/ForecastPanel';
import { TargetTable } from './panels/TargetTable';
import { RejectReport } from './panels/RejectReport';
import { ExportMenu } from './panels/ExportMenu';
import { Notices } from './panels/Notices';
import { BackdropPanel, useBackdrop } from './panels/BackdropPanel';
import { downloadFile } from './io/download';
import { ROLE_STYLE, ROLES } from './view/palette';
import { RoleMark } from './panels/MasksPanel';
import type { MaskExposureReport } from '../core/solver/exposure';
import type { ObservingReport } from '../core/pipeline/refractionReport';

export function App({ controller: c }: { controller: EditorController }) {
  useControllerVersion(c);
  const [dragOver, setDragOver] = useState(false);
  const fileInput = useRef<HTMLInputElement>(null);
  const backdrop = useBackdrop(c);

  // Keyboard: Ctrl/Cmd+Z undo, Shift+Ctrl/Cmd+Z (or Ctrl+Y) redo, Ctrl/Cmd+S save; not while typing in a field.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const el = e.target as HTMLElement;
      if (el && (el.tagName === 'INPUT' || el.tagName === 'SELECT' || el.tagName === 'TEXTAREA')) return;
      // Escape closes the messages (a popup open above them takes its Escape first).
      if (e.key === 'Escape' && !e.defaultPrevented) { c.dismissAllNotices(); return; }
      const mod = e.ctrlKey || e.metaKey;
      if (!mod) return;
      const k = e.key.toLowerCase();
      if (k === 'z' && !e.shiftKey) { e.preventDefault(); c.undo(); }
      else if ((k === 'z' && e.shiftKey) || k === 'y') { e.preventDefault(); c.redo(); }
      else if (k === 's') { e.preventDefault(); savePlan(c); }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [c]);

  // Warn before leaving with unsaved work (the autosave keeps it anyway).
  useEffect(() => {
    const onBefore = (e: BeforeUnloadEvent) => { if (c.store?.dirty) e.preventDefault(); };
    window.addEventListener('beforeunload', onBefore);
    return () => window.removeEventListener('beforeunload', onBefore);
  }, [c]);

  const open = async (files: File[]) => {
    if (!files.length) return;
    const { imageFiles } = await c.openFiles(files);
    if (imageFiles.length) await backdrop.openImage(imageFiles[0]);
  };

  const store = c.store;
  const doc = store?.doc;
  const session = c.session;
  const galaxy = useMemo(() => (doc ? safeGalaxy(doc.plan) : null), [doc?.plan.galaxy]);
  const targets = session.catalog?.targets ?? null;
  const weights = useMemo(() => (doc && targets ? weightsFor(doc.plan, targets) : null), [doc?.plan.targetOverrides, targets]);
  const geometry = useMemo(() => (galaxy && targets && weights ? buildCatalogGeometry(targets, galaxy.raDeg, galaxy.decDeg, (_t, i) => weights[i]) : null), [galaxy, targets, weights]);
  const rRe = useMemo(() => {
    if (!galaxy || !targets) return new Float64Array(0);
    return Float64Array.from(targets, (t) => galaxyRadiusAndAzimuth(galaxy, t.raDeg, t.decDeg).rRe);
  }, [galaxy, targets]);
  const solvedMasks = session.solution?.result.masks ?? [];
  const slitMap = useMemo(() => slitsByMask(solvedMasks), [solvedMasks]);
  // Rings on the catalog follow exact solves only: a drag preview moves the mask's slits live, and the
  // rings (a full redraw of the catalog layer) catch up when the drag is committed and solved.
  const exactMasks = useRef(solvedMasks);
  if (session.solvedDoc || !session.solution) exactMasks.current = solvedMasks;
  const ringMasks = exactMasks.current;
  // Exposure estimates come with full solves only (a drag preview has none): the last ones stay shown meanwhile.
  const exactExposures = useRef<MaskExposureReport[] | null>(null);
  const report = session.solution?.result.extra.observingReport as ObservingReport | undefined;
  if (report?.exposures) exactExposures.current = report.exposures;
  else if (!session.solution) exactExposures.current = null;
  // The target table's status column follows exact solves too: a preview result re-renders only what shows it live.
  const slitOf = useMemo(() => slitOfObject(ringMasks), [ringMasks]);
  const onSlit = useMemo(() => {
    if (!targets) return null;
    return Uint8Array.from(targets, (t) => { const s = slitOf.get(t.id); return !s ? 0 : s.role === 'alignment' ? 2 : 1; });
  }, [targets, slitOf]);
  const shownWeights = useMemo(() => (doc && targets ? baseWeightsFor(doc.plan, targets) : null), [doc?.plan.targetOverrides, doc?.plan.weighting, targets]);
  const tableData = useMemo(() => (targets && weights && shownWeights ? { targets, rRe, weights, shownWeights, slitOf } : null), [targets, rRe, weights, shownWeights, slitOf]);
  const overrides = doc?.plan.targetOverrides;
  const tableOverrides = useMemo(() => overrides ?? {}, [overrides]);

  const focus = session.focus;
  const skyFocus = useMemo(() => (focus && geometry && focus.index < geometry.count
    ? { xiArcsec: geometry.xiArcsec[focus.index], etaArcsec: geometry.etaArcsec[focus.index], n: focus.n } : null), [focus, geometry]);
  // Each mask's spectrograph (plan key instruments): its own `instrument`, else the one the share-out gave it in the solve.
  const solvedInstrument = new Map(solvedMasks.map((m) => [m.mask.id, m.mask.instrument]));
  const poses: MaskPose[] = (doc?.plan.masks ?? [])
    .filter((m) => m.raDeg !== undefined && m.decDeg !== undefined)
    .map((m) => {
      const instrument = m.instrument ?? (doc?.plan.instruments ? solvedInstrument.get(m.id) : undefined);
      return { id: m.id, raDeg: m.raDeg!, decDeg: m.decDeg!, paDeg: m.paDeg ?? 0, locked: !!m.locked, ...(instrument !== undefined ? { instrument } : {}) };
    });
  const slitTotal = solvedMasks.reduce((n, m) => n + m.slits.length, 0);

  return (
    <div
      className={`app ${dragOver ? 'drag-over' : ''}`}
      onDragOver={(e) => { e.preventDefault(); setDragOver(true); }}
      onDragLeave={(e) => { if (e.currentTarget === e.target) setDragOver(false); }}
      onDrop={(e) => { e.preventDefault(); setDragOver(false); void open([...(e.dataTransfer?.files ?? [])]); }}
      data-testid="app"
    >
      <header className="toolbar">
        <div className="brand">Haloweave<span className="brand-sub">halo mask planner</span></div>
        <input ref={fileInput} type="file" multiple hidden data-testid="open-input"
          onChange={(e) => { void open([...(e.target.files ?? [])]); e.target.value = ''; }} />
        <button onClick={() => fileInput.current?.click()} title="Open a plan, catalog (CSV, ECSV, VOTable, FITS), profile or FITS image; or drop files on the window">Open…</button>
        <button onClick={() => c.openDemo(true)} data-testid="open-demo">Demo</button>
        <button onClick={() => savePlan(c)} disabled={!store} data-testid="save-plan" title="Save the plan file (Ctrl/Cmd+S)">Save plan</button>
        <ExportMenu c={c} />
        <span className="sep" />
        <button onClick={() => c.undo()} disabled={!store?.canUndo} data-testid="undo" title={store?.canUndo ? `Undo ${store.getState().history.past.at(-1)?.label} (Ctrl/Cmd+Z)` : 'nothing to undo'}>↶ Undo</button>
        <button onClick={() => c.redo()} disabled={!store?.canRedo} data-testid="redo" title={store?.canRedo ? `Redo ${store.getState().history.future.at(-1)?.label} (Shift+Ctrl/Cmd+Z)` : 'nothing to redo'}>↷ Redo</button>
        <span className="spacer" />
        <span className="doc-name" data-testid="doc-name">{session.planName}{store?.dirty ? ' •' : ''}</span>
        <span className="status small" data-testid="solve-status" data-busy={session.solving ? 'yes' : 'no'} data-current={c.solutionIsCurrent ? 'yes' : 'no'}>
          {session.solving ? 'solving…' : session.solution ? `${slitTotal} slits` : ''}
        </span>
        <span className="status small dim" data-testid="autosave-status">{session.autosavedAt ? `kept in this browser ${new Date(session.autosavedAt).toLocaleTimeString()}` : ''}</span>
      </header>
      {(!store || !doc || !galaxy) && <Notices c={c} />}
      {!store || !doc || !galaxy ? (
        <div className="loading">Opening the demo plan…</div>
      ) : (
        <div className="columns">
          <aside className="side left">
            <GalaxyPanel c={c} galaxy={galaxy} plan={doc.plan} />
            <ProfilePanel c={c} profile={doc.profile} />
            <ProfileCheckPanel c={c} profile={doc.profile} plan={doc.plan} />
            <StartPlanPanel c={c} />
            <MasksPanel c={c} solved={solvedMasks} exposures={exactExposures.current} galaxyPaDeg={galaxy.paDeg} />
            <SearchPanel c={c} />
            <BackdropPanel c={c} backdrop={backdrop} />
          </aside>
          <main className="centre">
            <div className="sky-wrap">
              <div className="legend sky-legend">
                {ROLES.map((r) => <span key={r}><RoleMark role={r} /> {ROLE_STYLE[r].label.replace(' slit', '')}</span>)}
                <span title="size by brightness, shade by weight"><i className="dot" /> candidate</span>
                <span><i className="ring" /> on a tracer slit</span>
                <span><i className="boxed" /> in an alignment box</span>
                <span><i className="diamond" /> alignment star</span>
                <span><i className="cross">×</i> excluded</span>
              </div>
              <div className="sky-box">
                <Notices c={c} />
                <SkyView
                  galaxy={galaxy}
                  tracerReachRe={doc.plan.goals.tracerReachRe}
                  starlightReachRe={doc.plan.goals.starlightReachRe}
                  profile={doc.profile}
                  masks={poses}
                  slitsByMask={slitMap}
                  catalog={geometry}
                  catalogRevision={0}
                  selected={session.selection}
                  onSlit={onSlit}
                  activeMaskId={session.activeMaskId}
                  backdrop={backdrop.drawable}
                  onPreviewMask={(p) => c.previewMask(p)}
                  onCommitMask={(p, how) => c.commitMask(p, how)}
                  onSelectTargets={(idx, additive) => store.updateSession((s) => {
                    const next = additive ? new Set(s.selection) : new Set<number>();
                    for (const i of idx) next.add(i);
                    return { ...s, selection: next };
                  })}
                  onSelectMask={(id) => store.updateSession((s) => ({ ...s, activeMaskId: id }))}
                  onPreviewEnd={() => c.setLivePose(null)}
                  paSnapDeg={session.paSnapDeg}
                  centreSnapArcsec={session.centreSnapArcsec}
                  focus={skyFocus}
                />
              </div>
            </div>
            {tableData && (
              <TargetTable c={c} data={tableData} selection={session.selection} overrides={tableOverrides} />
            )}
          </main>
          <aside className="side right">
            <YieldPanel c={c} />
            <CoveragePanel c={c} galaxyPaDeg={galaxy.paDeg} />
            <ObservabilityPanel c={c} galaxy={galaxy} />
            <ForecastPanel c={c} />
            {session.catalog && <RejectReport key={`${session.catalog.source}:${session.catalog.rowsRead}:${session.catalog.rejects.length}`} catalog={session.catalog} name={session.catalogFile?.name ?? session.catalog.source} reveal={session.revealRejects} />}
          </aside>
        </div>
      )}
      {dragOver && <div className="drop-hint">Drop a plan, catalog, profile or FITS image</div>}
    </div>
  );
}

function safeGalaxy(plan: Parameters<typeof galaxyModel>[0]) {
  try { return galaxyModel(plan); } catch { return null; }
}

/** Save the plan file of the contract (a download named like the opened plan), and the profile file it names if any. */
export function savePlan(c: EditorController): void {
  if (!c.store) return;
  // A profile of the user's own (opened from a file, or edited) is saved beside the plan, which names that file.
  for (const f of c.savedFiles()) downloadFile(f.name, f.content, 'application/json');
  c.markSaved();
}
