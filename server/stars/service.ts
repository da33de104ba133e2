import { Op, QueryTypes, UniqueConstraintError } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { ConflictError, NotFoundError, ValidationError } from '../errors.ts'
import type { CreateStarRequest, Star as StarJson, StarSummary, UpdateStarRequest } from '../../shared/api/stars.ts'
import { record } from '../audit/service.ts'

interface Stats { nPoints: number; instruments: string[]; lastUpload: Date | null }

/** Points (excluded ones included: they stay in the data), instruments, last upload, per star. */
async function statsFor(s: Services, starIds: number[]): Promise<Map<number, Stats>> {
  const out = new Map<number, Stats>()
  if (starIds.length === 0) return out
  const rows = await s.sequelize.query<{ star_id: number; instrument: string; n: string; last: Date }>(
    `SELECT d.star_id, d.instrument, count(m.id) AS n, max(d.created_at) AS last
       FROM datasets d LEFT JOIN measurements m ON m.dataset_id = d.id
      WHERE d.star_id IN (:ids) GROUP BY d.star_id, d.instrument ORDER BY min(d.id)`,
    { replacements: { ids: starIds }, type: QueryTypes.SELECT },
  )
  for (const r of rows) {
    const st = out.get(r.star_id) ?? { nPoints: 0, instruments: [], lastUpload: null }
    st.nPoints += Number(r.n)
    if (!st.instruments.includes(r.instrument)) st.instruments.push(r.instrument)
    if (!st.lastUpload || r.last > st.lastUpload) st.lastUpload = r.last
    out.set(r.star_id, st)
  }
  return out
}

function summary(star: Pick<Star, 'id' | 'name' | 'massMsun' | 'massErrMsun' | 'updatedAt'>, st: Stats | undefined): StarSummary {
  const updated = st?.lastUpload && st.lastUpload > star.updatedAt ? st.lastUpload : star.updatedAt
  return {
    id: star.id, name: star.name, massMsun: star.massMsun, massErrMsun: star.massErrMsun,
    nPoints: st?.nPoints ?? 0, instruments: st?.instruments ?? [], updatedAt: updated.toISOString(),
  }
}

export async function starJson(s: Services, star: Star): Promise<StarJson> {
  const st = (await statsFor(s, [star.id])).get(star.id)
  return {
    ...summary(star, st), teamId: star.teamId, radiusRsun: star.radiusRsun, teffK: star.teffK,
    luminosityLsun: star.luminosityLsun, raDeg: star.raDeg, decDeg: star.decDeg, notes: star.notes,
    pmRaMasYr: star.pmRaMasYr ?? null, pmDecMasYr: star.pmDecMasYr ?? null, coordEpochJd: star.coordEpochJd ?? null,
    defaultSite: star.defaultSite ?? null,
    createdAt: star.createdAt.toISOString(),
  }
}

/**
 * The team's stars in use, by name, with the same figures as statsFor, in one query: the list is
 * the most frequent read, and under load each round trip to the database costs more than the
 * query itself (issue 11).
 */
export async function listStars(s: Services, teamId: number): Promise<StarSummary[]> {
  const rows = await s.sequelize.query<{
    id: number; name: string; mass_msun: number; mass_err_msun: number; updated_at: Date
    instruments: string[] | null; n: string | null; last: Date | null
  }>(
    `SELECT s.id, s.name, s.mass_msun, s.mass_err_msun, s.updated_at, st.instruments, st.n, st.last
       FROM stars s
       LEFT JOIN LATERAL (
         SELECT array_agg(g.instrument ORDER BY g.first) AS instruments, sum(g.n) AS n, max(g.last) AS last
           FROM (SELECT d.instrument, count(m.id) AS n, max(d.created_at) AS last, min(d.id) AS first
                   FROM datasets d LEFT JOIN measurements m ON m.dataset_id = d.id
                  WHERE d.star_id = s.id GROUP BY d.instrument) g
       ) st ON true
      WHERE s.team_id = :teamId AND s.archived_at IS NULL
      ORDER BY s.name ASC`,
    { replacements: { teamId }, type: QueryTypes.SELECT },
  )
  return rows.map((r) => summary(
    { id: r.id, name: r.name, massMsun: r.mass_msun, massErrMsun: r.mass_err_msun, updatedAt: r.updated_at },
    r.instruments ? { nPoints: Number(r.n ?? 0), instruments: r.instruments, lastUpload: r.last } : undefined,
  ))
}

function nameTaken(err: unknown): never {
  if (err instanceof UniqueConstraintError) throw new ConflictError('A star with this name already exists in the team.', 'name')
  throw err
}

export async function createStar(s: Services, actor: User, teamId: number, input: CreateStarRequest): Promise<Star> {
  try {
    return await s.sequelize.transaction(async (transaction) => {
      const star = await s.models.Star.create({
        teamId, name: input.name, massMsun: input.massMsun, massErrMsun: input.massErrMsun,
        radiusRsun: input.radiusRsun ?? null, teffK: input.teffK ?? null, luminosityLsun: input.luminosityLsun ?? null,
        raDeg: input.raDeg ?? null, decDeg: input.decDeg ?? null, notes: input.notes ?? null, archivedAt: null,
        pmRaMasYr: input.pmRaMasYr ?? null, pmDecMasYr: input.pmDecMasYr ?? null, coordEpochJd: input.coordEpochJd ?? null,
        defaultSite: input.defaultSite ?? null,
      }, { transaction })
      await record(s, { teamId, userId: actor.id, action: 'star.create', entity: 'star', entityId: star.id, detail: { name: star.name } }, transaction)
      return star
    })
  } catch (err) { nameTaken(err) }
}

export async function updateStar(s: Services, actor: User, star: Star, input: UpdateStarRequest): Promise<Star> {
  const changes: Record<string, { from: unknown; to: unknown }> = {}
  for (const [k, v] of Object.entries(input) as [keyof UpdateStarRequest, unknown][]) {
    if (v === undefined) continue
    const before = star.get(k)
    if (JSON.stringify(before ?? null) !== JSON.stringify(v)) changes[k] = { from: before ?? null, to: v }
  }
  if (Object.keys(changes).length === 0) return star
  // a proper motion needs coordinates: check the star as it will be, not only the fields sent
  const after = { ...star.get({ plain: true }), ...Object.fromEntries(Object.entries(changes).map(([k, c]) => [k, c.to])) } as Star
  if ((after.pmRaMasYr != null || after.pmDecMasYr != null) && (after.raDeg == null || after.decDeg == null)) {
    throw new ValidationError('raDeg: is required with a proper motion (RA and Dec both)', 'raDeg')
  }
  try {
    return await s.sequelize.transaction(async (transaction) => {
      star.set(Object.fromEntries(Object.entries(changes).map(([k, c]) => [k, c.to])))
      await star.save({ transaction })
      await record(s, { teamId: star.teamId, userId: actor.id, action: 'star.update', entity: 'star', entityId: star.id, detail: { changes } }, transaction)
      return star
    })
  } catch (err) { nameTaken(err) }
}

/** Hides the star from lists; its datasets, measurements and raw files stay. */
export async function archiveStar(s: Services, actor: User, star: Star): Promise<void> {
  await s.sequelize.transaction(async (transaction) => {
    star.archivedAt = new Date()
    await star.save({ transaction })
    await record(s, { teamId: star.teamId, userId: actor.id, action: 'star.archive', entity: 'star', entityId: star.id, detail: { name: star.name } }, transaction)
  })
}

/** The team's archived stars, newest archive first (the same summary as the list). */
export async function listArchived(s: Services, teamId: number): Promise<StarSummary[]> {
  const stars = await s.models.Star.findAll({ where: { teamId, archivedAt: { [Op.ne]: null } }, order: [['archivedAt', 'DESC']] })
  const stats = await statsFor(s, stars.map((x) => x.id))
  return stars.map((x) => summary(x, stats.get(x.id)))
}

/** Brings an archived star back into the lists (audited); its data were never touched. */
export async function restoreStar(s: Services, actor: User, teamId: number, starId: number): Promise<Star> {
  const star = await s.models.Star.findOne({ where: { id: starId, teamId, archivedAt: { [Op.ne]: null } } })
  if (!star) throw new NotFoundError('Archived star')
  try {
    return await s.sequelize.transaction(async (transaction) => {
      star.archivedAt = null
      await star.save({ transaction })
      await record(s, { teamId, userId: actor.id, action: 'star.restore', entity: 'star', entityId: star.id, detail: { name: star.name } }, transaction)
      return star
    })
  } catch (err) { nameTaken(err) }
}
