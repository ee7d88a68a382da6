/**
 * Target weighting: the plan's `weighting` rules turn catalog rows into weighted candidates.
 * Order of precedence (docs/weighting.md):
 *   1. `targetOverrides[id]`: `force: "out"` excludes; `weight` replaces every other weight (0 excludes);
 *      `force: "in"` or an override weight lifts the windows and exclusion regions for that target.
 *   2. An explicit catalog `priority` replaces the formula weight (windows and regions still apply).
 *   3. Otherwise the formula W = W_mag * W_col * W_rad:
 *        W_mag = 10^(-0.4 * magSlope * (mag - magPivot))            (brighter: higher S/N per hour)
 *        W_col = colorFloor + (1 - colorFloor) * max_k exp(-(c - c_k)^2 / (2 colorSigma^2))
 *                (1 when no `colorPeaks` are given or the row has no colour)
 *        W_rad = (1 + R/Re)^radiusExponent                          (outer tracers are rarer and worth more)
 *      R is the circularised elliptical radius (galaxy frame, interface contract).
 * Windows (magRange, colorRange, radiusRangeRe) apply to tracers; exclusion regions apply to every role.
 * Nothing is dropped silently: every excluded row is listed with the rule that excluded it.
 */
import type { ExclusionRegion, WeightingRules } from '../plan/weightingSection';
import type { Target } from '../catalog/types';
import { targetColumnsOf, TARGET_ROLES, type TargetColumns } from '../catalog/targetColumns';
import type { GalaxyModel, PlanFile } from '../plan/schema';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';
import { tangentCentre, skyToTangentArcsec } from '../sky/tangentPlane';
import { circularisedRadiusArcsec, galaxyAzimuthDeg } from '../sky/frames';
import { RAD_PER_DEG } from '../sky/angles';
import { PMath, sq } from '../numeric/portableMath';

/** Defaults of the weight formula; magPivot defaults to the faint end of magRange, else the median tracer magnitude. */
export const WEIGHT_DEFAULTS = { magSlope: 0.5, colorSigma: 0.1, colorFloor: 0.3, radiusExponent: 0.5 } as const;

export type WeightSource = 'formula' | 'priority' | 'override' | 'alignment';

/** A usable candidate: the catalog row plus its weight, where the weight came from, and its galaxy-frame position. */
export interface WeightedTarget extends Target {
  weight: number;
  weightSource: WeightSource;
  /** Forced in by `targetOverrides` (the allocation should take it wherever it is eligible). */
  forced: boolean;
  /** Circularised radius R/Re and azimuth from the major axis (degrees, (-180, 180]). */
  radiusRe: number;
  azimuthDeg: number;
}

/** A catalog row the rules removed, with the rule and a readable reason. */
export interface ExcludedTarget {
  id: string;
  line: number;
  role: Target['role'];
  rule: string;
  reason: string;
}

/**
 * The kept targets as columns (struct of arrays), one entry per kept target in catalog order: its position in the
 * target list given to weighTargets, and its weight, source, forcing, R/Re and azimuth. What the solver needs,
 * without one object per catalog row.
 */
export interface KeptColumns {
  /** Position of each kept target in the list given to weighTargets (increasing). */
  index: Int32Array;
  weight: Float64Array;
  /** Index into WEIGHT_SOURCES. */
  source: Uint8Array;
  /** 1 when forced in by targetOverrides. */
  forced: Uint8Array;
  radiusRe: Float64Array;
  azimuthDeg: Float64Array;
}

/** The weight sources in the order of KeptColumns.source's codes. */
export const WEIGHT_SOURCES: readonly WeightSource[] = ['formula', 'priority', 'override', 'alignment'];

/**
 * The excluded rows as columns, one entry per excluded row in catalog order: its position in the target list given to
 * weighTargets, why (an EXCLUSION code) and the value the reason quotes (mag, colour, R/Re, weight, or the region's number).
 */
export interface ExcludedColumns {
  index: Int32Array;
  code: Uint8Array;
  value: Float64Array;
}

export interface WeightingResult {
  /** The kept targets as objects (built from `kept` and the catalog rows on first read, then kept). */
  targets: WeightedTarget[];
  /** The kept targets as columns (the solver's path; no per-row objects). */
  kept?: KeptColumns;
  /** The excluded rows as objects (built from `excludedColumns` on first read, then kept). */
  excluded: ExcludedTarget[];
  /** The excluded rows as columns (written to excluded-targets.csv without per-row objects). */
  excludedColumns?: ExcludedColumns;
  /** A text line per rule in effect, e.g. "magnitude window 18.0 <= mag <= 23.0". */
  rulesText: string[];
  /** The formula parameters actually used (magPivot resolved). */
  formula: { magPivot: number; magSlope: number; colorPeaks: number[]; colorSigma: number; colorFloor: number; radiusExponent: number };
}

/**
 * Every target's place about the galaxy as the weighting computed it, index as the target list given to weighTargets:
 * the galaxy tangent-plane offset (xi East, eta North, arcsec; NaN without a gnomonic image) and the circularised
 * R/Re (Infinity then) and azimuth, for the galaxy placement `galaxy`. The search reuses it (solver/searchEnv.ts).
 */
export interface GalaxyPositions {
  /** The targets' rows as columns (the table weighTargets read). */
  table: TargetColumns;
  galaxy: Pick<GalaxyModel, 'raDeg' | 'decDeg' | 'paDeg' | 'axisRatio' | 'reArcsec'>;
  xiArcsec: Float64Array;
  etaArcsec: Float64Array;
  radiusRe: Float64Array;
  /** Azimuth from the major axis (degrees, (-180, 180]; 0 without a gnomonic image). */
  azimuthDeg: Float64Array;
}

/** Region centre as an offset from the galaxy centre in the sky frame (xi East, eta North, arcsec). */
function regionCentreSkyArcsec(r: ExclusionRegion, galaxy: GalaxyModel): { xi: number; eta: number } {
  if (r.ra !== undefined && r.dec !== undefined) {
    const ra = parseRaDeg(r.ra), dec = parseDecDeg(r.dec);
    if (!ra.ok || !dec.ok) throw new Error('exclusion region centre could not be read');
    const p = skyToTangentArcsec(tangentCentre(galaxy.raDeg, galaxy.decDeg), ra.value, dec.value);
    return p ? { xi: p.xiArcsec, eta: p.etaArcsec } : { xi: Infinity, eta: Infinity };
  }
  if (r.xiArcsec !== undefined) return { xi: r.xiArcsec, eta: r.etaArcsec ?? 0 };
  // Galaxy frame u (major), v (minor) back to sky: xi = u sin(theta) + v cos(theta), eta = u cos(theta) - v sin(theta).
  const t = galaxy.paDeg * RAD_PER_DEG, u = r.uArcsec ?? 0, v = r.vArcsec ?? 0;
  return { xi: u * PMath.sin(t) + v * PMath.cos(t), eta: u * PMath.cos(t) - v * PMath.sin(t) };
}

/** True when a sky-frame offset (xi East, eta North, arcsec from the galaxy centre) lies inside the region (boundary inclusive). */
export function insideRegion(xiArcsec: number, etaArcsec: number, centre: { xi: number; eta: number }, r: ExclusionRegion): boolean {
  const dxi = xiArcsec - centre.xi, deta = etaArcsec - centre.eta;
  const q = r.axisRatio ?? 1;
  // Along the ellipse's major axis (PA East of North) and across it.
  const t = (r.paDeg ?? 0) * RAD_PER_DEG;
  const a = dxi * PMath.sin(t) + deta * PMath.cos(t);
  const b = dxi * PMath.cos(t) - deta * PMath.sin(t);
  return (a * a) + (b / q) * (b / q) <= r.radiusArcsec * r.radiusArcsec;
}

/** Text of one region for reports. */
function regionText(r: ExclusionRegion, i: number): string {
  const where = r.ra !== undefined ? `at RA ${r.ra}, Dec ${r.dec}` : r.xiArcsec !== undefined ? `at xi ${r.xiArcsec}", eta ${r.etaArcsec}" from the galaxy centre` : `at u ${r.uArcsec}", v ${r.vArcsec}" (galaxy frame)`;
  const shape = (r.axisRatio ?? 1) < 1 ? `ellipse a = ${r.radiusArcsec}", b/a = ${r.axisRatio}, PA ${r.paDeg ?? 0} deg` : `circle r = ${r.radiusArcsec}"`;
  return `exclusion region "${regionLabel(r, i)}": ${shape} ${where}`;
}

const regionLabel = (r: ExclusionRegion, i: number) => r.label ?? `region ${i + 1}`;

function median(values: number[]): number {
  if (!values.length) return 0;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Formula weight W_mag * W_col * W_rad for one tracer (see the module comment). */
export function formulaWeight(mag: number, color: number | null, radiusRe: number, f: WeightingResult['formula']): number {
  const wMag = PMath.pow(10, -0.4 * f.magSlope * (mag - f.magPivot));
  let wCol = 1;
  if (color !== null && f.colorPeaks.length) {
    let best = 0;
    for (const c of f.colorPeaks) best = Math.max(best, PMath.exp(-sq(color - c) / (2 * sq(f.colorSigma))));
    wCol = f.colorFloor + (1 - f.colorFloor) * best;
  }
  const wRad = PMath.pow(1 + radiusRe, f.radiusExponent);
  return wMag * wCol * wRad;
}

const fmt = (v: number) => (Number.isInteger(v) ? v.toFixed(1) : String(v));

/** Why a row was excluded: the codes of ExcludedColumns.code. */
const EXCLUSION = { forcedOut: 0, overrideZero: 1, projection: 2, region: 3, magRange: 4, colorRange: 5, radiusRange: 6, weight: 7 } as const;

/**
 * Apply the plan's weighting rules and target overrides to the catalog targets (galaxy frame from `galaxy`).
 * Returns the usable candidates (tracers with weight > 0 and alignment stars) and every excluded row with its rule.
 */
export function weighTargets(targets: readonly Target[] | TargetColumns, galaxy: GalaxyModel, rules: WeightingRules = {}, overrides: PlanFile['targetOverrides'] = {}): WeightingResult {
  const table = targetColumnsOf(targets);
  const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const n = table.length;
  const tracerMags: number[] = [];
  for (let i = 0; i < n; i++) if (!table.isAlignment(i)) tracerMags.push(table.mag[i]);
  const fr = rules.formula ?? {};
  const formula = {
    magPivot: fr.magPivot ?? rules.magRange?.[1] ?? median(tracerMags),
    magSlope: fr.magSlope ?? WEIGHT_DEFAULTS.magSlope,
    colorPeaks: fr.colorPeaks ?? [],
    colorSigma: fr.colorSigma ?? WEIGHT_DEFAULTS.colorSigma,
    colorFloor: fr.colorFloor ?? WEIGHT_DEFAULTS.colorFloor,
    radiusExponent: fr.radiusExponent ?? WEIGHT_DEFAULTS.radiusExponent,
  };
  const regions = (rules.exclusions ?? []).map((r) => ({ r, c: regionCentreSkyArcsec(r, galaxy) }));
  const keptIndex = new Int32Array(n), keptWeight = new Float64Array(n), keptSource = new Uint8Array(n), keptForced = new Uint8Array(n);
  const keptRadius = new Float64Array(n), keptAzimuth = new Float64Array(n);
  const posXi = new Float64Array(n), posEta = new Float64Array(n), posRadius = new Float64Array(n), posAzimuth = new Float64Array(n);
  let nKept = 0;
  const keep = (i: number, weight: number, source: WeightSource, forced: boolean, radiusRe: number, azimuthDeg: number) => {
    keptIndex[nKept] = i; keptWeight[nKept] = weight; keptSource[nKept] = WEIGHT_SOURCES.indexOf(source); keptForced[nKept] = forced ? 1 : 0;
    keptRadius[nKept] = radiusRe; keptAzimuth[nKept] = azimuthDeg; nKept++;
  };
  const exIndex: number[] = [], exCode: number[] = [], exValue: number[] = [];
  const ov = overrides ?? {};
  const hasOverrides = Object.keys(ov).length > 0;
  const s0 = PMath.sin(galaxy.paDeg * RAD_PER_DEG), c0 = PMath.cos(galaxy.paDeg * RAD_PER_DEG);
  const { raDeg, decDeg, mag: magCol, color: colorCol, priority: priorityCol, ids } = table;
  // Plain loops without closures: this runs once per catalog row.
  for (let ti = 0; ti < n; ti++) {
    const p = skyToTangentArcsec(centre, raDeg[ti], decDeg[ti]);
    const xi = p ? p.xiArcsec : Infinity, eta = p ? p.etaArcsec : Infinity;
    // Galaxy frame (interface contract): u = xi sin(theta) + eta cos(theta), v = xi cos(theta) - eta sin(theta).
    const u = xi * s0 + eta * c0, v = xi * c0 - eta * s0;
    const radiusRe = p ? circularisedRadiusArcsec(u, v, galaxy.axisRatio) / galaxy.reArcsec : Infinity;
    const azimuthDeg = p ? galaxyAzimuthDeg(u, v) : 0;
    posXi[ti] = p ? xi : NaN; posEta[ti] = p ? eta : NaN; posRadius[ti] = radiusRe; posAzimuth[ti] = azimuthDeg;
    const o = hasOverrides ? ov[ids[ti]] : undefined;
    const mag = magCol[ti], c = colorCol[ti], color = c === c ? c : null;
    let code = -1, value = 0;
    if (o?.force === 'out') code = EXCLUSION.forcedOut;
    else if (o?.weight === 0) code = EXCLUSION.overrideZero;
    else if (!p) code = EXCLUSION.projection;
    const lifted = o?.force === 'in' || o?.weight !== undefined;
    if (code < 0 && !lifted) {
      for (let k = 0; k < regions.length; k++) {
        if (insideRegion(xi, eta, regions[k].c, regions[k].r)) { code = EXCLUSION.region; value = k; break; }
      }
    }
    if (code < 0 && table.isAlignment(ti)) {
      keep(ti, 0, 'alignment', o?.force === 'in', radiusRe, azimuthDeg);
      continue;
    }
    if (code < 0 && !lifted) {
      if (rules.magRange && (mag < rules.magRange[0] || mag > rules.magRange[1])) { code = EXCLUSION.magRange; value = mag; }
      else if (rules.colorRange && color !== null && (color < rules.colorRange[0] || color > rules.colorRange[1])) { code = EXCLUSION.colorRange; value = color; }
      else if (rules.radiusRangeRe && (radiusRe < rules.radiusRangeRe[0] || radiusRe > rules.radiusRangeRe[1])) { code = EXCLUSION.radiusRange; value = radiusRe; }
    }
    let weight = 0, weightSource: WeightSource = 'formula';
    if (code < 0) {
      const priority = priorityCol[ti];
      if (o?.weight !== undefined) { weight = o.weight; weightSource = 'override'; }
      else if (priority > 0) { weight = priority; weightSource = 'priority'; }
      else weight = formulaWeight(mag, color, radiusRe, formula);
      if (!(weight > 0) || !Number.isFinite(weight)) { code = EXCLUSION.weight; value = weight; }
    }
    if (code >= 0) { exIndex.push(ti); exCode.push(code); exValue.push(value); continue; }
    keep(ti, weight, weightSource, o?.force === 'in', radiusRe, azimuthDeg);
  }
  const kept: KeptColumns = {
    index: keptIndex.slice(0, nKept), weight: keptWeight.slice(0, nKept), source: keptSource.slice(0, nKept), forced: keptForced.slice(0, nKept),
    radiusRe: keptRadius.slice(0, nKept), azimuthDeg: keptAzimuth.slice(0, nKept),
  };
  const excludedColumns: ExcludedColumns = { index: Int32Array.from(exIndex), code: Uint8Array.from(exCode), value: Float64Array.from(exValue) };
  const result = { kept, excludedColumns, rulesText: describeRules(rules, formula, ov), formula } as WeightingResult;
  weighedFrom.set(kept, targets);
  const { raDeg: gRa, decDeg: gDec, paDeg, axisRatio, reArcsec } = galaxy;
  positionsOf.set(result, { table, galaxy: { raDeg: gRa, decDeg: gDec, paDeg, axisRatio, reArcsec }, xiArcsec: posXi, etaArcsec: posEta, radiusRe: posRadius, azimuthDeg: posAzimuth });
  excludedFrom.set(excludedColumns, { table, rules });
  // The objects only when someone reads them (the editor's panels, exports): own enumerable properties, so a
  // structured clone or a spread of the result still carries them.
  lazyProperty(result, 'targets', () => keptTargetObjects(targets, kept));
  lazyProperty(result, 'excluded', () => excludedTargetObjects(result));
  return result;
}

/** Define `obj[key]` as an enumerable property computed by `make` on first read (and settable). */
function lazyProperty<T extends object, K extends keyof T>(obj: T, key: K, make: () => T[K]): void {
  let value: T[K] | undefined;
  let made = false;
  Object.defineProperty(obj, key, {
    enumerable: true,
    configurable: true,
    get: () => {
      if (!made) { value = make(); made = true; }
      return value;
    },
    set: (v: T[K]) => { value = v; made = true; },
  });
}

/** The target list each KeptColumns was computed from (positions in `index` refer to it). */
const weighedFrom = new WeakMap<KeptColumns, readonly Target[] | TargetColumns>();
/** The rows and rules each ExcludedColumns was computed with (for the rule names and reasons). */
const excludedFrom = new WeakMap<ExcludedColumns, { table: TargetColumns; rules: WeightingRules }>();

/** The positions each weighting computed (kept apart from the result, so that a copy of it sent to a worker stays small). */
const positionsOf = new WeakMap<WeightingResult, GalaxyPositions>();

/** Every target's galaxy tangent-plane offset and R/Re as weighTargets computed them for this result, or null (e.g. a copy of it). */
export function weightingPositions(weighting: WeightingResult): GalaxyPositions | null {
  return positionsOf.get(weighting) ?? null;
}

/** positions when they were computed for this table about this galaxy placement (the same bits to reuse), else null. */
export function positionsFor(positions: GalaxyPositions | null | undefined, table: TargetColumns, galaxy: GalaxyPositions['galaxy']): GalaxyPositions | null {
  if (!positions || positions.table !== table) return null;
  const a = positions.galaxy;
  return a.raDeg === galaxy.raDeg && a.decDeg === galaxy.decDeg && a.paDeg === galaxy.paDeg && a.axisRatio === galaxy.axisRatio && a.reArcsec === galaxy.reArcsec ? positions : null;
}

/** The kept columns of a weighting when it was computed from exactly this target list, else null. */
export function keptColumnsOf(weighting: WeightingResult, targets: readonly Target[] | TargetColumns): KeptColumns | null {
  return weighting.kept && weighedFrom.get(weighting.kept) === targets ? weighting.kept : null;
}

/** The kept targets as WeightedTarget objects (catalog row plus weight, source, forcing, R/Re and azimuth). */
export function keptTargetObjects(targets: readonly Target[] | TargetColumns, kept: KeptColumns): WeightedTarget[] {
  const list = Array.isArray(targets) ? (targets as readonly Target[]) : null;
  const table = list ? null : (targets as TargetColumns);
  const out: WeightedTarget[] = new Array(kept.index.length);
  for (let j = 0; j < out.length; j++) {
    const i = kept.index[j];
    // Object.assign rather than object spread: several times faster here once transpiled.
    out[j] = Object.assign({}, list ? list[i] : table!.target(i), {
      weight: kept.weight[j], weightSource: WEIGHT_SOURCES[kept.source[j]], forced: kept.forced[j] === 1, radiusRe: kept.radiusRe[j], azimuthDeg: kept.azimuthDeg[j],
    });
  }
  return out;
}

/** Number of excluded rows of a weighting (without making their objects). */
export function excludedCount(w: WeightingResult): number {
  return w.excludedColumns && excludedFrom.has(w.excludedColumns) ? w.excludedColumns.index.length : w.excluded.length;
}

/** Visit the excluded rows in catalog order (id, line, role, rule, reason), from the columns when the weighting has them. */
export function forEachExcluded(w: WeightingResult, visit: (e: ExcludedTarget) => void): void {
  const cols = w.excludedColumns;
  const from = cols && excludedFrom.get(cols);
  if (!cols || !from) { for (const e of w.excluded) visit(e); return; }
  const { table, rules } = from;
  const windows = windowTexts(rules);
  const e: ExcludedTarget = { id: '', line: 0, role: 'tracer', rule: '', reason: '' };
  for (let j = 0; j < cols.index.length; j++) {
    const i = cols.index[j];
    e.id = table.ids[i];
    e.line = table.line[i];
    e.role = TARGET_ROLES[table.role[i]];
    setExclusionRule(e, cols.code[j], cols.value[j], rules, windows);
    visit(e);
  }
}

/** The window texts that reasons quote (` outside 18.0..23.0`), made once per weighting rather than once per row. */
function windowTexts(rules: WeightingRules): { mag: string; color: string; radius: string } {
  const text = (w: readonly [number, number] | undefined) => (w ? ` outside ${fmt(w[0])}..${fmt(w[1])}` : '');
  return { mag: text(rules.magRange), color: text(rules.colorRange), radius: text(rules.radiusRangeRe) };
}

/** Set `e.rule` and `e.reason` of an exclusion code and the value its reason quotes. */
function setExclusionRule(e: ExcludedTarget, code: number, value: number, rules: WeightingRules, windows: ReturnType<typeof windowTexts>): void {
  switch (code) {
    case EXCLUSION.forcedOut: e.rule = 'override'; e.reason = 'forced out by targetOverrides'; return;
    case EXCLUSION.overrideZero: e.rule = 'override'; e.reason = 'weight 0 in targetOverrides'; return;
    case EXCLUSION.projection: e.rule = 'projection'; e.reason = 'more than 90 degrees from the galaxy centre'; return;
    case EXCLUSION.region: {
      const label = regionLabel(rules.exclusions![value], value);
      e.rule = `exclusion:${label}`; e.reason = `inside exclusion region "${label}"`; return;
    }
    case EXCLUSION.magRange: e.rule = 'magRange'; e.reason = `mag ${value}${windows.mag}`; return;
    case EXCLUSION.colorRange: e.rule = 'colorRange'; e.reason = `colour ${value}${windows.color}`; return;
    case EXCLUSION.radiusRange: e.rule = 'radiusRangeRe'; e.reason = `R/Re ${value.toFixed(2)}${windows.radius}`; return;
    default: e.rule = 'weight'; e.reason = `weight ${value} is not a positive number`;
  }
}

/** The excluded rows of a weighting as objects (from its columns). */
function excludedTargetObjects(w: WeightingResult): ExcludedTarget[] {
  const out: ExcludedTarget[] = [];
  forEachExcluded(w, (e) => out.push({ ...e }));
  return out;
}

/** One text line per rule in effect, for the report and the plan summary. */
export function describeRules(rules: WeightingRules, formula: WeightingResult['formula'], overrides: NonNullable<PlanFile['targetOverrides']>): string[] {
  const lines: string[] = [];
  if (rules.magRange) lines.push(`magnitude window ${fmt(rules.magRange[0])} <= mag <= ${fmt(rules.magRange[1])} (tracers)`);
  if (rules.colorRange) lines.push(`colour window ${fmt(rules.colorRange[0])} <= color <= ${fmt(rules.colorRange[1])} (tracers; rows without colour pass)`);
  if (rules.radiusRangeRe) lines.push(`radius window ${fmt(rules.radiusRangeRe[0])} <= R/Re <= ${fmt(rules.radiusRangeRe[1])} (tracers, circularised R)`);
  (rules.exclusions ?? []).forEach((r, i) => lines.push(regionText(r, i) + ' (every role)'));
  const col = formula.colorPeaks.length ? ` * (${formula.colorFloor} + ${1 - formula.colorFloor} * max_k exp(-(c - c_k)^2 / (2 * ${formula.colorSigma}^2)), c_k = ${formula.colorPeaks.join(', ')})` : '';
  lines.push(`weight = 10^(-0.4 * ${formula.magSlope} * (mag - ${formula.magPivot.toFixed(2)}))${col} * (1 + R/Re)^${formula.radiusExponent}; a catalog priority replaces it`);
  const n = Object.keys(overrides).length;
  if (n) lines.push(`${n} target override(s) from targetOverrides (they win over every rule)`);
  return lines;
}

/** Counts of excluded rows per rule, in first-seen order (for the summary); a weighting's rows are read from its columns. */
export function exclusionCounts(excluded: readonly ExcludedTarget[] | WeightingResult): { rule: string; count: number }[] {
  const m = new Map<string, number>();
  const count = (e: ExcludedTarget) => m.set(e.rule, (m.get(e.rule) ?? 0) + 1);
  if (Array.isArray(excluded)) excluded.forEach(count);
  else forEachExcluded(excluded as WeightingResult, count);
  return [...m].map(([rule, count]) => ({ rule, count }));
}
