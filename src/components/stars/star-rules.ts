import { siteSchema, starObjectSchema } from '@shared/api/stars.ts'
import { schemaRule, toNumber, type Rule } from '@/components/app/rules.ts'

export const massRule = schemaRule(starObjectSchema.shape.massMsun, 'Mass')
export const massErrRule = schemaRule(starObjectSchema.shape.massErrMsun, 'Mass uncertainty')
export const radiusRule = schemaRule(starObjectSchema.shape.radiusRsun, 'Radius')
export const teffRule = schemaRule(starObjectSchema.shape.teffK, 'Teff')
export const luminosityRule = schemaRule(starObjectSchema.shape.luminosityLsun, 'Luminosity')
export const raRule = schemaRule(starObjectSchema.shape.raDeg, 'RA')
export const decRule = schemaRule(starObjectSchema.shape.decDeg, 'Dec')
export const pmRaRule = schemaRule(starObjectSchema.shape.pmRaMasYr, 'μα*')
export const pmDecRule = schemaRule(starObjectSchema.shape.pmDecMasYr, 'μδ')
export const siteLonRule = schemaRule(siteSchema.shape.lonDeg, 'Longitude')
export const siteLatRule = schemaRule(siteSchema.shape.latDeg, 'Latitude')
export const siteHeightRule = schemaRule(siteSchema.shape.heightM, 'Height')

const J2000 = 2451545.0
/** Julian year (2016.0) → Julian date of that epoch (TDB): JD = 2451545.0 + (year − 2000) × 365.25 (common practice). */
export const julianYearToJd = (year: number) => J2000 + (year - 2000) * 365.25
export const jdToJulianYear = (jd: number) => 2000 + (jd - J2000) / 365.25
/** The epoch, typed as a Julian year, checked as the JD the schema accepts (1800–2200). */
export const epochRule: Rule = (v) => {
  const n = toNumber(v)
  if (n === null) return true
  if (!Number.isFinite(n)) return 'Enter a year such as 2016.0'
  const r = starObjectSchema.shape.coordEpochJd.safeParse(julianYearToJd(n))
  return r.success || 'Epoch must be a year in 1800–2200'
}
