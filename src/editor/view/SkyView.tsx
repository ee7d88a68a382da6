/**
 * The sky view: tangent plane about the galaxy centre, North up and East left. Layers, bottom to top:
 * backdrop image, catalog (a raster canvas, view/catalogBitmap.ts), galaxy isophotes, masks
 * (footprints, slits by role, rotate handles), the mask being moved (while one is), and a fixed overlay with compass
 * and scale bar. While the view pans or zooms, CSS transforms carry what was drawn; it is drawn again once it settles.
 * Mouse: drag empty sky to pan, wheel to zoom (pinch or Ctrl+wheel on a trackpad; two-finger scroll pans),
 * drag a mask to move it (where masks overlap, the active one is taken first and is drawn on top, else the one whose
 * centre is nearest; a click without moving steps to the next mask under the pointer), drag its round handle to
 * rotate it (kept inside the view; Shift snaps to 5°), click a target to select it, Shift+click to add, Shift+drag
 * for a box selection. Keys: arrows pan, + and - zoom, 0 fits, [ and ] turn the active mask by 1° (Shift 10°,
 * Alt 0.1°), N steps through the masks (Shift+N back).
 * At high zoom, slits are drawn at their true width, length and tilt.
 */
import { memo, useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type KeyboardEvent as ReactKeyboardEvent } from 'react';
import { Stage, Layer, Shape, Group, Line, Ellipse, Text, Circle, Rect } from 'react-konva';
import type Konva from 'konva';
import type { GalaxyModel } from '../../core/plan/schema';
import { maskFootprint } from './maskFootprints';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { MaskPointing, Slit } from '../../core/geometry/maskSolution';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../../core/sky/tangentPlane';
import { DEG_PER_RAD, wrap360Deg } from '../../core/sky/angles';
import { circularisedRadiusArcsec, skyToGalaxyArcsec } from '../../core/sky/frames';
import { formatDecDms, formatRaHms } from '../../core/sky/sexagesimal';
import { pointInPolygon } from '../../core/geometry/polygon';
import { slitCornersArcsec } from '../../core/geometry/slitGeometry';
import { fitCamera, maskGroupRotationDeg, panBy, scaleBarArcmin, screenToSky, skyToScreen, zoomAt, type Camera } from './camera';
import { nearestTarget, targetsInBox, type CatalogGeometry } from './catalogGeometry';
import { CatalogLayer, cssPlacement } from './catalogBitmap';
import { INK, ROLE_STYLE } from './palette';
import type { Backdrop } from './backdrop';

/** A mask as the view draws it: the core's pointing (its `instrument`, in a plan with several, picks the footprint drawn). */
export type MaskPose = MaskPointing;

export interface SkyViewProps {
  galaxy: GalaxyModel;
  tracerReachRe: number;
  starlightReachRe: number;
  profile: InstrumentProfile;
  masks: MaskPose[];
  slitsByMask: ReadonlyMap<string, Slit[]>;
  catalog: CatalogGeometry | null;
  /** Changes whenever the catalog geometry's classes or shades change, so the layer redraws. */
  catalogRevision: number;
  selected: ReadonlySet<number>;
  /** Per catalog index: 1 on a tracer slit, 2 in an alignment box, 0 otherwise. */
  onSlit: Uint8Array | null;
  activeMaskId: string | null;
  backdrop: Backdrop | null;
  onPreviewMask(pose: MaskPose): void;
  onCommitMask(pose: MaskPose, how: 'move' | 'rotate'): void;
  onSelectTargets(indices: number[], additive: boolean): void;
  onSelectMask(maskId: string | null): void;
  /** A drag or turn ended (committed or not): the live pose shown elsewhere goes back to the document's. */
  onPreviewEnd?(): void;
  /** Snap for turning with the handle, degrees (0: off; Shift while turning snaps to 5°). */
  paSnapDeg?: number;
  /** Centre steps for dragged masks: offsets from the galaxy centre rounded to this, arcsec (0 or absent: exact). */
  centreSnapArcsec?: number;
  /** Ask the view to bring a sky position (tangent plane about the galaxy centre, arcsec) into view; `n` changes per request. */
  focus?: { xiArcsec: number; etaArcsec: number; n: number } | null;
  /** Receives the camera on every change (used by the benchmark and the read-outs). */
  onCamera?(cam: Camera): void;
}

type Gesture =
  | { kind: 'pan'; lastX: number; lastY: number; moved: number; startX: number; startY: number; additive: boolean }
  | { kind: 'box'; startX: number; startY: number; x: number; y: number }
  | { kind: 'move'; maskId: string; startXi: number; startEta: number; maskXi: number; maskEta: number; startPose: MaskPose; pose: MaskPose; moved: boolean; under: string[]; wasActive: boolean }
  | { kind: 'rotate'; maskId: string; pose: MaskPose };

const HANDLE_PX = 7;
/** The handle's usual distance beyond the footprint's +y end, px; it is pulled in to stay this far inside the view. */
const HANDLE_GAP_PX = 26;
const HANDLE_MARGIN_PX = 16;
/** Slits are drawn as rectangles of their true width once the width covers this many screen pixels. */
const TRUE_WIDTH_MIN_PX = 2.5;

export function SkyView(props: SkyViewProps) {
  const { galaxy, profile, catalog, selected } = props;
  const boxRef = useRef<HTMLDivElement>(null);
  const catalogCanvasEl = useRef<HTMLCanvasElement>(null);
  const catalogLayer = useRef<CatalogLayer | null>(null);
  const worldRef = useRef<HTMLDivElement>(null);
  const backdropWorldRef = useRef<HTMLDivElement>(null);
  const scaleBarRef = useRef<HTMLDivElement>(null);
  const readoutRef = useRef<HTMLDivElement>(null);
  const cameraTestRef = useRef<HTMLDivElement>(null);
  const [size, setSize] = useState({ w: 800, h: 600 });
  // Two cameras: `cam` is what the overlays and the catalog were last drawn for (a React render), `view` is
  // what the user sees now. Between renders a CSS transform on the world layer maps one to the other, so a
  // pan or zoom costs the compositor a move per frame; the drawing catches up when the motion settles
  // or at once when the drawn area (twice the view) no longer covers the view.
  const [cam, setCam] = useState<Camera>(() => fitCamera(800, 600, galaxy.reArcsec * props.tracerReachRe));
  const camRef = useRef(cam);
  camRef.current = cam;
  const viewRef = useRef<Camera>(cam);
  const settleTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const lastRender = useRef(0);
  const renderCount = useRef(0);
  renderCount.current++;
  const gesture = useRef<Gesture | null>(null);
  // A dragged mask's newest pose waits here for the next animation frame: one render and one preview request per frame,
  // however many pointer events arrive in between.
  const framePose = useRef<MaskPose | null>(null);
  const frameReq = useRef(0);
  const flushPose = useCallback(() => {
    frameReq.current = 0;
    const pose = framePose.current;
    framePose.current = null;
    if (!pose) return;
    const g = gesture.current;
    if (g?.kind === 'move') {
      // A move: the mask's own layer is split off once (one render), then only translated (placeMoving).
      movedPose.current = pose;
      if (movingRef.current?.id === pose.id) placeMovingRef.current();
      else setMoving(g.startPose);
    } else setPreview(pose);
    previewRef.current(pose);
  }, []);
  const previewRef = useRef(props.onPreviewMask);
  previewRef.current = props.onPreviewMask;
  const queuePose = (pose: MaskPose) => {
    framePose.current = pose;
    if (!frameReq.current) frameReq.current = requestAnimationFrame(flushPose);
  };
  useEffect(() => () => { if (frameReq.current) cancelAnimationFrame(frameReq.current); }, []);
  const [preview, setPreview] = useState<MaskPose | null>(null);
  // A mask being moved is drawn once, at its pose when the move began (`moving`), on a layer of its own whose canvas a CSS
  // translation carries to the newest pose (`movedPose`): a move never turns a mask (North up, PA about its own centre),
  // so no frame of the move redraws a mask; the slits of each live re-solve redraw that layer only. A turn redraws.
  const [moving, setMoving] = useState<MaskPose | null>(null);
  const movingRef = useRef<MaskPose | null>(null);
  movingRef.current = moving;
  const movedPose = useRef<MaskPose | null>(null);
  const movingLayer = useRef<Konva.Layer>(null);
  const anchorList = useRef<HTMLUListElement>(null);
  /** The moving mask's test anchor as drawn at the start of the move (screen px: centre and handle). */
  const movingAnchor = useRef<{ id: string; cam: Camera; x: number; y: number; hx: number; hy: number } | null>(null);
  const [boxSel, setBoxSel] = useState<{ x0: number; y0: number; x1: number; y1: number } | null>(null);
  const centre = useMemo(() => tangentCentre(galaxy.raDeg, galaxy.decDeg), [galaxy.raDeg, galaxy.decDeg]);
  const fitted = useRef(false);

  // Follow the container's size.
  useEffect(() => {
    const el = boxRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, Math.floor(el.clientWidth)), h = Math.max(200, Math.floor(el.clientHeight));
      setSize({ w, h });
      setView((c) => (fitted.current ? { ...c, widthPx: w, heightPx: h } : fitCamera(w, h, galaxy.reArcsec * props.tracerReachRe * 1.05)), true);
      fitted.current = true;
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, []); // eslint-disable-line react-hooks/exhaustive-deps

  useEffect(() => { props.onCamera?.(cam); }, [cam]); // eslint-disable-line react-hooks/exhaustive-deps

  /** Apply the CSS transform that shows `viewRef` from the drawn `camRef`, and the read-outs that follow the view. */
  const placeWorld = useCallback(() => {
    const v = viewRef.current, r = camRef.current;
    const p = cssPlacement(r, v);
    const tf = `translate(${p.dx}px, ${p.dy}px) scale(${p.k})`;
    if (worldRef.current) worldRef.current.style.transform = tf;
    if (backdropWorldRef.current) backdropWorldRef.current.style.transform = tf;
    catalogLayer.current?.show(v);
    const bar = scaleBarArcmin(v.pxPerArcsec);
    const el = scaleBarRef.current;
    // Written only when they change: a write of the same text still makes the page lay out and paint again.
    const width = `${bar * 60 * v.pxPerArcsec}px`, label = formatArcmin(bar);
    if (el && el.style.width !== width) el.style.width = width;
    if (el && el.dataset.label !== label) { el.dataset.label = label; el.firstElementChild!.textContent = label; }
    const t = cameraTestRef.current;
    if (t) { t.dataset.pxPerArcsec = String(v.pxPerArcsec); t.dataset.xi = String(v.centreXiArcsec); t.dataset.eta = String(v.centreEtaArcsec); }
    return p;
  }, []);
  /** Change the view camera; the drawing follows later (or at once when `now` or when the drawn area runs out). */
  const setView = useCallback((next: Camera | ((c: Camera) => Camera), now = false) => {
    const v = typeof next === 'function' ? next(viewRef.current) : next;
    viewRef.current = v;
    const p = placeWorld();
    const t = performance.now();
    // The overlays are drawn for the view itself, so a pan shows empty edges until they catch up: allow a third of a view.
    const far = Math.abs(p.dx) > v.widthPx / 3 || Math.abs(p.dy) > v.heightPx / 3 || p.k < 0.6 || p.k > 1.8;
    if (now || far) {
      lastRender.current = t;
      if (settleTimer.current) clearTimeout(settleTimer.current);
      setCam(v);
      return;
    }
    if (settleTimer.current) clearTimeout(settleTimer.current);
    settleTimer.current = setTimeout(() => { lastRender.current = performance.now(); setCam(viewRef.current); }, 120);
  }, [placeWorld]);
  useEffect(() => () => { if (settleTimer.current) clearTimeout(settleTimer.current); }, []);
  // After each render for `cam`, place the world layer again (it may now be the identity).
  useEffect(() => { placeWorld(); }, [cam, placeWorld]);
  useEffect(() => {
    const layer = new CatalogLayer(catalogCanvasEl.current!);
    catalogLayer.current = layer;
    layer.show(viewRef.current);
    return () => layer.dispose();
  }, []);
  useEffect(() => {
    catalogLayer.current?.setData(catalog, selected, props.onSlit);
  }, [selected, catalog, props.catalogRevision, props.onSlit]);

  // Wheel: a native listener on the container (not through the stage's hit test), so it stays cheap per event.
  const wheelRef = useRef<(ev: WheelEvent) => void>(() => {});
  wheelRef.current = (ev: WheelEvent) => {
    ev.preventDefault();
    const rect = boxRef.current!.getBoundingClientRect();
    const p = { x: ev.clientX - rect.left, y: ev.clientY - rect.top };
    const mouseWheel = ev.deltaMode === 1 || (ev.deltaX === 0 && Math.abs(ev.deltaY) >= 40 && Number.isInteger(ev.deltaY));
    if (ev.ctrlKey || ev.metaKey || mouseWheel) {
      const unit = ev.deltaMode === 1 ? 33 : 1;
      const factor = Math.exp(-ev.deltaY * unit * (ev.ctrlKey ? 0.01 : 0.0015));
      setView((c) => zoomAt(c, factor, p.x, p.y));
    } else {
      setView((c) => panBy(c, -ev.deltaX, -ev.deltaY));
    }
  };
  useEffect(() => {
    const el = boxRef.current!;
    const h = (ev: WheelEvent) => wheelRef.current(ev);
    el.addEventListener('wheel', h, { passive: false });
    return () => el.removeEventListener('wheel', h);
  }, []);

  const maskXiEta = useCallback((m: { raDeg: number; decDeg: number }) => {
    const p = skyToTangentArcsec(centre, m.raDeg, m.decDeg);
    return p ?? { xiArcsec: 0, etaArcsec: 0 };
  }, [centre]);
  /** Translate the moving mask's layer from the pose it was drawn at to the newest pose (screen px at the drawn camera). */
  const placeMoving = useCallback(() => {
    const from = movingRef.current, el = movingLayer.current?.getNativeCanvasElement();
    if (!from || !el) return;
    const to = movedPose.current ?? from, s = camRef.current.pxPerArcsec;
    const a = maskXiEta(from), b = maskXiEta(to);
    const dx = -(b.xiArcsec - a.xiArcsec) * s, dy = -(b.etaArcsec - a.etaArcsec) * s;
    el.style.willChange = 'transform';
    el.style.transform = `translate(${dx}px, ${dy}px)`;
    // The hidden anchor list (tests, benchmark) follows the moving mask too: its entry as drawn, moved by the same offset.
    const li = anchorList.current?.querySelector<HTMLElement>(`li[data-mask-id="${CSS.escape(from.id)}"]`);
    if (!li) return;
    // Taken again when the drawing was made afresh (another mask, or another camera: React then wrote the entry anew).
    if (movingAnchor.current?.id !== from.id || movingAnchor.current.cam !== camRef.current) {
      movingAnchor.current = { id: from.id, cam: camRef.current, x: Number(li.dataset.x), y: Number(li.dataset.y), hx: Number(li.dataset.handleX), hy: Number(li.dataset.handleY) };
    }
    const m = movingAnchor.current;
    li.dataset.x = (m.x + dx).toFixed(1); li.dataset.y = (m.y + dy).toFixed(1);
    li.dataset.handleX = (m.hx + dx).toFixed(1); li.dataset.handleY = (m.hy + dy).toFixed(1);
  }, [maskXiEta]);
  const placeMovingRef = useRef(placeMoving);
  placeMovingRef.current = placeMoving;
  useLayoutEffect(() => { placeMoving(); });

  const shownMasks = props.masks.map((m) => (preview && preview.id === m.id ? preview : m));
  /** Ids of the masks whose footprint holds sky point (xi, eta), topmost (drawn last) first. */
  const masksUnder = (xiArcsec: number, etaArcsec: number, order: readonly MaskPose[]): string[] => {
    const out: string[] = [];
    for (let k = order.length - 1; k >= 0; k--) {
      const m = order[k], c = maskXiEta(m);
      const pa = (m.paDeg * Math.PI) / 180, dx = xiArcsec - c.xiArcsec, dy = etaArcsec - c.etaArcsec;
      // Mask frame of the contract: y = xi sin PA + eta cos PA, x = xi cos PA - eta sin PA (offsets from the centre).
      // Each mask's own footprint (plan key instruments): a wide field is picked where it extends beyond a narrow one.
      const polygon = maskFootprint(profile, m.instrument).polygon;
      if (pointInPolygon(dx * Math.cos(pa) - dy * Math.sin(pa), dx * Math.sin(pa) + dy * Math.cos(pa), polygon)) out.push(m.id);
    }
    return out;
  };
  const footprintYMax = useMemo(() => Math.max(...profile.footprint.map((c) => c[1])), [profile.footprint]);
  const footprintPoints = useMemo(() => profile.footprint.flatMap((c) => [c[0], c[1]]), [profile.footprint]);
  // A mask of another spectrograph (plan key instruments) is drawn with its own profile's footprint.
  const ownFootprint = (maskId: string) => {
    const instrument = props.masks.find((m) => m.id === maskId)?.instrument;
    if (instrument === undefined || instrument === profile.id) return { footprintPoints, footprintYMax };
    const f = maskFootprint(profile, instrument);
    return { footprintPoints: f.points, footprintYMax: f.yMaxArcsec };
  };

  // ---- pointer gestures ----
  const stagePointer = (e: Konva.KonvaEventObject<MouseEvent>) => e.target.getStage()!.getPointerPosition() ?? { x: 0, y: 0 };

  const onMouseDown = (e: Konva.KonvaEventObject<MouseEvent>) => {
    if (e.evt.button !== 0) return;
    boxRef.current?.focus({ preventScroll: true });
    const p = stagePointer(e);
    const name = e.target.name();
    const nodeId = e.target.id();
    const maskId = nodeId.includes(':') ? nodeId.slice(nodeId.indexOf(':') + 1) : undefined;
    if (maskId && (name === 'mask-body' || name === 'mask-handle')) {
      const s = screenToSky(cam, p.x, p.y);
      // Overlapping masks: the active mask is the one taken when it lies under the pointer, else the one whose centre
      // (where its label is) is nearest the pointer.
      const under = name === 'mask-body' ? masksUnder(s.xiArcsec, s.etaArcsec, drawOrder) : [];
      const active = props.activeMaskId;
      const nearest = (ids: string[]) => ids.reduce((best, mid) => {
        const d = (q: string) => { const c = maskXiEta(shownMasks.find((m) => m.id === q)!); return Math.hypot(c.xiArcsec - s.xiArcsec, c.etaArcsec - s.etaArcsec); };
        return d(mid) < d(best) ? mid : best;
      });
      const id = name !== 'mask-body' || under.length === 0 ? maskId : active && under.includes(active) ? active : nearest(under);
      const pose = shownMasks.find((m) => m.id === id)!;
      props.onSelectMask(id);
      props.onPreviewMask(pose); // warms the worker's live re-solve before the first move
      if (name === 'mask-handle') {
        gesture.current = { kind: 'rotate', maskId: id, pose };
      } else {
        const c = maskXiEta(pose);
        gesture.current = { kind: 'move', maskId: id, startXi: s.xiArcsec, startEta: s.etaArcsec, maskXi: c.xiArcsec, maskEta: c.etaArcsec, startPose: pose, pose, moved: false, under, wasActive: id === active };
      }
      return;
    }
    if (e.evt.shiftKey) {
      gesture.current = { kind: 'box', startX: p.x, startY: p.y, x: p.x, y: p.y };
      return;
    }
    // Pan in client pixels: the stage itself moves under the pointer while the view pans.
    gesture.current = { kind: 'pan', lastX: e.evt.clientX, lastY: e.evt.clientY, moved: 0, startX: p.x, startY: p.y, additive: e.evt.shiftKey };
  };

  const onMouseMove = (e: Konva.KonvaEventObject<MouseEvent>) => {
    const p = stagePointer(e);
    const s = screenToSky(cam, p.x, p.y);
    if (readoutRef.current) readoutRef.current.textContent = describePointer({ xi: s.xiArcsec, eta: s.etaArcsec }, centre, galaxy);
    const g = gesture.current;
    if (!g) return;
    if (g.kind === 'pan') {
      const dx = e.evt.clientX - g.lastX, dy = e.evt.clientY - g.lastY;
      g.lastX = e.evt.clientX; g.lastY = e.evt.clientY;
      g.moved += Math.abs(dx) + Math.abs(dy);
      if (dx || dy) setView((c) => panBy(c, dx, dy));
    } else if (g.kind === 'box') {
      g.x = p.x; g.y = p.y;
      setBoxSel({ x0: g.startX, y0: g.startY, x1: p.x, y1: p.y });
    } else if (g.kind === 'move') {
      // Offsets from the galaxy centre on the centre steps (view/centreSnap.ts), as a typed centre.
      const step = props.centreSnapArcsec && props.centreSnapArcsec > 0 ? props.centreSnapArcsec : 0;
      const onStep = (v: number) => (step ? Math.round(v / step) * step : v);
      const xi = onStep(g.maskXi + (s.xiArcsec - g.startXi)), eta = onStep(g.maskEta + (s.etaArcsec - g.startEta));
      const sky = tangentToSkyDeg(centre, xi, eta);
      const pose = { ...g.pose, raDeg: sky.raDeg, decDeg: sky.decDeg };
      g.pose = pose; g.moved = true;
      queuePose(pose);
    } else if (g.kind === 'rotate') {
      const c = maskXiEta(g.pose);
      const dXi = s.xiArcsec - c.xiArcsec, dEta = s.etaArcsec - c.etaArcsec;
      if (Math.hypot(dXi, dEta) * cam.pxPerArcsec < 4) return;
      // PA of the pointer seen from the mask centre, degrees East of North: the handle sits on +y.
      const snap = e.evt.shiftKey ? 5 : props.paSnapDeg && props.paSnapDeg > 0 ? props.paSnapDeg : 0.1;
      const paDeg = wrap360Deg(Math.round(Math.round(wrap360Deg(Math.atan2(dXi, dEta) * DEG_PER_RAD) / snap) * snap * 10) / 10);
      const pose = { ...g.pose, paDeg };
      g.pose = pose;
      queuePose(pose);
    }
  };

  const endGesture = (e: Konva.KonvaEventObject<MouseEvent> | null) => {
    const g = gesture.current;
    gesture.current = null;
    if (!g) return;
    // A pose still waiting for its frame is superseded by the commit (or dropped with the gesture).
    if (frameReq.current) { cancelAnimationFrame(frameReq.current); frameReq.current = 0; }
    framePose.current = null;
    if (g.kind === 'move') {
      if (g.moved) props.onCommitMask(g.pose, 'move');
      else if (g.wasActive && g.under.length > 1) {
        // A click (no move) on the active mask where masks overlap: the next mask under the pointer becomes active.
        props.onSelectMask(g.under[(g.under.indexOf(g.maskId) + 1) % g.under.length]);
      }
      setMoving(null);
      movedPose.current = null;
      movingAnchor.current = null;
      setPreview(null);
      props.onPreviewEnd?.();
    } else if (g.kind === 'rotate') {
      if (g.pose.paDeg !== props.masks.find((m) => m.id === g.maskId)?.paDeg) props.onCommitMask(g.pose, 'rotate');
      setPreview(null);
      props.onPreviewEnd?.();
    } else if (g.kind === 'box') {
      setBoxSel(null);
      if (catalog) {
        const a = screenToSky(cam, g.startX, g.startY), b = screenToSky(cam, g.x, g.y);
        props.onSelectTargets(targetsInBox(catalog, a.xiArcsec, a.etaArcsec, b.xiArcsec, b.etaArcsec), true);
      }
    } else if (g.kind === 'pan' && g.moved < 4 && e) {
      const s = screenToSky(cam, g.startX, g.startY);
      const i = catalog ? nearestTarget(catalog, s.xiArcsec, s.etaArcsec, 8 / cam.pxPerArcsec) : -1;
      if (i >= 0) props.onSelectTargets([i], e.evt.shiftKey);
      else { props.onSelectTargets([], false); props.onSelectMask(null); }
    }
  };

  const onKeyDown = (e: ReactKeyboardEvent) => {
    const step = e.shiftKey ? 200 : 60;
    const k = e.key;
    let handled = true;
    if (k === 'ArrowLeft') setView((c) => panBy(c, step, 0), true);
    else if (k === 'ArrowRight') setView((c) => panBy(c, -step, 0), true);
    else if (k === 'ArrowUp') setView((c) => panBy(c, 0, step), true);
    else if (k === 'ArrowDown') setView((c) => panBy(c, 0, -step), true);
    else if (k === '+' || k === '=') setView((c) => zoomAt(c, 1.25, c.widthPx / 2, c.heightPx / 2), true);
    else if (k === '-' || k === '_') setView((c) => zoomAt(c, 0.8, c.widthPx / 2, c.heightPx / 2), true);
    else if (k === '0') setView(fitCamera(size.w, size.h, galaxy.reArcsec * props.tracerReachRe * 1.05), true);
    else if ((k === '[' || k === ']' || k === '{' || k === '}') && activePose && !gesture.current) {
      const stepDeg = e.altKey ? 0.1 : e.shiftKey ? 10 : 1;
      const sign = k === ']' || k === '}' ? 1 : -1;
      const paDeg = wrap360Deg(Math.round((activePose.paDeg + sign * stepDeg) * 10) / 10);
      props.onCommitMask({ ...activePose, paDeg }, 'rotate');
    } else if ((k === 'n' || k === 'N') && props.masks.length > 0 && !e.ctrlKey && !e.metaKey && !e.altKey) {
      // N steps through the masks (Shift+N backwards); the active one is drawn on top.
      const i = props.masks.findIndex((m) => m.id === props.activeMaskId);
      const n = props.masks.length;
      props.onSelectMask(props.masks[(i < 0 ? (e.shiftKey ? n - 1 : 0) : i + (e.shiftKey ? n - 1 : 1)) % n].id);
    } else handled = false;
    if (handled) e.preventDefault();
  };

  // ---- drawing ----
  const gc = skyToScreen(cam, 0, 0);
  const galaxyRot = -(90 + galaxy.paDeg);
  const activePose = shownMasks.find((m) => m.id === props.activeMaskId) ?? null;
  // The active mask is drawn last, so it is on top where masks overlap (and its body is the one the pointer finds).
  const drawOrder = activePose ? [...shownMasks.filter((m) => m !== activePose), activePose] : shownMasks;
  // Each shown mask's centre on the screen, once per render (masks, labels and the test anchors use it).
  const onScreen = drawOrder.map((m) => {
    const c = maskXiEta(m);
    const sp = skyToScreen(cam, c.xiArcsec, c.etaArcsec);
    return { m, sp, handlePx: handleDistancePx(sp, m.paDeg, ownFootprint(m.id).footprintYMax * cam.pxPerArcsec + HANDLE_GAP_PX + HANDLE_PX, size.w, size.h) };
  });
  const labels = placeLabels(onScreen.map(({ m, sp }) => ({ id: m.id, text: `${m.id}${m.locked ? ' (locked)' : ''}`, x: sp.x + 6, y: sp.y + 4 })));
  // The masks and labels of the masks' layer, and of the moving mask's own layer (empty unless a mask is moved).
  const movingId = moving?.id;
  const maskNodes = (which: (id: string) => boolean) => [
    ...onScreen.filter(({ m }) => which(m.id)).map(({ m, sp, handlePx }) => (
      <MaskShape key={m.id} id={m.id} xPx={sp.x} yPx={sp.y} paDeg={m.paDeg} locked={m.locked} pxPerArcsec={cam.pxPerArcsec}
        active={m.id === props.activeMaskId} slits={props.slitsByMask.get(m.id) ?? NO_SLITS} {...ownFootprint(m.id)}
        handlePx={handlePx} />
    )),
    ...labels.filter((l) => which(l.id)).map((l) => (
      <Text key={`t${l.id}`} listening={false} x={l.x} y={l.y} text={l.text} fontSize={12} fill={INK.text} />
    )),
  ];

  // A position asked for from elsewhere (a row of the target table): pan it to the middle when it is not well inside the view.
  const focusN = useRef(0);
  useEffect(() => {
    const f = props.focus;
    if (!f || f.n === focusN.current) return;
    focusN.current = f.n;
    const v = viewRef.current;
    const sp = skyToScreen(v, f.xiArcsec, f.etaArcsec);
    const mx = v.widthPx * 0.15, my = v.heightPx * 0.15;
    if (sp.x < mx || sp.x > v.widthPx - mx || sp.y < my || sp.y > v.heightPx - my) {
      setView((c) => ({ ...c, centreXiArcsec: f.xiArcsec, centreEtaArcsec: f.etaArcsec }), true);
    }
  }, [props.focus, setView]);

  return (
    <div
      ref={boxRef}
      className="sky-view"
      data-testid="sky-view"
      tabIndex={0}
      onKeyDown={onKeyDown}
      onMouseLeave={() => { if (readoutRef.current) readoutRef.current.textContent = HINT; }}
      aria-label="Sky view: drag to pan, wheel to zoom, arrows and + - keys"
    >
      <div className="sky-world backdrop-world" ref={backdropWorldRef}>
        <BackdropCanvas backdrop={props.backdrop} cam={cam} centre={centre} />
      </div>
      <canvas ref={catalogCanvasEl} className="catalog-canvas" data-testid="catalog-canvas" />
      <div className="sky-world" ref={worldRef}>
      <Stage
        className="sky-stage"
        width={size.w}
        height={size.h}
        onMouseDown={onMouseDown}
        onMouseMove={onMouseMove}
        onMouseUp={(e) => endGesture(e)}
        onMouseLeave={() => endGesture(null)}
      >
        {/* Isophotes on their own layer, drawn again only when the view or the galaxy changes: a drag redraws only the masks' layer. */}
        <Layer listening={false}>
          <Isophotes xPx={gc.x} yPx={gc.y} pxPerRe={galaxy.reArcsec * cam.pxPerArcsec} axisRatio={galaxy.axisRatio} rotationDeg={galaxyRot}
            tracerReachRe={props.tracerReachRe} starlightReachRe={props.starlightReachRe} />
        </Layer>
        {/* While a mask is dragged or turned (a preview is shown) nothing on this layer needs the mouse: the gesture
            follows the stage's pointer, so Konva skips redrawing the hit canvas on every frame. */}
        <Layer listening={!preview && !moving}>
          {maskNodes((id) => id !== movingId)}
          {boxSel && (
            <Rect x={Math.min(boxSel.x0, boxSel.x1)} y={Math.min(boxSel.y0, boxSel.y1)} width={Math.abs(boxSel.x1 - boxSel.x0)}
              height={Math.abs(boxSel.y1 - boxSel.y0)} stroke={INK.selection} dash={[4, 3]} strokeWidth={1} />
          )}
        </Layer>
        {moving && <Layer listening={false} ref={movingLayer}>{maskNodes((id) => id === movingId)}</Layer>}
      </Stage>
      </div>
      <Compass />
      <div className="scale-bar" data-testid="scale-bar" ref={scaleBarRef}><span /></div>
      {activePose && (
        <div className="pa-readout" data-testid="pa-readout">{activePose.id} · PA {activePose.paDeg.toFixed(1)}° E of N</div>
      )}
      <div className="sky-readout" data-testid="sky-readout" ref={readoutRef}>{HINT}</div>
      <ul className="test-anchors" data-testid="mask-anchors" hidden ref={anchorList}>
        {shownMasks.map((sm) => onScreen.find((o) => o.m.id === sm.id)!).map(({ m, sp, handlePx }) => {
          const pa = (m.paDeg * Math.PI) / 180;
          return (
            <li key={m.id} data-mask-id={m.id} data-x={sp.x.toFixed(1)} data-y={sp.y.toFixed(1)} data-pa={m.paDeg.toFixed(2)}
              data-handle-x={(sp.x - Math.sin(pa) * handlePx).toFixed(1)} data-handle-y={(sp.y - Math.cos(pa) * handlePx).toFixed(1)} />
          );
        })}
      </ul>
      <ul className="test-anchors" data-testid="mask-labels" hidden>
        {labels.map((l) => <li key={l.id} data-mask-id={l.id} data-x={l.x.toFixed(1)} data-y={l.y.toFixed(1)} data-w={l.w.toFixed(1)} />)}
      </ul>
      <div hidden data-testid="camera" ref={cameraTestRef} data-renders={renderCount.current} />
    </div>
  );
}

const NO_SLITS: readonly Slit[] = [];
const DASH_NONE: number[] = [];
const DASH_FREE_MASK = [10, 5];
const DASH_STARLIGHT_GOAL = [8, 5];
const DASH_RING = [2, 4];

/**
 * Isophotes at 1, 2, ... ceil(tracer goal) Re about the galaxy centre (screen px), labelled at 1-3 Re, every 5 Re and
 * the last; memoised on plain numbers, so a render that changes neither the view nor the galaxy leaves the layer alone.
 */
const Isophotes = memo(function Isophotes({ xPx, yPx, pxPerRe, axisRatio, rotationDeg, tracerReachRe, starlightReachRe }: {
  xPx: number; yPx: number; pxPerRe: number; axisRatio: number; rotationDeg: number; tracerReachRe: number; starlightReachRe: number;
}) {
  const maxRing = Math.max(1, Math.ceil(tracerReachRe));
  const rings = Array.from({ length: maxRing }, (_, i) => i + 1);
  const sq = Math.sqrt(axisRatio);
  const a = (rotationDeg * Math.PI) / 180;
  return (
    <>
      {rings.map((k) => {
        const goalTracer = k === Math.round(tracerReachRe);
        const goalStar = k === Math.round(starlightReachRe);
        return (
          <Ellipse
            key={k}
            listening={false}
            x={xPx}
            y={yPx}
            radiusX={(k * pxPerRe) / sq}
            radiusY={k * pxPerRe * sq}
            rotation={rotationDeg}
            stroke={goalStar ? ROLE_STYLE.starlight.colour : goalTracer ? INK.isophoteGoal : INK.isophote}
            strokeWidth={goalTracer || goalStar ? 1.4 : 0.8}
            dash={goalStar ? DASH_STARLIGHT_GOAL : k % 5 === 0 ? DASH_NONE : DASH_RING}
            opacity={goalTracer || goalStar ? 0.95 : 0.55}
            perfectDrawEnabled={false}
          />
        );
      })}
      {rings.filter((k) => k <= 3 || k % 5 === 0 || k === maxRing).map((k) => {
        const r = (k * pxPerRe) / sq;
        return (
          <Text key={`l${k}`} listening={false} x={xPx + Math.cos(a) * r + 3} y={yPx + Math.sin(a) * r - 12}
            text={`${k} Re`} fontSize={11} fill={INK.textDim} />
        );
      })}
    </>
  );
});

/**
 * One mask: footprint, slits by role and the rotate handle, drawn in the mask frame (arcsec) about its centre at
 * (xPx, yPx); memoised, so while one mask is dragged the others are not touched.
 */
const MaskShape = memo(function MaskShape({ id, xPx, yPx, paDeg, locked, pxPerArcsec: s, active, slits, footprintPoints, footprintYMax, handlePx }: {
  id: string; xPx: number; yPx: number; paDeg: number; locked: boolean; pxPerArcsec: number; active: boolean;
  slits: readonly Slit[]; footprintPoints: number[]; footprintYMax: number;
  /** Distance of the rotate handle's centre from the mask centre along +y, screen px. */
  handlePx: number;
}) {
  const drawScene = useCallback((ctx: Konva.Context) => drawSlits(ctx._context as CanvasRenderingContext2D, slits, s), [slits, s]);
  const handleY = handlePx / s;
  const stem = useMemo(() => (handleY > footprintYMax ? [0, footprintYMax, 0, handleY - HANDLE_PX / s] : [0, 0, 0, handleY - HANDLE_PX / s]), [footprintYMax, handleY, s]);
  return (
    <Group x={xPx} y={yPx} rotation={maskGroupRotationDeg(paDeg)} scaleX={s} scaleY={s}>
      <Line
        name="mask-body"
        id={`body:${id}`}
        points={footprintPoints}
        closed
        fill={active ? 'rgba(255,255,255,0.09)' : INK.footprintFill}
        stroke={active ? INK.footprintActive : INK.footprint}
        strokeWidth={active ? 2 : 1.2}
        strokeScaleEnabled={false}
        dash={locked ? DASH_NONE : DASH_FREE_MASK}
        opacity={0.9}
        perfectDrawEnabled={false}
      />
      <Shape listening={false} sceneFunc={drawScene} />
      <Line listening={false} points={stem} stroke={INK.footprint} strokeWidth={1} strokeScaleEnabled={false} />
      <Circle
        name="mask-handle"
        id={`handle:${id}`}
        x={0}
        y={handleY}
        radius={HANDLE_PX / s}
        fill={active ? INK.footprintActive : '#aab4c2'}
        stroke="#000"
        strokeWidth={1}
        strokeScaleEnabled={false}
      />
    </Group>
  );
});

/**
 * Slits and boxes of one mask in the mask frame (ctx already carries the mask transform at `scale` px/arcsec). Slits
 * are lines at low zoom; once their width covers TRUE_WIDTH_MIN_PX they are their true rectangles (width, length
 * below and above the target, tilt), outlined in the role's line style over a faint fill.
 */
function drawSlits(ctx: CanvasRenderingContext2D, slits: readonly Slit[], scale: number): void {
  const px = 1 / scale;
  for (const role of ['sky', 'starlight', 'tracer'] as const) {
    const st = ROLE_STYLE[role];
    ctx.beginPath();
    let asRects = false;
    for (const sl of slits) {
      if (sl.role !== role) continue;
      if (sl.widthArcsec * scale >= TRUE_WIDTH_MIN_PX) {
        asRects = true;
        const q = slitCornersArcsec(sl);
        ctx.moveTo(q[0][0], q[0][1]);
        for (let k = 1; k < q.length; k++) ctx.lineTo(q[k][0], q[k][1]);
        ctx.closePath();
      } else {
        ctx.moveTo(sl.xArcsec, sl.yArcsec - sl.lenBelowArcsec);
        ctx.lineTo(sl.xArcsec, sl.yArcsec + sl.lenAboveArcsec);
      }
    }
    if (asRects) {
      ctx.globalAlpha = 0.25;
      ctx.fillStyle = st.colour;
      ctx.fill();
      ctx.globalAlpha = 1;
    }
    ctx.strokeStyle = st.colour;
    ctx.lineWidth = asRects ? 1.4 * px : Math.max(2.2 * px, 0);
    ctx.setLineDash(st.dash.map((d) => d * px));
    ctx.lineCap = 'butt';
    ctx.stroke();
  }
  ctx.setLineDash([]);
  ctx.beginPath();
  for (const sl of slits) {
    if (sl.role !== 'alignment') continue;
    const h = Math.max(sl.widthArcsec / 2, 4 * px);
    ctx.rect(sl.xArcsec - h, sl.yArcsec - h, 2 * h, 2 * h);
  }
  ctx.strokeStyle = ROLE_STYLE.alignment.colour;
  ctx.lineWidth = 1.8 * px;
  ctx.stroke();
}

const HINT = 'drag to pan · wheel to zoom · drag a mask · round handle or [ ] turns';

/**
 * Distance (screen px) from a mask centre `c` to its rotate handle along the mask's +y direction (PA East of North,
 * North up, East left: screen direction (-sin PA, -cos PA)): the usual `wantPx`, pulled in so the handle stays
 * HANDLE_MARGIN_PX inside a w x h view, but not nearer the centre than 30 px.
 */
export function handleDistancePx(c: { x: number; y: number }, paDeg: number, wantPx: number, w: number, h: number): number {
  const pa = (paDeg * Math.PI) / 180, dx = -Math.sin(pa), dy = -Math.cos(pa);
  const m = HANDLE_MARGIN_PX;
  if (c.x < m || c.y < m || c.x > w - m || c.y > h - m) return wantPx;
  let t = wantPx;
  if (dx > 1e-9) t = Math.min(t, (w - m - c.x) / dx); else if (dx < -1e-9) t = Math.min(t, (m - c.x) / dx);
  if (dy > 1e-9) t = Math.min(t, (h - m - c.y) / dy); else if (dy < -1e-9) t = Math.min(t, (m - c.y) / dy);
  return Math.max(30, t);
}

/** Mask labels placed without overlapping one another: each goes down in steps of a line until it is clear. */
export function placeLabels(items: { id: string; text: string; x: number; y: number }[]): { id: string; text: string; x: number; y: number; w: number }[] {
  const LINE = 14, CHAR = 7;
  const placed: { id: string; text: string; x: number; y: number; w: number }[] = [];
  for (const it of [...items].sort((a, b) => a.y - b.y || a.x - b.x)) {
    const w = it.text.length * CHAR;
    let y = it.y;
    for (let k = 0; k < 12 && placed.some((p) => it.x < p.x + p.w && p.x < it.x + w && y < p.y + LINE && p.y < y + LINE); k++) y += LINE;
    placed.push({ ...it, y, w });
  }
  return placed;
}

/** North and East arrows for a view drawn North up, East left. */
function Compass() {
  return (
    <svg className="compass" width={104} height={104} viewBox="-52 -52 104 104" data-testid="compass" aria-label="North up, East left">
      <circle r={50} fill="rgba(10,13,18,0.6)" />
      <g stroke={INK.compass} strokeWidth={2} fill={INK.compass}>
        <line x1={0} y1={0} x2={0} y2={-30} /><polygon points="-5,-28 5,-28 0,-38" />
        <line x1={0} y1={0} x2={-30} y2={0} /><polygon points="-28,-5 -28,5 -38,0" />
      </g>
      <text x={0} y={-41} textAnchor="middle" fontSize={12} fontWeight="bold" fill={INK.compass}>N</text>
      <text x={-44} y={4} textAnchor="middle" fontSize={12} fontWeight="bold" fill={INK.compass}>E</text>
    </svg>
  );
}

function formatArcmin(a: number): string {
  if (a >= 1) return `${a} arcmin`;
  return `${Math.round(a * 60)} arcsec`;
}

/** Pointer read-out: RA/Dec, offsets from the galaxy centre and elliptical radius in Re. */
function describePointer(p: { xi: number; eta: number }, centre: ReturnType<typeof tangentCentre>, galaxy: GalaxyModel): string {
  const sky = tangentToSkyDeg(centre, p.xi, p.eta);
  const g = skyToGalaxyArcsec(p.xi, p.eta, galaxy.paDeg);
  const rRe = circularisedRadiusArcsec(g.uArcsec, g.vArcsec, galaxy.axisRatio) / galaxy.reArcsec;
  return `RA ${formatRaHms(sky.raDeg, 2)}  Dec ${formatDecDms(sky.decDeg, 1)}   ξ ${(p.xi / 60).toFixed(2)}′ η ${(p.eta / 60).toFixed(2)}′   R ${rRe.toFixed(2)} Re`;
}

/** The FITS backdrop on its own canvas under the catalog (drawn only when the camera or image changes). */
function BackdropCanvas({ backdrop, cam, centre }: { backdrop: Backdrop | null; cam: Camera; centre: ReturnType<typeof tangentCentre> }) {
  const ref = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const pr = Math.min(2, window.devicePixelRatio || 1);
    el.width = Math.ceil(cam.widthPx * pr);
    el.height = Math.ceil(cam.heightPx * pr);
    el.style.width = `${cam.widthPx}px`;
    el.style.height = `${cam.heightPx}px`;
    const ctx = el.getContext('2d')!;
    ctx.setTransform(pr, 0, 0, pr, 0, 0);
    ctx.clearRect(0, 0, cam.widthPx, cam.heightPx);
    backdrop?.draw(ctx, cam, centre);
  }, [backdrop, cam, centre]);
  if (!backdrop) return null;
  return <canvas ref={ref} className="backdrop-canvas" data-testid="backdrop-canvas" />;
}
