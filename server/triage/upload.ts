// Survey upload: many stars at once — several files, one per star (the star from a "# star: X"
// header line, else the file name), or one table with a star column split per star — each part
// read and stored by the ordinary upload path (server/uploads preview → commit with the detected
// mapping, the same checks and the same all-or-nothing transaction). Stars are matched by name in
// the team; a new star is created only when its first file is stored (its mass from a
// "# starMass: 0.93 ± 0.05" header line or the form's starMass). Every part is either stored or
// refused with the upload path's own message; then the search of every star that got data is queued.
import { Op } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { HttpError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { commit, preview, type UploadedFile } from '../uploads/service.ts'
import type { SurveyUploadFile, SurveyUploadOptions, SurveyUploadResponse } from '../../shared/api/survey.ts'
import { massFromHeader, splitByStar, starFromFileName, starFromHeader } from './split.ts'
import { queueStars } from './service.ts'

interface Part { star: string; file: UploadedFile; from: string }

/** The parts of the upload, one per (star, file). */
export function partsOf(files: UploadedFile[], starColumn?: string): Array<Part | SurveyUploadFile> {
  const out: Array<Part | SurveyUploadFile> = []
  for (const f of files) {
    const text = f.buffer.toString('utf8')
    const split = splitByStar(text, starColumn)
    if (split && split.length) {
      for (const t of split) {
        if (!t.star) { out.push({ fileName: f.originalname, star: '', status: 'refused', message: `${f.originalname}: ${t.rows} rows have an empty star column: name their star.`, measurements: 0 }); continue }
        const buffer = Buffer.from(t.text, 'utf8')
        out.push({ star: t.star, from: f.originalname, file: { originalname: `${t.star} from ${f.originalname}`, buffer, size: buffer.length } })
      }
    } else if (starColumn) {
      out.push({ fileName: f.originalname, star: '', status: 'refused', message: `${f.originalname}: no column "${starColumn}" in the header line: check the star column's name.`, measurements: 0 })
    } else {
      out.push({ star: starFromHeader(text) ?? starFromFileName(f.originalname), from: f.originalname, file: f })
    }
  }
  return out
}

async function findStar(s: Services, teamId: number, name: string): Promise<Star | null> {
  const exact = await s.models.Star.findOne({ where: { teamId, name, archivedAt: null } })
  if (exact) return exact
  const loose = await s.models.Star.findAll({ where: { teamId, archivedAt: null, name: { [Op.iLike]: name.replace(/[\\%_]/g, (c) => `\\${c}`) } } })
  return loose.length === 1 ? loose[0]! : null
}

const messageOf = (e: unknown): string => (e instanceof HttpError ? e.message : `could not be read: ${e instanceof Error ? e.message : String(e)}`)

/** Reads and stores one part with the upload path; creates its star first when new (removed again if nothing is stored). */
async function storePart(s: Services, actor: User, teamId: number, p: Part, opts: SurveyUploadOptions, created: Map<string, Star>): Promise<{ row: SurveyUploadFile; star: Star | null; isNew: boolean }> {
  const refuse = (message: string) => ({ row: { fileName: p.file.originalname, star: p.star, status: 'refused' as const, message, measurements: 0 }, star: null, isNew: false })
  if (p.star.length > 200) return refuse(`${p.file.originalname}: the star name is longer than 200 characters.`)
  let star = created.get(p.star.toLowerCase()) ?? await findStar(s, teamId, p.star)
  const probe = star ?? s.models.Star.build({ id: 0, teamId, name: p.star, massMsun: 1, massErrMsun: 0, raDeg: null, decDeg: null, archivedAt: null } as never)
  let mapping
  try {
    const pre = await preview(s, probe, [p.file], {}, {})
    const f = pre.files[0]!
    if (f.mappingError) return refuse(`${p.file.originalname}: ${f.mappingError.message}`)
    mapping = f.mapping
  } catch (e) { return refuse(messageOf(e)) }
  let isNew = false
  if (!star) {
    const header = massFromHeader(p.file.buffer.toString('utf8'))
    const mass = header?.mass ?? opts.starMass
    if (!(mass! > 0)) return refuse(`${p.file.originalname}: the star "${p.star}" is new and its mass is unknown: add a line "# starMass: 0.9 ± 0.05" to the file, or give the stellar mass for new stars in the form.`)
    star = await s.models.Star.create({
      teamId, name: p.star, massMsun: mass!, massErrMsun: header ? header.err ?? 0 : opts.starMassErr ?? 0, radiusRsun: null, teffK: null, luminosityLsun: null,
      raDeg: null, decDeg: null, notes: 'Created by a survey upload.', archivedAt: null, pmRaMasYr: null, pmDecMasYr: null, coordEpochJd: null, defaultSite: null,
    } as never)
    isNew = true
  }
  try {
    const out = await commit(s, actor, star, [p.file], { [p.file.originalname]: mapping })
    if (isNew) {
      created.set(p.star.toLowerCase(), star)
      await record(s, { teamId, userId: actor.id, action: 'star.create', entity: 'star', entityId: star.id, detail: { name: star.name, via: 'survey upload', file: p.from } })
    }
    return { row: { fileName: p.file.originalname, star: star.name, status: 'stored', message: `${out.measurementsCreated} measurements stored in ${out.datasets.length} dataset${out.datasets.length === 1 ? '' : 's'}.`, measurements: out.measurementsCreated }, star, isNew }
  } catch (e) {
    if (isNew) await star.destroy() // nothing was stored (the commit is one transaction): no empty star is left behind
    return refuse(messageOf(e))
  }
}

/** Stores every part it can, refuses the others with a message, queues the search of every star that got data. */
export async function surveyUpload(s: Services, actor: User, teamId: number, files: UploadedFile[], opts: SurveyUploadOptions): Promise<SurveyUploadResponse> {
  if (!files.length) throw new ValidationError('No file received: send the stars\' tables in the field "files".', 'files')
  const names = new Set<string>()
  for (const f of files) {
    if (names.has(f.originalname)) throw new ValidationError(`Two files are named ${f.originalname}: rename one of them.`, 'files')
    names.add(f.originalname)
  }
  const rows: SurveyUploadFile[] = []
  const stars = new Map<number, { id: number; name: string; created: boolean }>()
  const created = new Map<string, Star>()
  for (const p of partsOf(files, opts.starColumn)) {
    if (!('file' in p)) { rows.push(p); continue }
    const r = await storePart(s, actor, teamId, p, opts, created)
    rows.push(r.row)
    if (r.star && !stars.has(r.star.id)) stars.set(r.star.id, { id: r.star.id, name: r.star.name, created: r.isNew })
  }
  let runId: number | null = null
  let queued = 0
  if (stars.size && opts.queue !== false) ({ runId, queued } = await queueStars(s, actor, teamId, [...stars.keys()], 'survey upload'))
  return { files: rows, stars: [...stars.values()], runId, queued }
}
