/** A titled, collapsible section of a side column. */
import { useState, type ReactNode } from 'react';

export function Panel({ title, testId, children, startOpen = true, extra }: { title: string; testId: string; children: ReactNode; startOpen?: boolean; extra?: ReactNode }) {
  const [open, setOpen] = useState(startOpen);
  return (
    <section className={`panel ${open ? 'open' : 'closed'}`} data-testid={testId}>
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

/** A number field that commits on Enter or leaving the field, and only when the text is a valid number. */
export function NumberField({ label, unit, value, onCommit, step, testId, min, max }: {
  label: string; unit?: string; value: number; onCommit(v: number): void; step?: number; testId?: string; min?: number; max?: number;
}) {
  const [text, setText] = useState<string | null>(null);
  const shown = text ?? String(value);
  // A blank field is no number (Number('') would read it as 0 and commit a zero).
  const parse = (t: string) => (t.trim() === '' ? NaN : Number(t));
  const valid = (v: number) => Number.isFinite(v) && (min === undefined || v >= min) && (max === undefined || v <= max);
  /** Enter keeps a refused text in the field, marked bad; leaving the field puts the value in effect back. */
  const commit = (keepRefused: boolean) => {
    if (text === null) return;
    const v = parse(text);
    if (!valid(v) && keepRefused) return;
    setText(null);
    if (valid(v) && v !== value) onCommit(v);
  };
  const bad = text !== null && !valid(parse(text));
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
        onChange={(e) => setText(e.target.value)}
        onBlur={() => commit(false)}
        onKeyDown={(e) => { if (e.key === 'Enter') commit(true); if (e.key === 'Escape') setText(null); }}
      />
      {unit && <span className="field-unit">{unit}</span>}
    </label>
  );
}
