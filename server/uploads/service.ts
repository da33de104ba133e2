import { createHash } from 'node:crypto'
import { QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { HttpError, TooLargeError, ValidationError } from '../errors.ts'
import { defaultPool } from '../compute/pool.ts'
import { record } from '../audit/service.ts'
import { timeOffset, type DetectHints, type RowProblem, type TableMapping, type TimeScale } from '../../shared/ingest/index.ts'
import { timeScaleWarning } from '../../shared/time/index.ts'
import type {
  CommitOptions, CommitProblem, CommitResponse, DatasetSummary, EarlierUpload, FilePreview, OverlapReport, PreviewResponse,
} from '../../shared/api/uploads.ts'
import {
  isDescription, uploadParseTask, uploadPreviewTask, type Conversion, type ParseInput, type ParseOutput, type PreviewInput, type PreviewOutput, type TaskError,
} from './tasks.ts'
import { absoluteNextToRelative, findOverlap, storedMedians } from './checks.ts'
import { insertMeasurements } from './insert.ts'

export interface UploadedFile { originalname: string; buffer: Buffer; size: number }

const PREVIEW_PROBLEMS = 200
/** Longest a file may take to be read in a worker (ms). */
const TASK_TIMEOUT_MS = 120_000

const bytesOf = (f: UploadedFile) => new Uint8Array(f.buffer.buffer, f.buffer.byteOffset, f.buffer.byteLength)
const sha256Of = (f: UploadedFile) => createHash('sha256').update(f.buffer).digest('hex')

/** Whole-file problems become 400 (413 for size and row limits), the message naming the file. */
function fileError(fileName: string, err: TaskError): never {
  const message = `${fileName}: ${err.message}`
  if (err.code === 'too_large' || err.code === 'too_many_rows') throw new TooLargeError(message, { fileName, code: err.code })
  throw new ValidationError(message, err.field ?? 'files', { fileName, code: err.code })
}

function checkFiles(files: UploadedFile[]): void {
  if (files.length === 0) throw new ValidationError('No file received: send one or more tables in the field "files".', 'files')
  const names = new Set<string>()
  for (const f of files) {
    if (names.has(f.originalname)) throw new ValidationError(`Two files are named ${f.originalname}: rename one of them.`, 'files')
    names.add(f.originalname)
  }
}

/** CDS ReadMe files describe the tables sent with them; the rest are tables. */
function splitFiles(files: UploadedFile[]): { tables: UploadedFile[]; descriptions: UploadedFile[] } {
  const descriptions = files.filter((f) => isDescription(f.originalname, bytesOf(f)))
  const tables = files.filter((f) => !descriptions.includes(f))
  if (tables.length === 0) throw new ValidationError('Only description files (ReadMe) were sent: add the tables they describe.', 'files')
  return { tables, descriptions }
}

function checkRowLimit(s: Services, fileName: string, rows: number): void {
  const max = s.config.upload.maxRows
  if (rows > max) {
    throw new TooLargeError(`${fileName}: the table has ${rows} data rows; the limit is ${max}. Split it into smaller files.`, { fileName, code: 'too_many_rows' })
  }
}

/** An earlier upload of the same bytes to this star, if any. */
async function earlierUpload(s: Services, starId: number, sha256: string, transaction?: Transaction): Promise<EarlierUpload | null> {
  const rows = await s.sequelize.query<{ id: number; file_name: string; created_at: Date; name: string | null }>(
    `SELECT d.id, d.file_name, d.created_at, u.name FROM datasets d LEFT JOIN users u ON u.id = d.uploaded_by
      WHERE d.star_id = $1 AND d.file_sha256 = $2 ORDER BY d.id`,
    { bind: [starId, sha256], type: QueryTypes.SELECT, transaction },
  )
  if (rows.length === 0) return null
  return { fileName: rows[0]!.file_name, uploadedAt: new Date(rows[0]!.created_at).toISOString(), uploadedBy: rows[0]!.name, datasetIds: rows.map((r) => r.id) }
}

function describeEarlier(fileName: string, e: EarlierUpload): string {
  return `${fileName} was already uploaded for this star as ${e.fileName} on ${e.uploadedAt.slice(0, 16).replace('T', ' ')} UTC${e.uploadedBy ? ` by ${e.uploadedBy}` : ''} (dataset${e.datasetIds.length > 1 ? 's' : ''} ${e.datasetIds.join(', ')}): the same bytes are not stored twice. Nothing was stored.`
}

const CONVERTIBLE = new Set<TimeScale>(['jd_utc', 'jd_tt', 'jd_tdb', 'hjd_utc', 'bjd_utc'])

/** The scale a mapping's times are in ('bjd' format means BJD_TDB). */
function scaleOf(m: TableMapping): TimeScale {
  return m.timeScale ?? (m.timeFormat === 'bjd' ? 'bjd_tdb' : 'unknown')
}

/**
 * How a file's times become BJD_TDB at commit, or null when they are stored as written
 * (BJD_TDB already, or scale unknown). Needs the star's coordinates and an observatory (given,
 * else the star's default) for times at the observatory and HJD; refuses saying what to do.
 */
function conversionFor(fileName: string, m: TableMapping, star: Star, site: CommitOptions['site']): Conversion | null {
  const from = scaleOf(m)
  if (!CONVERTIBLE.has(from)) return null
  if (m.timeFormat === 'days') {
    throw new ValidationError(`${fileName}: times written as plain days (no zero point) cannot be converted from ${from.toUpperCase()} to BJD_TDB. Choose their Julian-date form first.`, 'timeFormat')
  }
  const target = { raDeg: star.raDeg ?? NaN, decDeg: star.decDeg ?? NaN, pmRaMasYr: star.pmRaMasYr ?? undefined, pmDecMasYr: star.pmDecMasYr ?? undefined, epochJd: star.coordEpochJd ?? undefined }
  const where = site ?? star.defaultSite ?? null
  if (from !== 'bjd_utc') {
    if (star.raDeg === null || star.decDeg === null) {
      throw new ValidationError(`${fileName}: the times are ${from.toUpperCase()}; converting them to BJD_TDB needs the star's coordinates. Enter the star's RA and Dec (and proper motion) on its page, then upload again.`, 'timeScale')
    }
    if (!where) {
      throw new ValidationError(`${fileName}: the times are ${from.toUpperCase()}; converting them to BJD_TDB needs the observatory. Choose the site in the upload form (or set the star's default observatory), then save again.`, 'site')
    }
  }
  const s = where ?? { lonDeg: 0, latDeg: 0, heightM: 0 }
  return { from: from as Conversion['from'], target, site: { lonDeg: s.lonDeg, latDeg: s.latDeg, heightM: s.heightM } }
}

/**
 * Files up to this size are read in-process: a 64 kB table is read in milliseconds, less than the
 * hop to a worker thread (and a cold worker's start). Anything larger — where a slow or hostile
 * file could hold the event loop — is read in the worker pool.
 */
export const INLINE_BYTES = 64 * 1024

function pool(s: Services) { return s.compute ?? defaultPool() }

function readPreview(s: Services, inp: PreviewInput) {
  return inp.bytes.byteLength <= INLINE_BYTES ? Promise.resolve(uploadPreviewTask(inp)) : pool(s).run('uploadPreview', inp, { timeoutMs: TASK_TIMEOUT_MS })
}
function readRows(s: Services, inp: ParseInput) {
  // A time conversion is heavy work (an ephemeris per day): always in the pool.
  return inp.bytes.byteLength <= INLINE_BYTES && !inp.conversion ? Promise.resolve(uploadParseTask(inp)) : pool(s).run('uploadParse', inp, { timeoutMs: TASK_TIMEOUT_MS })
}

/** Reads each file in the worker pool, then checks it against the star's stored data; stores nothing. */
export async function preview(
  s: Services, star: Star, files: UploadedFile[], hints: Record<string, DetectHints>, mappings: Record<string, TableMapping> = {},
): Promise<PreviewResponse> {
  checkFiles(files)
  const { tables, descriptions } = splitFiles(files)
  const descBytes = descriptions.map(bytesOf)
  const outs = await Promise.all(tables.map((f) => readPreview(s, {
    bytes: bytesOf(f), fileName: f.originalname, maxBytes: s.config.upload.maxBytes, hints: hints[f.originalname] ?? {},
    mapping: mappings[f.originalname], descriptions: descBytes,
  })))
  const ok: PreviewOutput[] = outs.map((o, k) => {
    if (!o.ok) fileError(tables[k]!.originalname, o.error)
    checkRowLimit(s, tables[k]!.originalname, o.rowCount)
    return o
  })
  const stored = await storedMedians(s, star.id)
  const groups = ok.flatMap((o, k) => Object.entries(o.medians).map(([instrument, median]) => ({ where: tables[k]!.originalname, instrument, median })))
  const mixed = absoluteNextToRelative(groups, stored)
  const previews: FilePreview[] = []
  for (let k = 0; k < tables.length; k++) {
    const f = tables[k]!
    const o = ok[k]!
    const notices = mixed.filter((m) => m.fileName === f.originalname).map((m) => m.message)
    const scale = scaleOf(o.mapping)
    if (CONVERTIBLE.has(scale)) notices.push(`The times are ${scale.toUpperCase()}: they are converted to BJD_TDB at saving, from the star's coordinates and the observatory chosen.`)
    else { const w = timeScaleWarning(scale); if (w && scale === 'unknown') notices.push(w) }
    previews.push({
      fileName: f.originalname, size: f.size, detection: o.detection, mapping: o.mapping, rows: o.rows, problems: o.problems.slice(0, PREVIEW_PROBLEMS),
      problemCount: o.problemCount, warnings: o.warnings, warningCount: o.warningCount, flaggedCount: o.flaggedCount,
      instruments: o.instruments, rowCount: o.rowCount, mappingError: o.mappingError,
      duplicateOf: await earlierUpload(s, star.id, sha256Of(f)),
      overlap: (await findOverlap(s, star.id, o.lines, o.times, o.instrumentOf, o.instrumentNames))?.report ?? null,
      notices,
    })
  }
  return { files: previews, descriptions: descriptions.map((d) => d.originalname) }
}

interface ParsedFile { file: UploadedFile; mapping: TableMapping; sha256: string; out: ParseOutput; conversion: Conversion | null; skipped: RowProblem[] }

function refuseProblems(problems: CommitProblem[], problemCount: number): never {
  const first = problems[0]!
  const where = `${first.fileName}: line ${first.line}${first.column ? `, column ${first.column}` : ''}: ${first.message}`
  const more = problemCount > 1 ? ` (and ${problemCount - 1} more problem${problemCount > 2 ? 's' : ''})` : ''
  throw new ValidationError(`${where}${more}. Fix the table or the mapping, or save with "skip problem rows"; nothing was stored.`, 'files', { problems, problemCount })
}

/**
 * Stores every file with its confirmed mapping in one transaction: one raw file each (ReadMe
 * descriptions too), one dataset per instrument, the measurements in m/s and full JD (BJD_TDB
 * after a conversion). Refuses, storing nothing: row problems (unless `skipProblemRows`, which
 * records every skipped row and its reason), bytes already uploaded for this star (409, naming
 * the earlier upload; checked under a per-star lock so parallel commits cannot both pass), rows
 * overlapping stored (time, instrument) pairs unless `overlap` is 'skip' or 'keep' (409).
 */
export async function commit(
  s: Services, actor: User, star: Star, files: UploadedFile[], mappings: Record<string, TableMapping>, options: CommitOptions = {},
): Promise<CommitResponse> {
  checkFiles(files)
  const overlapChoice = options.overlap ?? 'cancel'
  const skipProblems = options.skipProblemRows === true
  const { tables, descriptions } = splitFiles(files)
  const prepared = tables.map((f) => {
    const mapping = mappings[f.originalname]
    if (!mapping) throw new ValidationError(`${f.originalname}: no confirmed mapping was sent for this file (field "mappings").`, 'mappings')
    return { f, mapping, conversion: conversionFor(f.originalname, mapping, star, options.site) }
  })
  const outs = await Promise.all(prepared.map(({ f, mapping, conversion }) => readRows(s, {
    bytes: bytesOf(f), fileName: f.originalname, maxBytes: s.config.upload.maxBytes, mapping, conversion: conversion ?? undefined,
  })))
  const parsed: ParsedFile[] = []
  const problems: CommitProblem[] = []
  let problemCount = 0
  outs.forEach((o, k) => {
    const { f, mapping, conversion } = prepared[k]!
    if (!o.ok) fileError(f.originalname, o.error)
    checkRowLimit(s, f.originalname, o.rowsRead)
    problemCount += o.problemCount
    for (const p of o.problems) if (problems.length < PREVIEW_PROBLEMS) problems.push({ fileName: f.originalname, ...p })
    if (o.time.length === 0 && (o.problemCount === 0 || skipProblems)) {
      throw new ValidationError(`${f.originalname}: the table has no ${o.problemCount ? 'good ' : ''}data rows.`, 'files', { fileName: f.originalname })
    }
    parsed.push({ file: f, mapping, sha256: sha256Of(f), out: o, conversion, skipped: skipProblems ? o.problems : [] })
  })
  if (problemCount > 0 && !skipProblems) refuseProblems(problems, problemCount)
  const hashes = new Map<string, string>()
  for (const p of parsed) {
    const twin = hashes.get(p.sha256)
    if (twin) throw new HttpError(409, 'conflict', `${p.file.originalname} and ${twin} have the same content: send it once. Nothing was stored.`, 'files')
    hashes.set(p.sha256, p.file.originalname)
  }

  const stored = await storedMedians(s, star.id)
  const groups = parsed.flatMap((p) => p.out.instrumentNames.map((instrument, i) => {
    const rv = p.out.rv.filter((_, k) => p.out.instrumentOf[k] === i).sort()
    return { where: p.file.originalname, instrument, median: rv.length % 2 ? rv[rv.length >> 1]! : (rv[rv.length / 2 - 1]! + rv[rv.length / 2]!) / 2 }
  }))
  const notices = absoluteNextToRelative(groups, stored).map((m) => m.message)

  return s.sequelize.transaction(async (transaction) => {
    // One commit per star at a time: the duplicate and overlap checks below then see every earlier commit.
    await s.sequelize.query('SELECT pg_advisory_xact_lock(7349, $1)', { bind: [star.id], transaction, type: QueryTypes.SELECT })
    for (const p of parsed) {
      const earlier = await earlierUpload(s, star.id, p.sha256, transaction)
      if (earlier) throw new HttpError(409, 'conflict', describeEarlier(p.file.originalname, earlier), 'files', { fileName: p.file.originalname, earlier })
    }
    const overlaps = new Map<ParsedFile, { report: OverlapReport; rows: Set<number> }>()
    for (const p of parsed) {
      const o = await findOverlap(s, star.id, p.out.line, p.out.time, p.out.instrumentOf, p.out.instrumentNames, transaction)
      if (o) overlaps.set(p, o)
    }
    if (overlaps.size > 0 && overlapChoice === 'cancel') {
      const list = [...overlaps].map(([p, o]) => `${p.file.originalname}: ${o.report.count} row${o.report.count > 1 ? 's' : ''} (first: line ${o.report.examples[0]!.line}, ${o.report.examples[0]!.instrument} at JD ${o.report.examples[0]!.time}, already stored from ${o.report.examples[0]!.earlierFile})`)
      throw new HttpError(409, 'conflict',
        `Some rows are already stored for this star with the same time and instrument — ${list.join('; ')}. Choose to skip those rows or to keep both, then save again. Nothing was stored.`,
        'overlap', { overlaps: [...overlaps].map(([p, o]) => ({ fileName: p.file.originalname, ...o.report })) })
    }
    const out: CommitResponse = { datasets: [], measurementsCreated: 0, skipped: [], notices }
    for (const d of descriptions) {
      await s.models.RawFile.create({ teamId: star.teamId, fileName: d.originalname, size: d.size, sha256: sha256Of(d), bytes: d.buffer, uploadedBy: actor.id }, { transaction })
    }
    for (const p of parsed) {
      const ov = overlaps.get(p)
      const skipOverlap = ov && overlapChoice === 'skip' ? ov.rows : new Set<number>()
      const skippedRows = [...p.skipped.map((x) => ({ ...x })), ...[...skipOverlap].map((k) => ({ line: p.out.line[k]!, message: 'already stored for this star (same time and instrument); skipped as chosen' }))]
        .sort((a, b) => a.line - b.line)
      const raw = await s.models.RawFile.create({
        teamId: star.teamId, fileName: p.file.originalname, size: p.file.size, sha256: p.sha256, bytes: p.file.buffer, uploadedBy: actor.id,
      }, { transaction })
      const created = await storeFile(s, actor, star, p, raw.id, skipOverlap, skippedRows, ov ? { ...ov.report, choice: overlapChoice } : null,
        notices.filter((n) => n.includes(p.file.originalname)), transaction)
      out.datasets.push(...created)
      out.measurementsCreated += created.reduce((n, d) => n + d.count, 0)
      if (skippedRows.length) out.skipped.push({ fileName: p.file.originalname, count: skippedRows.length })
      await record(s, {
        teamId: star.teamId, userId: actor.id, action: 'upload.commit', entity: 'star', entityId: star.id,
        detail: {
          fileName: p.file.originalname, rawFileId: raw.id, sha256: p.sha256, unit: p.mapping.unit, timeFormat: p.mapping.timeFormat,
          timeScale: p.conversion ? 'bjd_tdb' : scaleOf(p.mapping), convertedFrom: p.conversion?.from ?? null,
          skippedRows: skippedRows.length, overlap: ov ? { count: ov.report.count, choice: overlapChoice } : null, datasets: created,
        },
      }, transaction)
    }
    return out
  })
}

/** Units as written per column, for the dataset record. */
function unitsOf(m: TableMapping): Record<string, unknown> {
  const rv = m.columns.find((c) => c.role === 'rv')?.unit ?? m.unit
  const error = m.columns.find((c) => c.role === 'error')?.unit ?? rv
  const indicators = Object.fromEntries(m.columns.filter((c) => c.role === 'indicator' && c.unit).map((c) => [c.indicator ?? c.name, c.unit]))
  return { rv, error, indicators }
}

async function storeFile(
  s: Services, actor: User, star: Star, p: ParsedFile, rawFileId: number, skip: Set<number>,
  skippedRows: Array<{ line: number; column?: string; message: string }>, overlap: Record<string, unknown> | null, warnings: string[], transaction: Transaction,
): Promise<CommitResponse['datasets']> {
  const o = p.out
  const byInstrument: number[][] = o.instrumentNames.map(() => [])
  for (let k = 0; k < o.time.length; k++) if (!skip.has(k)) byInstrument[o.instrumentOf[k]!]!.push(k)
  const created: CommitResponse['datasets'] = []
  for (let i = 0; i < o.instrumentNames.length; i++) {
    const rows = byInstrument[i]!
    if (rows.length === 0) continue
    const instrument = o.instrumentNames[i]!
    const ds = await s.models.Dataset.create({
      starId: star.id, rawFileId, instrument, fileName: p.file.originalname, fileSha256: p.sha256,
      detectedMapping: null, confirmedMapping: p.mapping, unit: p.mapping.unit, timeFormat: p.mapping.timeFormat,
      timeScale: p.conversion ? 'bjd_tdb' : scaleOf(p.mapping), timeOffset: timeOffset(p.mapping.timeFormat), units: unitsOf(p.mapping),
      timeConversion: p.conversion ? { from: p.conversion.from, site: p.conversion.site, target: p.conversion.target } : null,
      skippedRows, overlap, warnings, uploadedBy: actor.id,
    }, { transaction })
    const excluded = await insertMeasurements(s, ds.id, star.id, actor.id, o, rows, transaction)
    created.push({ id: ds.id, instrument, fileName: p.file.originalname, count: rows.length, excluded })
  }
  return created
}

export async function listDatasets(s: Services, starId: number): Promise<DatasetSummary[]> {
  const rows = await s.models.Dataset.findAll({
    where: { starId }, order: [['id', 'ASC']], include: [{ model: s.models.User, as: 'uploader', attributes: ['id', 'name'] }],
  })
  const counts = await s.models.Measurement.count({ where: { starId }, group: ['datasetId'] }) as unknown as Array<{ datasetId: number; count: number }>
  const byId = new Map(counts.map((c) => [Number(c.datasetId), Number(c.count)]))
  return rows.map((d) => ({
    id: d.id, instrument: d.instrument, fileName: d.fileName, unit: d.unit, timeFormat: d.timeFormat,
    timeScale: d.timeScale, timeOffset: d.timeOffset, units: d.units, timeConversion: d.timeConversion ?? null,
    skippedRows: Array.isArray(d.skippedRows) ? d.skippedRows.length : 0,
    count: byId.get(d.id) ?? 0, uploadedBy: d.uploader ? { id: d.uploader.id, name: d.uploader.name } : null,
    createdAt: d.createdAt.toISOString(),
  }))
}

export async function rawFile(s: Services, rawFileId: number): Promise<{ fileName: string; bytes: Buffer }> {
  const raw = await s.models.RawFile.findByPk(rawFileId)
  if (!raw) throw new HttpError(404, 'not_found', 'Raw file not found.')
  return { fileName: raw.fileName, bytes: raw.bytes }
}
