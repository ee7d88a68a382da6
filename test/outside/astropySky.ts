/**
 * Positions of fixed targets from astropy (Debian python3-astropy 5.2.1, run by /usr/bin/python3), for the outside
 * checks of altitude, hour angle, airmass and parallactic angle. astropy's ICRS -> AltAz chain (ERFA: precession-
 * nutation IAU 2006/2000A, aberration, UT1 from the bundled IERS-B table, polar motion) shares nothing with the
 * project's Meeus-based chain. IERS downloads are off (no network); the dates used lie inside the bundled table.
 * A missing interpreter or astropy fails the test with a message saying how to install it (never a skip).
 */
import { runPython } from '../catalog/astropyHelper';

export interface SkyQuery {
  utc: string;
  raDeg: number;
  decDeg: number;
  latDeg: number;
  lonDeg: number;
  elevationM: number;
  /** Optional air for refraction (astropy's AltAz pressure/temperature/relative_humidity/obswl); absent: none. */
  pressureHPa?: number;
  temperatureC?: number;
  relativeHumidity?: number;
  wavelengthA?: number;
}

export interface SkyAnswer {
  /** Altitude (deg) without refraction, or apparent with the query's air; secz of the same. */
  altDeg: number;
  secz: number;
  /** Hour angle (deg, positive West, in (-180, 180]) and declination of date, from astropy's HADec frame. */
  haDeg: number;
  decOfDateDeg: number;
  /** Position angle (deg East of North) of the zenith seen from the target, in the true-equator frame of date. */
  zenithPaDeg: number;
}

const SCRIPT = String.raw`
import json, sys, warnings
warnings.simplefilter('ignore')
from astropy.utils import iers
iers.conf.auto_download = False
iers.conf.auto_max_age = None
import astropy.units as u
from astropy.time import Time
from astropy.coordinates import SkyCoord, EarthLocation, AltAz, HADec, TETE
qs = json.load(sys.stdin)
out = [None] * len(qs)
groups = {}
for i, q in enumerate(qs):
    key = (q['latDeg'], q['lonDeg'], q['elevationM'], q.get('pressureHPa'), q.get('temperatureC'), q.get('relativeHumidity'), q.get('wavelengthA'))
    groups.setdefault(key, []).append(i)
# One vectorised transform per site and air.
for key, idx in groups.items():
    q0 = qs[idx[0]]
    loc = EarthLocation.from_geodetic(lon=q0['lonDeg'] * u.deg, lat=q0['latDeg'] * u.deg, height=q0['elevationM'] * u.m)
    t = Time([qs[i]['utc'] for i in idx], scale='utc')
    c = SkyCoord(ra=[qs[i]['raDeg'] for i in idx] * u.deg, dec=[qs[i]['decDeg'] for i in idx] * u.deg, frame='icrs')
    kw = {}
    if 'pressureHPa' in q0:
        kw = dict(pressure=q0['pressureHPa'] * u.hPa, temperature=q0['temperatureC'] * u.deg_C,
                  relative_humidity=q0['relativeHumidity'], obswl=q0['wavelengthA'] * u.AA)
    aa = c.transform_to(AltAz(obstime=t, location=loc, **kw))
    hd = c.transform_to(HADec(obstime=t, location=loc))
    zen = SkyCoord(AltAz(alt=[90] * len(idx) * u.deg, az=[0] * len(idx) * u.deg, obstime=t, location=loc)).transform_to(TETE(obstime=t, location=loc))
    tc = c.transform_to(TETE(obstime=t, location=loc))
    pa = tc.position_angle(zen).deg
    ha = hd.ha.wrap_at(180 * u.deg).deg
    for k, i in enumerate(idx):
        out[i] = dict(altDeg=float(aa.alt.deg[k]), secz=float(aa.secz[k]), haDeg=float(ha[k]),
                      decOfDateDeg=float(hd.dec.deg[k]), zenithPaDeg=float(pa[k]))
print(json.dumps(out))
`;

/** astropy's answers for each query, in order. */
export function astropySky(queries: readonly SkyQuery[]): SkyAnswer[] {
  return JSON.parse(runPython(SCRIPT, JSON.stringify(queries))) as SkyAnswer[];
}
