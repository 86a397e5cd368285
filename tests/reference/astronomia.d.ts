// Minimal types for the parts of astronomia 4.2 (Meeus, Astronomical Algorithms; VSOP87) that the
// reference tests use. The package ships no type declarations.
declare module 'astronomia' {
  export const solar: {
    /** Apparent equatorial position of the Sun by full VSOP87, with nutation and aberration (radians, AU). */
    apparentEquatorialVSOP87(planet: unknown, jde: number): { ra: number; dec: number; range: number };
  };
  export const sidereal: {
    /** Apparent sidereal time at Greenwich, seconds of time in [0, 86400). */
    apparent(jd: number): number;
  };
  export const deltat: {
    /** ΔT = TD − UT in seconds for a decimal year. */
    deltaT(decimalYear: number): number;
  };
  export const planetposition: {
    Planet: new (data: unknown) => unknown;
  };
  export const refraction: {
    /** Refraction (radians) for a true (airless) altitude in radians, Sæmundsson / Meeus 16.4. */
    saemundsson(h: number): number;
  };
}
declare module 'astronomia/data/vsop87Bearth' {
  const data: unknown;
  export default data;
}
