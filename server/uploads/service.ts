import { createHash } from 'node:crypto'
import { QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { HttpError, TooLargeError, ValidationError } from '../errors.ts'
import { decodeTableBytes, detectTable, parseTable, previewTable, IngestError } from '../../shared/ingest/index.ts'
import type { DetectHints, ParsedRow, TableMapping } from '../../shared/ingest/index.ts'
import type { CommitProblem, CommitResponse, DatasetSummary, FilePreview, PreviewResponse } from '../../shared/api/uploads.ts'
import { record } from '../audit/service.ts'

export interface UploadedFile { originalname: string; buffer: Buffer; size: number }

const PREVIEW_ROWS = 50
const PREVIEW_PROBLEMS = 200
const INSERT_CHUNK = 20_000

/**
 * Inserts one chunk of rows as a single statement: each column travels as one array parameter
 * and PostgreSQL unnests them, far faster than one VALUES tuple per model instance. Doubles keep
 * their exact value (the driver writes the shortest round-trip representation).
 */
async function insertMeasurements(s: Services, datasetId: number, starId: number, rows: ParsedRow[], transaction: Transaction): Promise<void> {
  await s.sequelize.query(
    `INSERT INTO measurements (dataset_id, star_id, line, time, rv, error, indicators)
     SELECT $1, $2, x.line, x.time, x.rv, x.error, x.indicators::jsonb
       FROM unnest($3::integer[], $4::double precision[], $5::double precision[], $6::double precision[], $7::text[])
         AS x(line, time, rv, error, indicators)`,
    {
      bind: [datasetId, starId, rows.map((r) => r.line), rows.map((r) => r.time), rows.map((r) => r.rv), rows.map((r) => r.error),
        rows.map((r) => JSON.stringify(r.indicators))],
      transaction, type: QueryTypes.INSERT,
    },
  )
}

/** Whole-file problems become 400 (413 for size and row limits), the message naming the file. */
function fileError(fileName: string, err: unknown): never {
  if (err instanceof IngestError) {
    const message = `${fileName}: ${err.message}`
    if (err.code === 'too_large' || err.code === 'too_many_rows') throw new TooLargeError(message, { fileName, code: err.code })
    throw new ValidationError(message, err.field ?? 'files', { fileName, code: err.code })
  }
  throw err
}

function checkFiles(files: UploadedFile[]): void {
  if (files.length === 0) throw new ValidationError('No file received: send one or more tables in the field "files".', 'files')
  const names = new Set<string>()
  for (const f of files) {
    if (names.has(f.originalname)) throw new ValidationError(`Two files are named ${f.originalname}: rename one of them.`, 'files')
    names.add(f.originalname)
  }
}

function decode(s: Services, f: UploadedFile): string {
  try { return decodeTableBytes(new Uint8Array(f.buffer.buffer, f.buffer.byteOffset, f.buffer.byteLength), s.config.upload.maxBytes) }
  catch (err) { fileError(f.originalname, err) }
}

function checkRowLimit(s: Services, fileName: string, rows: number): void {
  const max = s.config.upload.maxRows
  if (rows > max) {
    throw new TooLargeError(`${fileName}: the table has ${rows} data rows; the limit is ${max}. Split it into smaller files.`, { fileName, code: 'too_many_rows' })
  }
}

/** Detects the layout of each file and parses it with the detected mapping; stores nothing. */
export function preview(s: Services, files: UploadedFile[], hints: Record<string, DetectHints>): PreviewResponse {
  checkFiles(files)
  return {
    files: files.map((f): FilePreview => {
      const text = decode(s, f)
      try {
        const { detection, result, mappingError } = previewTable(text, hints[f.originalname] ?? {}, {}, { maxProblems: PREVIEW_PROBLEMS })
        checkRowLimit(s, f.originalname, detection.rowCount)
        return {
          fileName: f.originalname, size: f.size, detection,
          rows: result ? result.rows.slice(0, PREVIEW_ROWS) : [], problems: result ? result.problems.slice(0, PREVIEW_PROBLEMS) : [],
          problemCount: result?.problemCount ?? 0, instruments: result?.instruments ?? [], rowCount: result?.rowsRead ?? detection.rowCount,
          mappingError,
        }
      } catch (err) { fileError(f.originalname, err) }
    }),
  }
}

interface ParsedFile { file: UploadedFile; mapping: TableMapping; detected: TableMapping | null; rows: ParsedRow[] }

/**
 * Stores every file with its confirmed mapping in one transaction: one raw file each, one dataset
 * per instrument, the measurements in m/s and full JD. Any problem in any file stores nothing.
 */
export async function commit(
  s: Services, actor: User, star: Star, files: UploadedFile[], mappings: Record<string, TableMapping>,
): Promise<CommitResponse> {
  checkFiles(files)
  const parsedFiles: ParsedFile[] = []
  const problems: CommitProblem[] = []
  let problemCount = 0
  for (const f of files) {
    const mapping = mappings[f.originalname]
    if (!mapping) throw new ValidationError(`${f.originalname}: no confirmed mapping was sent for this file (field "mappings").`, 'mappings')
    const text = decode(s, f)
    try {
      let detected: TableMapping | null = null
      try { detected = detectTable(text, {}).mapping } catch { /* the user's mapping may read what detection could not */ }
      const parsed = parseTable(text, mapping)
      checkRowLimit(s, f.originalname, parsed.rowsRead)
      problemCount += parsed.problemCount
      for (const p of parsed.problems) if (problems.length < PREVIEW_PROBLEMS) problems.push({ fileName: f.originalname, ...p })
      if (parsed.rows.length === 0 && parsed.problemCount === 0) {
        throw new ValidationError(`${f.originalname}: the table has no data rows.`, 'files', { fileName: f.originalname })
      }
      parsedFiles.push({ file: f, mapping, detected, rows: parsed.rows })
    } catch (err) {
      if (err instanceof HttpError) throw err
      fileError(f.originalname, err)
    }
  }
  if (problemCount > 0) {
    const first = problems[0]!
    const where = `${first.fileName}: line ${first.line}${first.column ? `, column ${first.column}` : ''}: ${first.message}`
    const more = problemCount > 1 ? ` (and ${problemCount - 1} more problem${problemCount > 2 ? 's' : ''})` : ''
    throw new ValidationError(`${where}${more}. Fix the table or the mapping; nothing was stored.`, 'files', { problems, problemCount })
  }

  return s.sequelize.transaction(async (transaction) => {
    const out: CommitResponse = { datasets: [], measurementsCreated: 0 }
    for (const pf of parsedFiles) {
      const sha256 = createHash('sha256').update(pf.file.buffer).digest('hex')
      const raw = await s.models.RawFile.create({
        teamId: star.teamId, fileName: pf.file.originalname, size: pf.file.size, sha256, bytes: pf.file.buffer, uploadedBy: actor.id,
      }, { transaction })
      const byInstrument = new Map<string, ParsedRow[]>()
      for (const r of pf.rows) {
        const list = byInstrument.get(r.instrument)
        if (list) list.push(r); else byInstrument.set(r.instrument, [r])
      }
      for (const [instrument, rows] of byInstrument) {
        const ds = await s.models.Dataset.create({
          starId: star.id, rawFileId: raw.id, instrument, fileName: pf.file.originalname, fileSha256: sha256,
          detectedMapping: pf.detected, confirmedMapping: pf.mapping, unit: pf.mapping.unit, timeFormat: pf.mapping.timeFormat,
          uploadedBy: actor.id,
        }, { transaction })
        for (let i = 0; i < rows.length; i += INSERT_CHUNK) {
          await insertMeasurements(s, ds.id, star.id, rows.slice(i, i + INSERT_CHUNK), transaction)
        }
        out.datasets.push({ id: ds.id, instrument, fileName: pf.file.originalname, count: rows.length })
        out.measurementsCreated += rows.length
      }
      await record(s, {
        teamId: star.teamId, userId: actor.id, action: 'upload.commit', entity: 'star', entityId: star.id,
        detail: {
          fileName: pf.file.originalname, rawFileId: raw.id, sha256, unit: pf.mapping.unit, timeFormat: pf.mapping.timeFormat,
          datasets: out.datasets.filter((d) => d.fileName === pf.file.originalname),
        },
      }, transaction)
    }
    return out
  })
}

export async function listDatasets(s: Services, starId: number): Promise<DatasetSummary[]> {
  const rows = await s.models.Dataset.findAll({
    where: { starId }, order: [['id', 'ASC']], include: [{ model: s.models.User, as: 'uploader', attributes: ['id', 'name'] }],
  })
  const counts = await s.models.Measurement.count({ where: { starId }, group: ['datasetId'] }) as unknown as Array<{ datasetId: number; count: number }>
  const byId = new Map(counts.map((c) => [Number(c.datasetId), Number(c.count)]))
  return rows.map((d) => ({
    id: d.id, instrument: d.instrument, fileName: d.fileName, unit: d.unit, timeFormat: d.timeFormat,
    count: byId.get(d.id) ?? 0, uploadedBy: d.uploader ? { id: d.uploader.id, name: d.uploader.name } : null,
    createdAt: d.createdAt.toISOString(),
  }))
}

export async function rawFile(s: Services, rawFileId: number): Promise<{ fileName: string; bytes: Buffer }> {
  const raw = await s.models.RawFile.findByPk(rawFileId)
  if (!raw) throw new HttpError(404, 'not_found', 'Raw file not found.')
  return { fileName: raw.fileName, bytes: raw.bytes }
}
