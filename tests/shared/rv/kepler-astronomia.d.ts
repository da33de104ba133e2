// Types for the one part of the astronomia package (4.2.0, a port of Meeus's Astronomical Algorithms) the tests use.
declare module 'astronomia' {
  export const kepler: {
    kepler2(e: number, m: number, places: number): number
    kepler3(e: number, m: number): number
    trueAnomaly(E: number, e: number): number
  }
}
