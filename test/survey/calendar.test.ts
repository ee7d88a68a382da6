import { describe, expect, it } from 'vitest';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { calendarSvg, galaxyColour, localNightHours } from '../../src/core/survey/calendarSvg';
import { scheduleSurvey } from '../../src/core/survey/schedule';
import type { MaskRequest } from '../../src/core/survey/blocks';
import { jdOfDateText } from '../../src/core/observe/night';

const telescope = { key: 't', label: 'invented 8 m', site: { latDeg: -25, lonDeg: -70, elevationM: 2500 } };

describe('calendar SVG', () => {
  const requests: MaskRequest[] = Array.from({ length: 100 }, (_, g) => ({
    galaxyId: `Halo ${g}`, maskId: 'm1', priority: 1, hoursNeeded: 1, raDeg: (g * 3.6 + 60) % 360, decDeg: -30, hourAngleWindowH: [-4, 4], telescope,
  }));
  const sched = scheduleSurvey(requests, { from: '2027-03-01', to: '2027-04-15', maxAirmass: 2, maxMoonIllumination: 1, minMoonSeparationDeg: 0, slotMinutes: 15, exactMaxVariables: 0, exactTimeLimitS: 1 }, null);
  const svg = calendarSvg(sched, requests.map((r) => r.galaxyId), 'invented survey');

  it('is well-formed XML with one rectangle per block and one legend entry per galaxy', () => {
    expect(XMLValidator.validate(svg)).toBe(true);
    expect(sched.blocks.length).toBeGreaterThan(20);
    const blocks = svg.match(/class="block"/g) ?? [];
    expect(blocks.length).toBe(sched.blocks.length);
    for (const id of requests.map((r) => r.galaxyId)) expect(svg).toContain(`>${id} (`);
    const doc = new XMLParser({ ignoreAttributes: false }).parse(svg);
    expect(doc.svg['@_xmlns']).toBe('http://www.w3.org/2000/svg');
  });

  it('gives 100 galaxies 100 different colours', () => {
    expect(new Set(Array.from({ length: 100 }, (_, i) => galaxyColour(i))).size).toBe(100);
  });

  it('places local mean midnight at 0 h (longitude -70 deg: 04:40 UTC)', () => {
    // Local mean time = UT + longitude / 15 h (common practice): 00:00 local mean at -70 deg is 04:40 UT.
    const jd = jdOfDateText('2027-03-02') + (4 + 40 / 60) / 24;
    expect(localNightHours(jd, '2027-03-01', -70)).toBeCloseTo(0, 9);
  });
});
