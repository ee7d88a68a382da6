/**
 * Type declarations for the parts of astronomia (npm, MIT, after Meeus's Astronomical Algorithms)
 * that observe/ uses. Angles are radians, times Julian days, as in the library.
 */
declare module 'astronomia/base' {
  export class Coord {
    constructor(ra?: number, dec?: number, range?: number, elongation?: number);
    ra: number;
    dec: number;
    range: number;
    lon: number;
    lat: number;
  }
  export function illuminated(phaseAngleRad: number): number;
  export function J2000Century(jde: number): number;
  const base: { Coord: typeof Coord; illuminated: typeof illuminated; J2000Century: typeof J2000Century; AU: number };
  export default base;
}
declare module 'astronomia/sidereal' {
  /** Mean sidereal time at Greenwich, seconds of time in [0, 86400). */
  export function mean(jdUt: number): number;
  /** Apparent sidereal time at Greenwich, seconds of time in [0, 86400). */
  export function apparent(jdUt: number): number;
  const sidereal: { mean: typeof mean; apparent: typeof apparent };
  export default sidereal;
}
declare module 'astronomia/nutation' {
  /** [delta psi, delta epsilon] in radians (Meeus ch. 22). */
  export function nutation(jde: number): [number, number];
  export function meanObliquity(jde: number): number;
  const nutationModule: { nutation: typeof nutation; meanObliquity: typeof meanObliquity };
  export default nutationModule;
}
declare module 'astronomia/deltat' {
  /** Delta T = TD - UT in seconds for a decimal year. */
  export function deltaT(decimalYear: number): number;
  const deltat: { deltaT: typeof deltaT };
  export default deltat;
}
declare module 'astronomia/solar' {
  import type { Coord } from 'astronomia/base';
  export function apparentEquatorial(jde: number): Coord;
  /** Sun-Earth distance in AU for Julian centuries from J2000. */
  export function radius(t: number): number;
  const solar: { apparentEquatorial: typeof apparentEquatorial; radius: typeof radius };
  export default solar;
}
declare module 'astronomia/moonposition' {
  import type { Coord } from 'astronomia/base';
  /** Geocentric ecliptic longitude/latitude (mean equinox of date, no nutation), range in km. */
  export function position(jde: number): Coord;
  const moonposition: { position: typeof position };
  export default moonposition;
}
declare module 'astronomia/moonillum' {
  import type { Coord } from 'astronomia/base';
  export function phaseAngleEquatorial(cMoon: Coord, cSun: Coord): number;
  const moonillum: { phaseAngleEquatorial: typeof phaseAngleEquatorial };
  export default moonillum;
}
declare module 'astronomia/coord' {
  export class Ecliptic {
    constructor(lon?: number, lat?: number);
    lon: number;
    lat: number;
    toEquatorial(obliquityRad: number): Equatorial;
  }
  export class Equatorial {
    constructor(ra?: number, dec?: number);
    ra: number;
    dec: number;
  }
  const coord: { Ecliptic: typeof Ecliptic; Equatorial: typeof Equatorial };
  export default coord;
}
declare module 'astronomia/precess' {
  import type { Equatorial } from 'astronomia/coord';
  /** Precess from one Julian epoch (years) to another, proper motions in radians per year. */
  export function position(eqFrom: Equatorial, epochFrom: number, epochTo: number, mRa: number, mDec: number): Equatorial;
  const precess: { position: typeof position };
  export default precess;
}
declare module 'astronomia/globe' {
  export class Ellipsoid {
    constructor(radius: number, flat: number);
    /** [rho sin phi', rho cos phi'] for geographic latitude (rad) and height (m). */
    parallaxConstants(latRad: number, heightM: number): [number, number];
  }
  export const Earth76: Ellipsoid;
  const globe: { Earth76: Ellipsoid; Ellipsoid: typeof Ellipsoid };
  export default globe;
}
declare module 'astronomia/parallactic' {
  /** Parallactic angle (rad) for latitude, declination and hour angle (rad), Meeus (14.1). */
  export function parallacticAngle(latRad: number, decRad: number, haRad: number): number;
  const parallactic: { parallacticAngle: typeof parallacticAngle };
  export default parallactic;
}
declare module 'astronomia/refraction' {
  /** Bennett's refraction (rad) for an apparent altitude (rad), Meeus (16.4). */
  export function bennett(apparentAltitudeRad: number): number;
  const refraction: { bennett: typeof bennett };
  export default refraction;
}
