/**
 * The export menu: the whole output folder as one zip archive (what `haloweave plan` writes, with the catalog, so
 * `haloweave check` on it cross-checks the catalog), the CLI's output files one by one, the slit list in other
 * formats, and mask charts. Closes on Escape, on a click outside it, and after a download.
 */
import { useCallback, useRef, useState } from 'react';
import type { EditorController } from '../controller';
import { downloadFile } from '../io/download';
import { archiveFolderName, completeFolderFiles, FOLDER_FILES, maskChartFiles, maskChartName, outputFolderFiles, zipFolder, type ExportFile } from '../io/exports';
import { FORMAT_FILES, perInstrumentSlitFiles, slitListFiles } from '../io/slitFormats';
import { perInstrumentPath } from '../../core/export/perInstrument';
import { useDismissable } from './usePopup';

export function ExportMenu({ c }: { c: EditorController }) {
  const [open, setOpen] = useState(false);
  const root = useRef<HTMLDivElement>(null);
  const close = useCallback(() => setOpen(false), []);
  useDismissable(open, root, close);
  const sol = c.session.solution;
  const catalog = c.session.catalog;
  const ready = !!(sol && catalog && c.store);
  const files = (): { folder: ExportFile[]; formats: ExportFile[]; charts: ExportFile[]; perInstrument: ExportFile[] } => {
    if (!ready) return { folder: [], formats: [], charts: [], perInstrument: [] };
    const profile = c.store!.doc.profile;
    return {
      folder: outputFolderFiles(sol!.result, profile, catalog!),
      formats: slitListFiles(sol!.result, profile),
      charts: maskChartFiles(sol!.result, profile, c.store!.doc.plan.goals.tracerReachRe),
      perInstrument: perInstrumentSlitFiles(sol!.result, profile),
    };
  };
  const save = (list: ExportFile[]) => { list.forEach((f) => downloadFile(f.name, f.content, f.mime)); setOpen(false); };
  const saveArchive = () => {
    const folder = archiveFolderName(c.session.planName);
    const bytes = zipFolder(folder, completeFolderFiles(sol!.result, c.store!.doc.profile, catalog!, c.session.catalogFile));
    downloadFile(`${folder}.zip`, bytes, 'application/zip');
    setOpen(false);
  };
  // Only the names are needed to draw the menu; file contents are made when a file is asked for.
  const names = ready && open ? {
    folder: FOLDER_FILES.map((name) => ({ name })),
    formats: FORMAT_FILES.map((name) => ({ name })),
    charts: sol!.result.masks.map((m) => ({ name: maskChartName(m.mask.id) })),
    // A plan with several spectrographs: per format, one file per instrument (named as `haloweave export --per-instrument` does).
    instruments: sol!.result.plan.instruments?.length ? [...new Set(sol!.result.masks.map((m) => m.mask.instrument ?? c.store!.doc.profile.id))] : [],
  } : null;
  const perInstrumentOf = (format: string) => (names?.instruments ?? []).map((i) => perInstrumentPath(format, i));
  return (
    <div className="menu" ref={root}>
      <button disabled={!ready} onClick={() => setOpen(!open)} data-testid="export-menu" aria-expanded={open}>Export ▾</button>
      {open && names && (
        <div className="menu-pop" role="menu" data-testid="export-pop">
          <div className="menu-title">Output folder (as <code>haloweave plan</code> writes it)</div>
          <button data-testid="export-all" onClick={saveArchive}
            title="One zip archive: masks.csv, slits.csv, coverage.json, solved.plan.json, catalog-report.csv, excluded-targets.csv, the catalog and manifest.json">
            Whole folder as a zip archive</button>
          {names.folder.map((f) => (
            <button key={f.name} data-testid={`export-${f.name}`} onClick={() => save(files().folder.filter((x) => x.name === f.name))}>{f.name}</button>
          ))}
          <div className="menu-title">Slit list in other formats</div>
          {names.formats.map((f) => (
            <button key={f.name} data-testid={`export-${f.name}`} onClick={() => save(files().formats.filter((x) => x.name === f.name))}>{f.name}</button>
          ))}
          {names.instruments.length > 0 && <div className="menu-title">One slit list per instrument ({names.instruments.join(', ')})</div>}
          {names.instruments.length > 0 && FORMAT_FILES.map((f) => (
            <button key={f} data-testid={`export-per-instrument-${f}`} title={perInstrumentOf(f).join(', ')}
              onClick={() => { const want = new Set(perInstrumentOf(f)); save(files().perInstrument.filter((x) => want.has(x.name))); }}>
              {perInstrumentOf(f).join(' + ')}</button>
          ))}
          <div className="menu-title">Charts for a proposal</div>
          <button data-testid="export-charts" onClick={() => save(files().charts)}>SVG chart of every mask</button>
          {names.charts.map((f) => (
            <button key={f.name} data-testid={`export-${f.name}`} onClick={() => save(files().charts.filter((x) => x.name === f.name))}>{f.name}</button>
          ))}
        </div>
      )}
    </div>
  );
}
