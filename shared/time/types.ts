/** Time scales a dataset's times can be in (`tdb` means already barycentric: BJD_TDB). */
export type TimeScale = 'utc' | 'tt' | 'tdb' | 'hjd-utc'

/**
 * A star's position: ICRS right ascension and declination (degrees) at `epochJd` (TDB Julian date,
 * default J2000.0 = 2451545.0), with optional proper motion in mas/yr — `pmRaMasYr` is μα* = μα cos δ,
 * as catalogues give it.
 */
export interface Target { raDeg: number; decDeg: number; pmRaMasYr?: number; pmDecMasYr?: number; epochJd?: number }

/** An observatory: longitude east-positive and geodetic latitude (degrees), height above the WGS84 ellipsoid (m). */
export interface Site { lonDeg: number; latDeg: number; heightM: number }
