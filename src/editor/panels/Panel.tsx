/** A titled, collapsible section of a side column. */
import { useEffect, useRef, useState, type ReactNode } from 'react';

/** A collapsible panel; each change of `reveal` (when not 0) opens it and scrolls it into view. */
export function Panel({ title, testId, children, startOpen = true, extra, reveal = 0 }: { title: string; testId: string; children: ReactNode; startOpen?: boolean; extra?: ReactNode; reveal?: number }) {
  const [open, setOpen] = useState(startOpen);
  const ref = useRef<HTMLElement>(null);
  const shown = useRef(reveal);
  useEffect(() => {
    if (reveal === shown.current) return;
    shown.current = reveal;
    setOpen(true);
    requestAnimationFrame(() => ref.current?.scrollIntoView({ block: 'start', behavior: 'auto' }));
  }, [reveal]);
  return (
    <section ref={ref} className={`panel ${open ? 'open' : 'closed'}`} data-testid={testId}>
      <header>
        <button className="panel-toggle" onClick={() => setOpen(!open)} aria-expanded={open}>
          <span className="chev">{open ? '▾' : '▸'}</span> {title}
        </button>
        {extra}
      </header>
      {open && <div className="panel-body">{children}</div>}
    </section>
  );
}

/** What is wrong with a number typed into a field, in words, or null when it can be used. */
export function numberProblem(text: string, min?: number, max?: number, unit = ''): string | null {
  const u = unit && !unit.startsWith('″') && !unit.startsWith('°') ? ` ${unit}` : unit;
  if (text.trim() === '') return 'type a number';
  const v = Number(text);
  if (!Number.isFinite(v)) return `"${text.trim()}" is not a number`;
  if (min !== undefined && v < min) return `must be at least ${min}${u}`;
  if (max !== undefined && v > max) return `must be at most ${max}${u}`;
  return null;
}

/**
 * A number field that commits on Enter or leaving the field, and only when the text is a valid number. What is wrong
 * with a refused text is said next to the field; leaving the field puts the value in effect back and says, for a few
 * seconds, that the typed text was not used.
 */
export function NumberField({ label, unit, value, onCommit, step, testId, min, max }: {
  label: string; unit?: string; value: number; onCommit(v: number): void; step?: number; testId?: string; min?: number; max?: number;
}) {
  const [text, setText] = useState<string | null>(null);
  const [dropped, setDropped] = useState<string | null>(null);
  useEffect(() => {
    if (!dropped) return;
    const t = setTimeout(() => setDropped(null), 5000);
    return () => clearTimeout(t);
  }, [dropped]);
  const shown = text ?? String(value);
  const problem = text === null ? null : numberProblem(text, min, max, unit);
  /** Enter keeps a refused text in the field, marked bad; leaving the field puts the value in effect back. */
  const commit = (keepRefused: boolean) => {
    if (text === null) return;
    if (problem && keepRefused) return;
    setText(null);
    if (problem) { setDropped(`"${text}" not used (${problem}); ${label} stays ${value}`); return; }
    const v = Number(text);
    if (v !== value) onCommit(v);
  };
  const bad = problem !== null;
  const message = problem ?? dropped;
  return (
    <label className={`field ${bad ? 'bad' : ''}`}>
      <span className="field-label">{label}</span>
      <input
        data-testid={testId}
        aria-invalid={bad}
        type="text"
        inputMode="decimal"
        value={shown}
        step={step}
        onChange={(e) => { setText(e.target.value); setDropped(null); }}
        onBlur={() => commit(false)}
        onKeyDown={(e) => { if (e.key === 'Enter') commit(true); if (e.key === 'Escape') setText(null); }}
      />
      {unit && <span className="field-unit">{unit}</span>}
      {message && <span className="field-error" role="alert" data-testid={testId ? `${testId}-error` : undefined}>{message}</span>}
    </label>
  );
}
