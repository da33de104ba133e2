/**
 * Unit strings for machine-readable exports, in the vocabulary astropy's `u.Unit(...)` parses
 * (checked by `scripts/reference/read_exports.py`): the JSON export, the ECSV header and the sampling
 * summaries all name units this way. Screens keep their own typography (M☉, M⊕, m/s).
 */
const ASTROPY: Record<string, string> = {
  'm/s': 'm / s', 'km/s': 'km / s', 'm/s/d': 'm / (s d)', 'm/s/d²': 'm / (s d2)', 'm/s/yr': 'm / (s yr)', 'm/s/yr²': 'm / (s yr2)',
  d: 'd', deg: 'deg', rad: 'rad', au: 'AU', AU: 'AU',
  M_Jup: 'jupiterMass', M_J: 'jupiterMass', 'M♃': 'jupiterMass',
  M_Earth: 'earthMass', 'M⊕': 'earthMass',
  M_Sun: 'solMass', 'M☉': 'solMass', R_Sun: 'solRad', 'R☉': 'solRad', L_Sun: 'solLum', 'L☉': 'solLum', K: 'K',
  JD: 'd', BJD: 'd', '': '',
}

/** The astropy spelling of one of our unit strings; unknown strings are returned unchanged. */
export function astropyUnit(unit: string): string {
  return ASTROPY[unit] ?? unit
}
