/** Plain-text forecast summaries: one forecast, or two side by side (`--against`). Percentages are 1-sigma errors. */
import type { Forecast } from './forecast';

const pct = (v: number | null) => (v === null ? '--' : `${(v * 100).toFixed(1)} %`);
const num = (v: number | null, d = 1) => (v === null || !Number.isFinite(v) ? '--' : v.toFixed(d));
const sci = (v: number | null) => (v === null ? '--' : v.toExponential(2));

/** Rows [label, value] of the headline numbers, shared by the single and the side-by-side summary. */
function headline(f: Forecast): [string, string][] {
  const n = f.hours.nights;
  const spinAt1 = f.spinProfile.find((p) => p.withinRe >= 1);
  return [
    ['tracer slits', `${f.tracerSlits}`],
    ['expected cluster velocities', num(f.expectedVelocities)],
    ['median velocity error (km/s)', num(f.medianVelocityErrorKms)],
    ['dispersion slope d ln s / d ln R', `${num(f.dispersionSlope.slope, 2)} +- ${num(f.dispersionSlope.slopeError, 2)}`],
    ['rotation amplitude error (km/s)', num(f.rotation.amplitudeErrorKms)],
    ['rotation detected at 3 sigma', f.rotation.detectionFraction === null ? '--' : `${(f.rotation.detectionFraction * 100).toFixed(0)} % of mocks`],
    ['kinematic PA error (deg)', num(f.rotation.kinematicPaErrorDeg)],
    [`mass within outermost radius`, `${sci(f.mass.massMsun)} Msun within ${num(f.mass.radiusKpc)} kpc (${num(f.mass.radiusRe)} Re)`],
    ['mass error (+ distance)', `${pct(f.mass.fracError)} (${pct(f.mass.fracErrorWithDistance)})`],
    ['starlight bins with a velocity', `${f.starlightBins.filter((b) => b.velocityErrorKms !== null).length} of ${f.starlightBins.length}`],
    ['lambda_R within 1 Re', spinAt1 ? `${num(spinAt1.lambdaR, 3)} +- ${num(spinAt1.error, 3)}` : '--'],
    ['hours (all masks, with overheads)', num(f.hours.total, 2)],
    ['nights needed', n ? (n.nightsNeeded === null ? `more than the ${n.nightsUsable} usable` : `${n.nightsNeeded} of ${n.nightsUsable} usable`) : '--'],
  ];
}

/** The summary of one forecast, as printed by `haloweave forecast`. */
export function formatForecastSummary(f: Forecast): string[] {
  const lines = [
    `Forecast for ${f.galaxyId}: ${f.trials} mocks (seed ${f.seed}; quoted errors good to ${(f.errorPrecision * 100).toFixed(1)} %), distance ${f.distanceMpc} Mpc (1 Re = ${f.kpcPerRe.toFixed(2)} kpc)`,
    `Model: sigma ${f.settings.kinematics.sigmaKms} km/s at 1 Re x (R/Re)^${f.settings.kinematics.sigmaSlope}, rotation ${f.rotation.amplitudeKms} km/s at PA ${f.rotation.kinematicPaDeg.toFixed(1)} deg; velocities need S/N >= ${f.settings.velocityErrors.minSnPerA} per A`,
  ];
  const width = Math.max(...headline(f).map(([k]) => k.length));
  for (const [k, v] of headline(f)) lines.push(`  ${k.padEnd(width)}  ${v}`);
  lines.push('Dispersion profile (1-sigma fractional error; ideal = 1/sqrt(2n) for exact velocities):');
  lines.push('     R/Re         kpc        n  sigma   error   ideal');
  for (const b of f.dispersionProfile) {
    lines.push(`  ${`${num(b.fromRe)}-${num(b.toRe)}`.padStart(9)}  ${`${num(b.fromKpc)}-${num(b.toKpc)}`.padStart(10)}  ${num(b.n).padStart(6)}  ${num(b.sigmaKms, 0).padStart(5)}  ${pct(b.sigmaFracError).padStart(6)}  ${pct(b.idealFracError).padStart(6)}`);
  }
  const source = f.hours.targetSnSource === 'default' ? 'the default' : f.hours.targetSnSource;
  lines.push(`Hours per mask (${(f.hours.completeness * 100).toFixed(0)} % of tracer slits to S/N ${f.hours.targetSnPerA} per A from ${source}, + ${f.hours.overheadHoursPerMask} h overhead; planned exposure ${f.hours.plannedExposureHours.toFixed(2)} h): ` +
    f.hours.masks.map((m) => `${m.maskId} ${m.hours.toFixed(2)} h${m.exposureHours === null ? ' (target S/N out of reach: planned exposure)' : ''}`).join(', '));
  for (const site of f.hours.sites ?? []) {
    const n = site.nights;
    lines.push(`  site ${site.latDeg.toFixed(2)}, ${site.lonDeg.toFixed(2)} deg (${site.profileIds.join(', ')}): ${site.hours.toFixed(2)} h, ` +
      (n.nightsNeeded === null ? `more than the ${n.nightsUsable} usable nights` : `${n.nightsNeeded} of ${n.nightsUsable} usable nights`));
  }
  for (const n of f.notes) lines.push(`note: ${n}`);
  return lines;
}

/** Two forecasts side by side (A the folder forecast, B the --against folder). */
export function formatComparison(a: Forecast, b: Forecast, nameA: string, nameB: string): string[] {
  const ha = headline(a), hb = headline(b);
  const wk = Math.max(...ha.map(([k]) => k.length)), wa = Math.max(nameA.length, ...ha.map(([, v]) => v.length));
  const lines = [`  ${''.padEnd(wk)}  ${nameA.padEnd(wa)}  ${nameB}`];
  for (let i = 0; i < ha.length; i++) lines.push(`  ${ha[i][0].padEnd(wk)}  ${ha[i][1].padEnd(wa)}  ${hb[i][1]}`);
  lines.push('  dispersion error by radius (R/Re: A | B):');
  const edges = [...new Set([...a.dispersionProfile, ...b.dispersionProfile].map((x) => x.fromRe))].sort((x, y) => x - y);
  const at = (f: Forecast, r: number) => f.dispersionProfile.find((x) => x.fromRe <= r && r < x.toRe);
  for (const r of edges) {
    const x = at(a, r), y = at(b, r);
    lines.push(`    ${num(r).padStart(5)}:  ${x ? `${pct(x.sigmaFracError)} (n ${num(x.n)}, ${num(x.fromRe)}-${num(x.toRe)})` : '--'}  |  ${y ? `${pct(y.sigmaFracError)} (n ${num(y.n)}, ${num(y.fromRe)}-${num(y.toRe)})` : '--'}`);
  }
  return lines;
}
