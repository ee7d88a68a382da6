/** The export menu: the CLI's output files one by one or all at once, the slit list in other formats, and mask charts. */
import { useState } from 'react';
import type { EditorController } from '../controller';
import { downloadFile } from '../io/download';
import { FOLDER_FILES, maskChartFiles, maskChartName, outputFolderFiles, type ExportFile } from '../io/exports';
import { FORMAT_FILES, slitListFiles } from '../io/slitFormats';

export function ExportMenu({ c }: { c: EditorController }) {
  const [open, setOpen] = useState(false);
  const sol = c.session.solution;
  const catalog = c.session.catalog;
  const ready = !!(sol && catalog && c.store);
  const files = (): { folder: ExportFile[]; formats: ExportFile[]; charts: ExportFile[] } => {
    if (!ready) return { folder: [], formats: [], charts: [] };
    const profile = c.store!.doc.profile;
    return {
      folder: outputFolderFiles(sol!.result, profile, catalog!),
      formats: slitListFiles(sol!.result, profile),
      charts: maskChartFiles(sol!.result, profile, c.store!.doc.plan.goals.tracerReachRe),
    };
  };
  const save = (list: ExportFile[]) => list.forEach((f) => downloadFile(f.name, f.content, f.mime));
  // Only the names are needed to draw the menu; file contents are made when a file is asked for.
  const names = ready && open ? {
    folder: FOLDER_FILES.map((name) => ({ name })),
    formats: FORMAT_FILES.map((name) => ({ name })),
    charts: sol!.result.masks.map((m) => ({ name: maskChartName(m.mask.id) })),
  } : null;
  return (
    <div className="menu">
      <button disabled={!ready} onClick={() => setOpen(!open)} data-testid="export-menu" aria-expanded={open}>Export ▾</button>
      {open && names && (
        <div className="menu-pop" onMouseLeave={() => setOpen(false)}>
          <div className="menu-title">Output folder (as <code>haloweave plan</code> writes it)</div>
          <button data-testid="export-all" onClick={() => save(files().folder)}>All six files (with manifest.json)</button>
          {names.folder.map((f) => (
            <button key={f.name} data-testid={`export-${f.name}`} onClick={() => save(files().folder.filter((x) => x.name === f.name))}>{f.name}</button>
          ))}
          <div className="menu-title">Slit list in other formats</div>
          {names.formats.map((f) => (
            <button key={f.name} data-testid={`export-${f.name}`} onClick={() => save(files().formats.filter((x) => x.name === f.name))}>{f.name}</button>
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
