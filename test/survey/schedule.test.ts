import { beforeAll, describe, expect, it } from 'vitest';
import * as Astronomy from 'astronomy-engine';
import highsLoader from 'highs';
import type { HighsLike } from '../../src/core/solver/jointIlp';
import { scheduleSurvey, type ScheduleSettings, type SurveySchedule } from '../../src/core/survey/schedule';
import type { MaskRequest, SurveyTelescope } from '../../src/core/survey/blocks';

let highs: HighsLike;
beforeAll(async () => {
  highs = (await highsLoader()) as unknown as HighsLike;
});

// Invented sites (no real observatory): a northern one and a southern one.
const north: SurveyTelescope = { key: 'north', label: 'north 10 m', site: { latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 } };
const south: SurveyTelescope = { key: 'south', label: 'south 8 m', site: { latDeg: -27.4, lonDeg: 33.6, elevationM: 2400 } };

/** Invented galaxies spread in RA and Dec, two masks each with their own hour-angle windows. */
function requests(n: number, telescope: SurveyTelescope, hours: number): MaskRequest[] {
  const out: MaskRequest[] = [];
  for (let g = 0; g < n; g++) {
    const raDeg = (g * 360) / n + 7.3, decDeg = telescope.site.latDeg > 0 ? -10 + ((g * 23) % 60) : -50 + ((g * 23) % 60);
    for (const [k, w] of [[-3, 3], [-1.2, 2]] as [number, number][]) {
      out.push({ galaxyId: `${telescope.key}-G${g}`, maskId: `m${k}`, priority: 1 + (g % 3), hoursNeeded: hours, raDeg, decDeg, hourAngleWindowH: [k, w], telescope });
    }
  }
  return out;
}

const HARDIE = (z: number) => {
  // Hardie (1962), as quoted in references.md: X = sec z - 0.0018167(sec z - 1) - 0.002875(sec z - 1)^2 - 0.0008083(sec z - 1)^3.
  const s = 1 / Math.cos((z * Math.PI) / 180) - 1;
  return s + 1 - 0.0018167 * s - 0.002875 * s * s - 0.0008083 * s * s * s;
};

/** Every block checked with astronomy-engine (independent ephemeris) at its start, middle and end. */
function checkWithAstronomyEngine(sched: SurveySchedule, reqs: MaskRequest[], s: ScheduleSettings): number {
  let checked = 0;
  const byKey = new Map(reqs.map((r) => [`${r.galaxyId}/${r.maskId}`, r]));
  for (const b of sched.blocks) {
    const r = byKey.get(`${b.galaxyId}/${b.maskId}`)!;
    const obs = new Astronomy.Observer(r.telescope.site.latDeg, r.telescope.site.lonDeg, r.telescope.site.elevationM);
    for (const [j, iso] of [b.startUtc, new Date((Date.parse(b.startUtc) + Date.parse(b.endUtc)) / 2).toISOString(), b.endUtc].entries()) {
      const time = Astronomy.MakeTime(new Date(iso));
      // Dark: the Sun's centre more than 18 deg below the horizon (astronomical twilight, common practice), no refraction.
      const sun = Astronomy.Equator(Astronomy.Body.Sun, time, obs, true, true);
      expect(Astronomy.Horizon(time, obs, sun.ra, sun.dec).altitude, `${b.galaxyId} ${b.maskId} sun at ${iso}`).toBeLessThan(-18);
      // The galaxy: J2000 place rotated to the equator of date by astronomy-engine, geometric altitude, Hardie airmass.
      const v = Astronomy.RotateVector(Astronomy.Rotation_EQJ_EQD(time), Astronomy.VectorFromSphere(new Astronomy.Spherical(r.decDeg, r.raDeg, 1), time));
      const eq = Astronomy.EquatorFromVector(v);
      const alt = Astronomy.Horizon(time, obs, eq.ra, eq.dec).altitude;
      expect(alt, `${b.galaxyId} altitude at ${iso}`).toBeGreaterThan(0);
      expect(HARDIE(90 - alt), `${b.galaxyId} airmass at ${iso}`).toBeLessThanOrEqual(s.maxAirmass);
      // Hour angle of the galaxy inside the mask's window (tolerance 0.01 h for the ephemerides' difference).
      const ha = ((((Astronomy.SiderealTime(time) + r.telescope.site.lonDeg / 15 - eq.ra) % 24) + 36) % 24) - 12;
      expect(ha).toBeGreaterThanOrEqual(r.hourAngleWindowH![0] - 0.01);
      expect(ha).toBeLessThanOrEqual(r.hourAngleWindowH![1] + 0.01);
      // The hour angles written in schedule.csv (start and end) agree with astronomy-engine's to 0.01 h (36 s of time;
      // the written times are rounded to the second).
      if (j !== 1) expect(Math.abs(b.hourAngleH[j === 0 ? 0 : 1] - ha)).toBeLessThan(0.01);
      // Moon rules while the Moon is up.
      const moon = Astronomy.Equator(Astronomy.Body.Moon, time, obs, true, true);
      if (Astronomy.Horizon(time, obs, moon.ra, moon.dec).altitude > 0.5) {
        expect(Astronomy.Illumination(Astronomy.Body.Moon, time).phase_fraction).toBeLessThanOrEqual(s.maxMoonIllumination + 0.02);
        const sep = Astronomy.AngleBetween(moon.vec, v);
        expect(sep).toBeGreaterThanOrEqual(s.minMoonSeparationDeg - 0.2);
      }
      checked++;
    }
  }
  // No two blocks of one telescope overlap.
  for (const t of sched.telescopes) {
    const own = sched.blocks.filter((b) => b.telescopeKey === t.key).sort((a, b) => a.startJd - b.startJd);
    for (let i = 1; i < own.length; i++) expect(Date.parse(own[i].startUtc)).toBeGreaterThanOrEqual(Date.parse(own[i - 1].endUtc));
  }
  return checked;
}

describe('survey schedule against astronomy-engine: every block dark, below the airmass limit, in its window', () => {
  const settings: ScheduleSettings = {
    from: '2027-02-01', to: '2027-03-20', maxAirmass: 1.6, maxMoonIllumination: 0.6, minMoonSeparationDeg: 40,
    slotMinutes: 10, exactMaxVariables: 60_000, exactTimeLimitS: 60,
  };

  it('exact (HiGHS) on a small survey at two sites', () => {
    const reqs = [...requests(5, north, 2.5), ...requests(4, south, 3)];
    const sched = scheduleSurvey(reqs, settings, highs);
    expect(sched.solver.method).toBe('exact');
    expect(sched.solver.gap).toBe(0);
    expect(sched.blocks.length).toBeGreaterThan(6);
    expect(checkWithAstronomyEngine(sched, reqs, settings)).toBe(3 * sched.blocks.length);
    for (const m of sched.masks) expect(m.block === null).toBe(m.reason !== null);
  });

  it('heuristic beyond the exact size, with its bound', () => {
    const reqs = requests(30, north, 1.5);
    const sched = scheduleSurvey(reqs, { ...settings, exactMaxVariables: 100 }, highs);
    expect(sched.solver.method).toBe('heuristic');
    expect(sched.solver.bound).toBeGreaterThanOrEqual(sched.solver.objective);
    expect(sched.blocks.length).toBeGreaterThan(20);
    checkWithAstronomyEngine(sched, reqs, settings);
  });

  it('says why a mask is left out', () => {
    const tooLong = { ...requests(1, north, 9)[0], maskId: 'long', raDeg: 150, decDeg: 20 };
    const noWindow = { ...requests(1, north, 1)[0], maskId: 'nowindow', raDeg: 150, decDeg: 20, hourAngleWindowH: null };
    const farSouth = { ...requests(1, north, 1)[0], maskId: 'south', decDeg: -75 };
    const sched = scheduleSurvey([tooLong, noWindow, farSouth], settings, highs);
    const reason = (id: string) => sched.masks.find((m) => m.maskId === id)!.reason ?? '';
    expect(reason('long')).toMatch(/shorter than the 9\.00 h it needs/);
    expect(reason('nowindow')).toMatch(/no hour angle/);
    // Dec -75 from latitude +28: highest altitude 90 - 103.1 < 0, never up (closed form).
    expect(reason('south')).toMatch(/never below airmass 1.6/);
  });
});
