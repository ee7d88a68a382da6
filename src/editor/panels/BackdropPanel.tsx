/** A FITS image of the field under the overlays: open it, adjust black/white points, stretch and opacity. */
import { useEffect, useMemo, useState } from 'react';
import type { EditorController } from '../controller';
import { readFitsImage, type FitsImage } from '../../core/image/fitsImage';
import { pixelScaleArcsec } from '../../core/image/wcs';
import { DEFAULT_SCALING, fitsBackdrop, pixelSample, renderImage, type Scaling, type Stretch } from '../view/fitsBackdrop';
import type { Backdrop } from '../view/backdrop';
import { Panel } from './Panel';

export interface BackdropState {
  image: FitsImage | null;
  name: string | null;
  scaling: Scaling;
  setScaling(s: Scaling): void;
  drawable: Backdrop | null;
  openImage(file: File): Promise<void>;
  clear(): void;
}

export function useBackdrop(c: EditorController): BackdropState {
  const [image, setImage] = useState<FitsImage | null>(null);
  const [name, setName] = useState<string | null>(null);
  const [scaling, setScaling] = useState<Scaling>(DEFAULT_SCALING);
  const sample = useMemo(() => (image ? pixelSample(image.data) : null), [image]);
  const canvas = useMemo(() => (image && sample ? renderImage(image, sample, scaling) : null), [image, sample, scaling.lowPct, scaling.highPct, scaling.stretch]);
  const drawable = useMemo(() => (image && canvas ? fitsBackdrop(image, canvas, scaling.opacity) : null), [image, canvas, scaling.opacity]);
  useEffect(() => { c.store?.updateSession((s) => ({ ...s, backdropName: name })); }, [name]); // eslint-disable-line react-hooks/exhaustive-deps
  return {
    image, name, scaling, setScaling, drawable,
    async openImage(file: File) {
      const bytes = new Uint8Array(await file.arrayBuffer());
      const r = readFitsImage(bytes);
      if (!r.ok) {
        c.notify('error', `${file.name} cannot be placed on the sky (no usable WCS)`, [
          { where: file.name, what: r.error, fix: 'use an image with a TAN WCS (CTYPE1 RA---TAN, CTYPE2 DEC--TAN, CRVAL, CRPIX and CD or CDELT/PC)' },
        ]);
        return;
      }
      setImage(r.value);
      setName(file.name);
      for (const w of r.value.warnings) c.notify('warning', `${file.name}: ${w}`);
      c.notify('info', `${file.name}: ${r.value.widthPx} × ${r.value.heightPx} px at ${pixelScaleArcsec(r.value.wcs).toFixed(3)}″/px shown under the plan`);
    },
    clear() { setImage(null); setName(null); },
  };
}

export function BackdropPanel({ backdrop }: { c: EditorController; backdrop: BackdropState }) {
  const s = backdrop.scaling;
  const set = (p: Partial<Scaling>) => backdrop.setScaling({ ...s, ...p });
  return (
    <Panel key={backdrop.name ?? "none"} title="Sky image" testId="panel-backdrop" startOpen={!!backdrop.image}>
      {!backdrop.image ? (
        <p className="dim small">Open or drop a FITS image of the field (with a TAN WCS) to see it under the plan.</p>
      ) : (
        <div className="backdrop-controls" data-testid="backdrop-controls">
          <div className="kv"><span>image</span><span data-testid="backdrop-name">{backdrop.name}</span></div>
          <label className="slider">black at {s.lowPct.toFixed(1)} %
            <input type="range" data-testid="backdrop-low" min={0} max={50} step={0.5} value={s.lowPct} onChange={(e) => set({ lowPct: Number(e.target.value) })} /></label>
          <label className="slider">white at {s.highPct.toFixed(1)} %
            <input type="range" data-testid="backdrop-high" min={50} max={100} step={0.1} value={s.highPct} onChange={(e) => set({ highPct: Number(e.target.value) })} /></label>
          <label className="slider">show {Math.round(s.opacity * 100)} %
            <input type="range" data-testid="backdrop-opacity" min={0.1} max={1} step={0.05} value={s.opacity} onChange={(e) => set({ opacity: Number(e.target.value) })} /></label>
          <label className="field"><span className="field-label">stretch</span>
            <select value={s.stretch} data-testid="backdrop-stretch" onChange={(e) => set({ stretch: e.target.value as Stretch })}>
              <option value="linear">linear</option><option value="sqrt">square root</option><option value="asinh">asinh</option><option value="log">log</option>
            </select></label>
          <button onClick={() => backdrop.clear()}>Remove image</button>
        </div>
      )}
    </Panel>
  );
}
