import { z } from 'zod'

const optionalNumber = (check: z.ZodNumber) => check.nullable().optional()

/**
 * An observatory for converting times to BJD_TDB: a site of `shared/time` SITES (by `id`) or a
 * custom one; longitude east-positive, geodetic latitude, height above the WGS84 ellipsoid.
 */
export const siteSchema = z.object({
  id: z.string().trim().max(60).optional(),
  name: z.string().trim().min(1, 'is required').max(120),
  lonDeg: z.number().min(-180, 'must be in [-180, 180]').max(180, 'must be in [-180, 180]'),
  latDeg: z.number().min(-90, 'must be in [-90, 90]').max(90, 'must be in [-90, 90]'),
  heightM: z.number().min(-500, 'must be in [-500, 6000] m').max(6000, 'must be in [-500, 6000] m'),
})
export type SiteInput = z.infer<typeof siteSchema>

/** Proper motion bound: the fastest known star moves 10.4″/yr; 20″/yr leaves room and catches unit slips (″ for mas). */
const pm = z.number().min(-20000, 'must be within ±20 000 mas/yr').max(20000, 'must be within ±20 000 mas/yr')

export const starObjectSchema = z.object({
  name: z.string().trim().min(1, 'is required').max(120),
  massMsun: z.number().positive('must be positive').max(300),
  massErrMsun: z.number().min(0, 'must not be negative').max(300),
  radiusRsun: optionalNumber(z.number().positive('must be positive')),
  teffK: optionalNumber(z.number().positive('must be positive').max(100000)),
  luminosityLsun: optionalNumber(z.number().positive('must be positive')),
  raDeg: optionalNumber(z.number().min(0, 'must be in [0, 360)').lt(360, 'must be in [0, 360)')),
  decDeg: optionalNumber(z.number().min(-90, 'must be in [-90, 90]').max(90, 'must be in [-90, 90]')),
  /** μα* = μα cos δ, mas/yr (as catalogues give it). */
  pmRaMasYr: optionalNumber(pm),
  /** μδ, mas/yr. */
  pmDecMasYr: optionalNumber(pm),
  /** Epoch of the coordinates, a Julian date (TDB); J2000.0 (2451545.0) when absent. Gaia DR3: 2457389.0 (J2016.0). */
  coordEpochJd: optionalNumber(z.number().min(2378496.5, 'must be a Julian date in 1800–2200').max(2524593.5, 'must be a Julian date in 1800–2200')),
  defaultSite: siteSchema.nullable().optional(),
  notes: z.string().max(10000).nullable().optional(),
})

/** Proper motion and its epoch need coordinates to move; checked where the fields are present. */
function astrometryNeedsCoordinates(v: Partial<z.infer<typeof starObjectSchema>>, ctx: z.RefinementCtx, partial: boolean): void {
  const hasPm = (v.pmRaMasYr ?? null) !== null || (v.pmDecMasYr ?? null) !== null
  if (!hasPm) return
  const missing = partial ? v.raDeg === null || v.decDeg === null : (v.raDeg ?? null) === null || (v.decDeg ?? null) === null
  if (missing) ctx.addIssue({ code: 'custom', path: ['raDeg'], message: 'is required with a proper motion (RA and Dec both)' })
}

export const starFieldsSchema = starObjectSchema.superRefine((v, ctx) => astrometryNeedsCoordinates(v, ctx, false))
export const createStarRequestSchema = starFieldsSchema
export type CreateStarRequest = z.infer<typeof createStarRequestSchema>
export const updateStarRequestSchema = starObjectSchema.partial().superRefine((v, ctx) => astrometryNeedsCoordinates(v, ctx, true))
export type UpdateStarRequest = z.infer<typeof updateStarRequestSchema>

export const starSummarySchema = z.object({
  id: z.number().int(), name: z.string(), massMsun: z.number(), massErrMsun: z.number(),
  nPoints: z.number().int(), instruments: z.array(z.string()), updatedAt: z.string(),
})
export type StarSummary = z.infer<typeof starSummarySchema>
export const starListResponseSchema = z.array(starSummarySchema)

export const starSchema = starSummarySchema.extend({
  teamId: z.number().int(),
  radiusRsun: z.number().nullable(), teffK: z.number().nullable(), luminosityLsun: z.number().nullable(),
  raDeg: z.number().nullable(), decDeg: z.number().nullable(), notes: z.string().nullable(),
  pmRaMasYr: z.number().nullable(), pmDecMasYr: z.number().nullable(), coordEpochJd: z.number().nullable(),
  defaultSite: siteSchema.nullable(),
  createdAt: z.string(),
})
export type Star = z.infer<typeof starSchema>
