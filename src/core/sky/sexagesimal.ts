/**
 * Sexagesimal text for RA and Dec. Accepted forms: `12:34:56.7`, `12 34 56.7`, `12h34m56.7s`,
 * `-05:06:07.8`, `-05 06 07.8`, `-05d06m07.8s`, `-05°06'07.8"`, `-00 30` (sign kept on a zero
 * leading field), and plain decimal numbers. RA in sexagesimal without unit letters is in hours;
 * RA with `d`/`°` letters is in degrees. Unit letters must mark the fields in order (h or d, then m,
 * then s); an empty or misplaced field is an error. Output is always decimal degrees.
 */
import { fail, ok, type Result } from '../result';
import { wrap360Deg } from './angles';
import { PMath } from '../numeric/portableMath';

interface Fields {
  negative: boolean;
  values: number[];
  unit: 'hours' | 'degrees' | 'none';
}

const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

const FIELD_NAMES = ['first', 'minutes', 'seconds'] as const;

/** Unit letters and the field position (0 = hours/degrees, 1 = minutes, 2 = seconds) each one marks. */
const SEPARATOR_RE = /(\s*(?:''|[hHdD°mM'′sS"″:])\s*|\s+)/;

function letterPosition(sep: string): { position: number; unit: Fields['unit'] } | null {
  const s = sep.trim();
  if (s === '' || s === ':') return null;
  if (/^[hH]$/.test(s)) return { position: 0, unit: 'hours' };
  if (/^[dD°]$/.test(s)) return { position: 0, unit: 'degrees' };
  if (/^[mM'′]$/.test(s)) return { position: 1, unit: 'none' };
  return { position: 2, unit: 'none' }; // s S " ″ ''
}

/** Split a sexagesimal text into sign, up to three numeric fields and the unit its letters imply. */
function splitFields(text: string): Result<Fields> {
  let t = text.trim();
  if (t === '') return fail('empty text where an angle was expected');
  let negative = false;
  if (t[0] === '-' || t[0] === '+' || t[0] === '\u2212') {
    negative = t[0] !== '+';
    t = t.slice(1).trim();
  }
  // Alternating [field, separator, field, separator, ..., field].
  const pieces = t.split(SEPARATOR_RE);
  const parts: string[] = [];
  let unit: Fields['unit'] = 'none';
  for (let k = 0; k < pieces.length; k += 2) {
    const p = pieces[k];
    const sep = pieces[k + 1];
    const isLast = k + 1 >= pieces.length;
    if (p === '') {
      // Only a trailing unit letter may leave an empty piece behind it ("12h", "30s").
      if (isLast && k > 0 && letterPosition(pieces[k - 1]) !== null) break;
      return fail(`"${text}": field ${parts.length + 1} is empty; write every field, e.g. 12:00:34 rather than 12::34`);
    }
    parts.push(p);
    if (sep !== undefined) {
      const mark = letterPosition(sep);
      if (mark !== null && mark.position !== parts.length - 1) {
        return fail(
          `"${text}": "${sep.trim()}" marks the ${mark.position === 0 ? mark.unit : FIELD_NAMES[mark.position]} but follows field ${parts.length} ("${p}"); write the fields in order, e.g. 12h00m34s`,
        );
      }
      if (mark !== null && mark.position === 0) unit = mark.unit;
    }
  }
  if (parts.length === 0 || parts.length > 3) {
    return fail(`"${text}" is not an angle: expected 1 to 3 fields such as 12:34:56.7`);
  }
  const values: number[] = [];
  for (const [i, p] of parts.entries()) {
    if (!/^(\d+(\.\d*)?|\.\d+)$/.test(p)) return fail(`"${text}": field ${i + 1} ("${p}") is not a number`);
    const v = Number(p);
    if (i > 0 && v >= 60) return fail(`"${text}": the ${FIELD_NAMES[i]} field is ${p}; ${FIELD_NAMES[i]} must be below 60`);
    if (i < parts.length - 1 && !Number.isInteger(v)) return fail(`"${text}": field ${i + 1} ("${p}") has decimals; only the last field may have decimals`);
    values.push(v);
  }
  return ok({ negative, values, unit });
}

function fieldsToValue(f: Fields): number {
  const [a, b = 0, c = 0] = f.values;
  const v = a + b / 60 + c / 3600;
  return f.negative ? -v : v;
}

/** How far outside [0, 360) a numeric RA may be and still be wrapped into it: 1 arcsec, alike on both sides. */
export const RA_WRAP_TOL_DEG = 1 / 3600;

/**
 * Parse a right ascension to degrees in [0, 360). Numbers are degrees. Text with one field and
 * no letters is decimal degrees; sexagesimal text (two or three fields, or `h` letters) is hours,
 * unless written with `d`/`°`, which means degrees.
 */
export function parseRaDeg(input: number | string): Result<number> {
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) return fail(`RA ${input} is not a finite number`);
    // RA is cyclic: a value within RA_WRAP_TOL_DEG outside [0, 360) on either side (a rounded 360, a -0.0001) is the
    // same point and is wrapped; further out it is refused, alike below 0 and above 360.
    if (input < -RA_WRAP_TOL_DEG || input >= 360 + RA_WRAP_TOL_DEG) return fail(`RA ${input} deg is outside [0, 360)`);
    return ok(wrap360Deg(input));
  }
  const trimmed = input.trim();
  if (NUMBER_RE.test(trimmed)) return parseRaDeg(Number(trimmed));
  const f = splitFields(trimmed);
  if (!f.ok) return f;
  if (f.value.negative) return fail(`RA "${input}" is negative; RA runs from 0h to 24h`);
  if (f.value.unit === 'degrees') return parseRaDeg(fieldsToValue(f.value));
  const hours = fieldsToValue(f.value);
  if (hours >= 24) return fail(`RA "${input}" is ${hours.toFixed(4)} h, beyond 24h`);
  return ok(wrap360Deg(hours * 15));
}

/** Parse a declination to degrees in [-90, 90]. Numbers and one-field text are degrees; sexagesimal is d:m:s. */
export function parseDecDeg(input: number | string): Result<number> {
  let v: number;
  if (typeof input === 'number') {
    v = input;
  } else {
    const trimmed = input.trim();
    if (NUMBER_RE.test(trimmed)) v = Number(trimmed);
    else {
      const f = splitFields(trimmed);
      if (!f.ok) return f;
      if (f.value.unit === 'hours') return fail(`Dec "${input}" uses hour letters; write it in degrees`);
      v = fieldsToValue(f.value);
    }
  }
  if (!Number.isFinite(v)) return fail(`Dec ${input} is not a finite number`);
  if (v < -90 || v > 90) return fail(`Dec ${typeof input === 'string' ? `"${input}"` : input} is outside [-90, 90] deg`);
  return ok(v);
}

/** Split |value| into integer units, minutes and seconds rounded to `decimals`, carrying 60s upward. */
function toSexagesimalParts(value: number, decimals: number): [number, number, string] {
  const scale = PMath.pow(10, decimals);
  const totalUnits = Math.round(Math.abs(value) * 3600 * scale);
  const perUnit = 3600 * scale;
  const a = Math.floor(totalUnits / perUnit);
  const rem = totalUnits - a * perUnit;
  const b = Math.floor(rem / (60 * scale));
  const cUnits = rem - b * 60 * scale;
  const c = (cUnits / scale).toFixed(decimals);
  return [a, b, c.padStart(decimals > 0 ? 3 + decimals : 2, '0')];
}

const pad2 = (n: number) => String(n).padStart(2, '0');

/** Format RA degrees as `HH:MM:SS.ss` hours (decimals of seconds, default 2). */
export function formatRaHms(raDeg: number, decimals = 2): string {
  const [h, m, s] = toSexagesimalParts(wrap360Deg(raDeg) / 15, decimals);
  return `${pad2(h % 24)}:${pad2(m)}:${s}`;
}

/** Format Dec degrees as `+DD:MM:SS.s` with an explicit sign (decimals of seconds, default 1). */
export function formatDecDms(decDeg: number, decimals = 1): string {
  const [d, m, s] = toSexagesimalParts(decDeg, decimals);
  const sign = decDeg < 0 && (d > 0 || m > 0 || Number(s) > 0) ? '-' : '+';
  return `${sign}${pad2(d)}:${pad2(m)}:${s}`;
}
