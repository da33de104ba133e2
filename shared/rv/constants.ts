/**
 * Physical constants used by the numerics, in SI units, in one place.
 *
 * Masses enter only as products GM (known far better than G or M separately):
 * IAU 2015 Resolution B3 nominal values for the Sun, Jupiter and the Earth,
 * IAU 2012 Resolution B2 for the astronomical unit. G itself (CODATA 2018) is
 * exported only for callers that need a mass in kilograms.
 */

/** Nominal solar mass parameter (GM)☉ᴺ, m³ s⁻² — IAU 2015 Resolution B3. */
export const GM_SUN = 1.3271244e20
/** Nominal Jupiter mass parameter (GM)♃ᴺ, m³ s⁻² — IAU 2015 Resolution B3. */
export const GM_JUPITER = 1.2668653e17
/** Nominal Earth mass parameter (GM)⊕ᴺ, m³ s⁻² — IAU 2015 Resolution B3. */
export const GM_EARTH = 3.986004e14
/** Astronomical unit, m (exact by definition) — IAU 2012 Resolution B2. */
export const AU = 149597870700
/** Day, s (the Julian-day unit of all times in Starsway). */
export const DAY = 86400
/** Newtonian constant of gravitation, m³ kg⁻¹ s⁻² — CODATA 2018. Only for masses in kg. */
export const G = 6.6743e-11
/** Solar mass in kg implied by the two values above (GM☉ / G). */
export const M_SUN_KG = GM_SUN / G
