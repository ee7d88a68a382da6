/**
 * The target table: every usable catalog row with magnitude, colour, radius, weight and where it went.
 * Sort by a column, filter by text and status, select (click, Ctrl/Cmd+click, Shift+click), and set or
 * reset the weight or the forcing of the selection. Linked both ways with the sky view: the selection
 * is shared, the table scrolls to the first selected row when the sky selects it (or when an edit re-sorts the rows),
 * and clicking a row brings its target into the sky view. A weight that cannot be used is said next to the field.
 */
import { memo, useEffect, useMemo, useRef, useState } from 'react';
import type { EditorController } from '../controller';
import type { Target } from '../../core/catalog/types';
import type { PlanFile } from '../../core/plan/schema';
import type { Slit } from '../../core/geometry/maskSolution';
import { setOverridesCommand } from '../store/commands';
import { shownNumber, shownWeight } from '../derive';

type SortKey = 'id' | 'mag' | 'color' | 'rRe' | 'weight' | 'status';
type Filter = 'all' | 'slit' | 'noslit' | 'alignment' | 'excluded' | 'forced' | 'selected';

const ROW_PX = 22;

export interface TargetRowData {
  targets: readonly Target[];
  rRe: Float64Array;
  weights: Float64Array;
  /** Weights before forcing (what the user set or the rules give): the number shown; `weights` sorts. */
  shownWeights: Float64Array;
  slitOf: ReadonlyMap<string, Slit>;
}

function statusOf(t: Target, w: number, slit: Slit | undefined, force: string | undefined): string {
  if (slit) return `${slit.maskId} ${slit.slitId}`;
  if (force === 'out' || w <= 0) return 'excluded';
  if (force === 'in') return 'forced in';
  return t.role === 'alignment' ? 'star' : '';
}

export interface TargetTableProps {
  c: EditorController;
  data: TargetRowData;
  /** The shared selection (catalog indices) and the plan's per-target overrides; props so the memo sees their changes. */
  selection: ReadonlySet<number>;
  overrides: NonNullable<PlanFile['targetOverrides']>;
}

/** Memoised: it re-renders when its data, the selection or the overrides change, not on every controller change. */
export const TargetTable = memo(function TargetTable({ c, data, selection, overrides }: TargetTableProps) {
  const [sort, setSort] = useState<{ key: SortKey; dir: 1 | -1 }>({ key: 'weight', dir: -1 });
  const [text, setText] = useState('');
  const [filter, setFilter] = useState<Filter>('all');
  const [weightText, setWeightText] = useState('');
  const [weightError, setWeightError] = useState<string | null>(null);
  const [scrollTop, setScrollTop] = useState(0);
  const [height, setHeight] = useState(200);
  const box = useRef<HTMLDivElement>(null);
  const anchor = useRef<number | null>(null);
  const { targets, rRe, weights, shownWeights, slitOf } = data;

  // The slit map changes with every solve; rows depend on it only when sorting or filtering by it.
  const slitDep = sort.key === 'status' || filter === 'slit' || filter === 'noslit' ? slitOf : null;
  const rows = useMemo(() => {
    const q = text.trim().toLowerCase();
    const idx: number[] = [];
    for (let i = 0; i < targets.length; i++) {
      const t = targets[i];
      if (q && !t.id.toLowerCase().includes(q)) continue;
      const slit = slitOf.get(t.id), o = overrides[t.id];
      if (filter === 'slit' && !slit) continue;
      if (filter === 'noslit' && slit) continue;
      if (filter === 'alignment' && t.role !== 'alignment') continue;
      if (filter === 'excluded' && !(weights[i] <= 0 || o?.force === 'out')) continue;
      if (filter === 'forced' && !o?.force) continue;
      if (filter === 'selected' && !selection.has(i)) continue;
      idx.push(i);
    }
    const key = sort.key, dir = sort.dir;
    const val = (i: number): number | string => {
      const t = targets[i];
      if (key === 'id') return t.id;
      if (key === 'mag') return t.mag;
      if (key === 'color') return t.color ?? -Infinity;
      if (key === 'rRe') return rRe[i];
      if (key === 'weight') return weights[i];
      return statusOf(t, weights[i], slitOf.get(t.id), overrides[t.id]?.force);
    };
    idx.sort((a, b) => {
      const va = val(a), vb = val(b);
      const r = typeof va === 'string' ? String(va).localeCompare(String(vb), undefined, { numeric: true }) : (va as number) - (vb as number);
      return r * dir || a - b;
    });
    return idx;
  }, [targets, rRe, weights, slitDep, overrides, text, filter, sort, filter === 'selected' ? selection : null]); // eslint-disable-line react-hooks/exhaustive-deps

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setHeight(el.clientHeight));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);

  // Sky → table: bring the first selected row into view when the selection changes elsewhere, and after an edit of
  // weights or forcing re-sorts the rows (the edited row would otherwise jump out of view).
  const lastSel = useRef(selection);
  const lastEdit = useRef({ weights, overrides });
  useEffect(() => {
    const edited = weights !== lastEdit.current.weights || overrides !== lastEdit.current.overrides;
    lastEdit.current = { weights, overrides };
    if (selection === lastSel.current && !edited) return;
    lastSel.current = selection;
    if (!selection.size || !box.current) return;
    const first = rows.findIndex((i) => selection.has(i));
    if (first < 0) return;
    const top = first * ROW_PX, el = box.current;
    if (top < el.scrollTop || top > el.scrollTop + el.clientHeight - ROW_PX * 2) {
      el.scrollTop = Math.max(0, top - ROW_PX * 2);
      setScrollTop(el.scrollTop);
    }
  }, [selection, rows, weights, overrides]);

  const select = (rowPos: number, e: React.MouseEvent) => {
    const i = rows[rowPos];
    let next: Set<number>;
    if (e.shiftKey && anchor.current !== null) {
      const a = rows.indexOf(anchor.current);
      const [lo, hi] = a < rowPos ? [a, rowPos] : [rowPos, a];
      next = new Set(selection);
      for (let k = Math.max(0, lo); k <= hi; k++) next.add(rows[k]);
    } else if (e.metaKey || e.ctrlKey) {
      next = new Set(selection);
      if (next.has(i)) next.delete(i); else next.add(i);
      anchor.current = i;
    } else {
      next = new Set([i]);
      anchor.current = i;
      c.focusTarget(i);
    }
    lastSel.current = next;
    c.store!.updateSession((s) => ({ ...s, selection: next }));
  };

  const selIds = [...selection].map((i) => targets[i]?.id).filter((x): x is string => !!x);
  const applyWeight = () => {
    if (!selIds.length) return;
    const v = Number(weightText);
    if (weightText.trim() === '' || !Number.isFinite(v)) { setWeightError(`"${weightText}" is not a number: type a weight such as 2 or 0.5`); return; }
    if (v < 0) { setWeightError('a weight cannot be negative: use 0 to leave a target out, or Force out'); return; }
    setWeightError(null);
    c.run((d) => setOverridesCommand(d, selIds, { weight: v }));
    setWeightText('');
  };

  // The scroll offset last reported, clamped to the current rows: when a filter shortens the list the browser
  // clamps the element's scrollTop too, but its scroll event comes later, and a stale offset would show no rows.
  const topPx = Math.min(scrollTop, Math.max(0, rows.length * ROW_PX - height));
  const first = Math.max(0, Math.floor(topPx / ROW_PX) - 5);
  const last = Math.min(rows.length, first + Math.ceil(height / ROW_PX) + 10);
  const head = (key: SortKey, label: string, cls = '') => (
    <div className={`th ${cls} ${sort.key === key ? 'sorted' : ''}`} data-testid={`sort-${key}`}
      onClick={() => setSort((s) => ({ key, dir: s.key === key ? (-s.dir as 1 | -1) : key === 'id' || key === 'mag' ? 1 : -1 }))}>
      {label}{sort.key === key ? (sort.dir > 0 ? ' ▲' : ' ▼') : ''}
    </div>
  );

  return (
    <div className="target-table" data-testid="target-table">
      <div className="tt-tools">
        <input data-testid="target-filter" placeholder="filter by id" value={text} onChange={(e) => setText(e.target.value)} />
        <select data-testid="target-status-filter" value={filter} onChange={(e) => setFilter(e.target.value as Filter)}>
          <option value="all">all rows</option>
          <option value="slit">on a slit</option>
          <option value="noslit">not on a slit</option>
          <option value="alignment">alignment stars</option>
          <option value="excluded">excluded</option>
          <option value="forced">forced in/out</option>
          <option value="selected">selected</option>
        </select>
        <span className="dim small" data-testid="target-count">{rows.length} of {targets.length}</span>
        <span className="spacer" />
        <span className="small" data-testid="selection-count">{selIds.length} selected</span>
        <span className="tt-edit">
          <input data-testid="weight-input" className={`short-in ${weightError ? 'bad' : ''}`} placeholder="weight" value={weightText} aria-invalid={!!weightError}
            onChange={(e) => { setWeightText(e.target.value); setWeightError(null); }} onKeyDown={(e) => e.key === 'Enter' && applyWeight()} disabled={!selIds.length} />
          <button data-testid="weight-apply" disabled={!selIds.length} onClick={applyWeight}>Set weight</button>
          <button disabled={!selIds.length} onClick={() => c.run((d) => setOverridesCommand(d, selIds, { weight: null }))} title="back to the weight of the plan's rules">Reset</button>
          <button data-testid="force-in" disabled={!selIds.length} onClick={() => c.run((d) => setOverridesCommand(d, selIds, { force: 'in' }))}>Force in</button>
          <button data-testid="force-out" disabled={!selIds.length} onClick={() => c.run((d) => setOverridesCommand(d, selIds, { force: 'out' }))}>Force out</button>
          <button data-testid="release" disabled={!selIds.length} onClick={() => c.run((d) => setOverridesCommand(d, selIds, { force: null }))} title="neither forced in nor out">Release</button>
        </span>
      </div>
      {weightError && <div className="field-error tt-error" role="alert" data-testid="weight-error">{weightError}</div>}
      <div className="tt-head">
        {head('id', 'id', 'c-id')}{head('mag', 'mag', 'num')}{head('color', 'colour', 'num')}{head('rRe', 'R/Re', 'num')}
        {head('weight', 'weight', 'num')}{head('status', 'slit / status', 'c-status')}
      </div>
      <div className="tt-body" ref={box} onScroll={(e) => setScrollTop(e.currentTarget.scrollTop)}>
        <div style={{ height: rows.length * ROW_PX, position: 'relative' }}>
          {rows.slice(first, last).map((i, k) => {
            const t = targets[i];
            const slit = slitOf.get(t.id);
            const o = overrides[t.id];
            const pos = first + k;
            return (
              <div key={i} className={`tr ${selection.has(i) ? 'sel' : ''} ${slit ? `on-${slit.role}` : ''}`} style={{ top: pos * ROW_PX }}
                data-testid="target-row" data-id={t.id} onClick={(e) => select(pos, e)}>
                <div className="c-id">{t.role === 'alignment' ? '◇ ' : ''}{t.id}</div>
                <div className="num">{t.mag.toFixed(2)}</div>
                <div className="num">{t.color === null ? '' : t.color.toFixed(2)}</div>
                <div className="num" title={Number.isFinite(rRe[i]) ? '' : 'too far from the galaxy for a tangent-plane radius'}>{shownNumber(rRe[i], 2)}</div>
                <div className={`num ${o?.weight !== undefined ? 'edited' : ''}`} title={o?.force === 'in' ? 'forced in: taken wherever it fits, whatever its weight' : o?.weight !== undefined ? 'set by hand' : ''} data-testid="row-weight">{shownWeight(shownWeights[i])}{o?.force === 'in' ? ' ⇡' : ''}</div>
                <div className="c-status">{statusOf(t, weights[i], slit, o?.force)}{o?.force === 'in' && slit ? ' (forced)' : ''}</div>
              </div>
            );
          })}
        </div>
      </div>
    </div>
  );
});
