import { assertText } from './decode.ts'
import { IngestError } from './errors.ts'
import { MAX_FILE_BYTES, MAX_ROWS, PREVIEW_ROWS } from './limits.ts'
import { DELIMITERS, TIME_FORMATS, VELOCITY_UNITS } from './mapping.ts'
import { TIME_OFFSETS } from './time.ts'
import { describeTimeFormat, indicatorKey, readName, timeFromName, unitFromName, type NameReading } from './names.ts'
import { commentBody, commentPrefix, isBlank, isMissing, looksDecimalComma, parseNumber, splitCells, splitLines } from './text.ts'
import type { ColumnMapping, ColumnRef, ColumnRole, Delimiter, DetectHints, Detection, TableMapping, TimeFormat, VelocityUnit } from './types.ts'

/** Rows looked at to choose the delimiter. */
const DELIMITER_SAMPLE = 200
/** Rows looked at for column statistics: the first ones, then an even stride through the rest. */
const STAT_HEAD = 2000
const STAT_STRIDED = 3000

interface ColumnStats {
  numeric: number
  missing: number
  text: number
  values: number[]
  distinct: Map<string, number>
}

const ROLE_NAMES: Record<string, string> = { time: 'time', rv: 'velocity', error: 'error', instrument: 'instrument' }

const DELIMITER_NAMES: Record<Delimiter, string> = { ',': 'comma', '\t': 'tab', ';': 'semicolon', whitespace: 'whitespace' }

function mode(values: number[]): { value: number; share: number } {
  const counts = new Map<number, number>()
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1)
  let best = 0
  let bestCount = 0
  for (const [v, c] of counts) if (c > bestCount || (c === bestCount && v > best)) { best = v; bestCount = c }
  return { value: best, share: values.length ? bestCount / values.length : 0 }
}

function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = Float64Array.from(values).sort()
  const m = s.length >> 1
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2
}

/**
 * Choose the delimiter whose split gives the same number (≥ 2) of fields on at least 80% of the
 * sampled lines after the first and the most numeric cells per line; ties go to tab, then semicolon, comma, whitespace.
 */
function chooseDelimiter(lines: string[]): { delimiter: Delimiter; why: string } {
  let best: { d: Delimiter; numeric: number; fields: number } | null = null
  for (const d of ['\t', ';', ',', 'whitespace'] as Delimiter[]) {
    const counts: number[] = []
    let numeric = 0
    for (const l of lines) {
      const cells = splitCells(l, d)
      counts.push(cells.length)
      for (const c of cells) if (!Number.isNaN(parseNumber(c, d !== ','))) numeric++
    }
    // The first line may be a header with its own field count: judge consistency on the rest.
    const m = mode(counts.length >= 3 ? counts.slice(1) : counts)
    if (m.value < 2 || m.share < 0.8) continue
    const perLine = numeric / lines.length
    if (!best || perLine > best.numeric + 1e-9) best = { d, numeric: perLine, fields: m.value }
  }
  if (!best) return { delimiter: 'whitespace', why: 'no delimiter splits the lines into two or more consistent fields; reading as whitespace-separated' }
  return { delimiter: best.d, why: `${DELIMITER_NAMES[best.d]}-separated: ${best.fields} fields per line` }
}

function isNameLike(token: string): boolean {
  return /^[A-Za-z_σαΔδ]/.test(token) && !/^\S+:$/.test(token) && Number.isNaN(parseNumber(token))
}

/** In a whitespace-split header, fold unit tokens ("[m/s]", "(km/s)", "m/s") into the name before them. */
function mergeUnitTokens(tokens: string[]): string[] {
  const out: string[] = []
  for (const t of tokens) {
    const isUnit = /^[[(].*[\])]$/.test(t) || /^[[(]/.test(t) || /^(?:k?m\/s|km\s?s-1|m\s?s-1|d|days?)$/i.test(t)
    if (isUnit && out.length > 0) out[out.length - 1] += ` ${t}`
    else if (out.length > 0 && /^[[(][^\])]*$/.test(out[out.length - 1]!.split(' ').pop()!)) out[out.length - 1] += ` ${t}`
    else out.push(t)
  }
  return out
}

function resolveRef(ref: ColumnRef, names: string[], field: string): number {
  if (typeof ref === 'number') {
    if (!Number.isInteger(ref) || ref < 1 || ref > names.length) {
      throw new IngestError('bad_hint', `${field} column ${ref} does not exist: the table has ${names.length} columns (numbered from 1)`, field)
    }
    return ref - 1
  }
  const want = ref.trim().toLowerCase()
  const i = names.findIndex(n => n.trim().toLowerCase() === want)
  if (i < 0) {
    if (/^\d+$/.test(want)) return resolveRef(Number(want), names, field)
    throw new IngestError('bad_hint', `${field} column '${ref}' is not in the header (${names.join(', ')})`, field)
  }
  return i
}

function checkHints(h: DetectHints): void {
  if (h.delimiter !== undefined && !DELIMITERS.includes(h.delimiter)) throw new IngestError('bad_hint', `delimiter must be one of ',', tab, ';', 'whitespace'`, 'delimiter')
  if (h.unit !== undefined && !VELOCITY_UNITS.includes(h.unit)) throw new IngestError('bad_hint', `unit must be 'm/s' or 'km/s'`, 'unit')
  if (h.timeFormat !== undefined && !TIME_FORMATS.includes(h.timeFormat)) throw new IngestError('bad_hint', `timeFormat must be one of ${TIME_FORMATS.join(', ')}`, 'timeFormat')
  if (h.defaultError !== undefined && !(typeof h.defaultError === 'number' && h.defaultError > 0 && Number.isFinite(h.defaultError))) {
    throw new IngestError('bad_hint', 'defaultError must be a positive number', 'defaultError')
  }
}

/**
 * Look at a velocity table and propose how to read it (see README.md for the rules).
 * Throws IngestError for whole-file problems: 'empty', 'binary', 'too_large', 'too_many_rows',
 * 'no_numeric_columns', 'no_velocity_column', 'no_time_column', 'bad_hint'.
 * A missing error column is not an error here: the mapping comes back without one and a note
 * says that a defaultError is needed before parseTable accepts it.
 */
export function detectTable(text: string, hints: DetectHints = {}): Detection {
  if (typeof text !== 'string') throw new TypeError('text must be a string')
  checkHints(hints)
  if (text.length > MAX_FILE_BYTES) {
    throw new IngestError('too_large', `The table is over the ${(MAX_FILE_BYTES / 1048576).toFixed(0)} MB limit. Split it into smaller files.`)
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1)
  assertText(text)
  const notes: string[] = []
  const lines = splitLines(text)
  const dataIdx: number[] = []
  let commentLines = 0
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i]!
    if (isBlank(l)) continue
    if (commentPrefix(l) !== null) { commentLines++; continue }
    dataIdx.push(i)
  }
  if (dataIdx.length === 0) {
    throw new IngestError('empty', commentLines > 0
      ? 'The file has only comment lines and no data rows. Upload a table with one row per measurement.'
      : 'The file is empty. Upload a table with one row per measurement.')
  }

  if (dataIdx.length === 1 && !/\d/.test(lines[dataIdx[0]!]!)) {
    throw new IngestError('empty', 'The file has a header line but no data rows. Upload a table with one row per measurement.')
  }

  // Delimiter.
  let delimiter: Delimiter
  if (hints.delimiter) { delimiter = hints.delimiter; notes.push(`delimiter ${DELIMITER_NAMES[delimiter]}, as given`) }
  else {
    const c = chooseDelimiter(dataIdx.slice(0, DELIMITER_SAMPLE).map(i => lines[i]!))
    delimiter = c.delimiter
    notes.push(c.why)
  }

  // Sample rows for statistics.
  const sampleIdx: number[] = dataIdx.slice(0, STAT_HEAD)
  if (dataIdx.length > STAT_HEAD) {
    const step = (dataIdx.length - STAT_HEAD) / STAT_STRIDED
    for (let k = 0; k < STAT_STRIDED; k++) {
      const j = STAT_HEAD + Math.floor(k * step)
      if (j < dataIdx.length) sampleIdx.push(dataIdx[j]!)
    }
  }
  const sample = sampleIdx.map(i => splitCells(lines[i]!, delimiter))

  // Decimal comma: cells like 12,5 and none with a decimal point (never with comma delimiters).
  let decimalComma = false
  if (delimiter !== ',') {
    let comma = 0
    let point = 0
    for (const row of sample.slice(0, 500)) for (const c of row) {
      if (looksDecimalComma(c)) comma++
      else if (/^[+-]?\d*\.\d+/.test(c)) point++
    }
    if (comma > 0 && point === 0) { decimalComma = true; notes.push('numbers use a decimal comma') }
  }
  const num = (c: string): number => parseNumber(c, decimalComma)

  // Header rows: leading rows with text where the body has numbers.
  const body = sample.length > 1 ? sample.slice(Math.min(4, sample.length - 1)) : sample
  const bodyWidth = mode(body.map(r => r.length)).value
  const bodyNumeric: boolean[] = []
  for (let j = 0; j < bodyWidth; j++) {
    let n = 0
    let t = 0
    for (const r of body) {
      const c = r[j]
      if (c === undefined || isMissing(c)) continue
      if (Number.isNaN(num(c))) t++
      else n++
    }
    bodyNumeric.push(n > 0 && n >= 0.5 * (n + t))
  }
  const isPreamble = (row: string[]): boolean => {
    let text = 0
    let numeric = 0
    for (let j = 0; j < row.length; j++) {
      const c = row[j]!
      if (isMissing(c)) continue
      if (Number.isNaN(num(c))) { text++; if (bodyNumeric[j]) return true }
      else numeric++
    }
    return numeric === 0 && text > 0 && bodyNumeric.some(Boolean)
  }
  const hasHeader = hints.hasHeader ?? (sample.length > 1 && isPreamble(sample[0]!))
  let skipRows = 0
  if (hasHeader) while (skipRows < 3 && 1 + skipRows < sample.length - 1 && isPreamble(sample[1 + skipRows]!)) skipRows++
  const firstData = hasHeader ? 1 + skipRows : 0
  const dataSample = sample.slice(firstData)
  let columnCount = mode(dataSample.map(r => r.length)).value
  if (dataSample.length === 0 || columnCount === 0) throw new IngestError('empty', 'The file has a header but no data rows. Upload a table with one row per measurement.')

  // Header names: the header row, else a commented name line just before the data.
  let headerNames: string[] | null = null
  let headerFromComment = false
  let headerLine: number | null = null
  const unitsText: string[] = Array.from({ length: columnCount }, () => '')
  if (hasHeader) {
    // Of the leading text rows, the one with the most recognisable column names is the header
    // (a title row may come first, a units row after); the others are read for units only.
    let best = 0
    let bestScore = -1
    for (let k = 0; k <= skipRows; k++) {
      const score = sample[k]!.filter(c => readName(c).role !== null).length
      if (score > bestScore) { best = k; bestScore = score }
    }
    let names = sample[best]!
    if (delimiter === 'whitespace' && names.length > columnCount) names = mergeUnitTokens(names)
    headerNames = names
    headerLine = sampleIdx[best]! + 1
    notes.push(hints.hasHeader ? 'header row, as given' : `line ${headerLine} is a header row (text above numeric columns)`)
    for (let k = 0; k <= skipRows; k++) {
      if (k === best) continue
      sample[k]!.forEach((c, j) => { if (j < columnCount) unitsText[j] += ` ${c}` })
      notes.push(`line ${sampleIdx[k]! + 1} is skipped (text, no numbers; read for units)`)
    }
  } else if (hints.hasHeader === undefined) {
    // Last comment line in the block just before the first data row.
    for (let i = dataIdx[0]! - 1; i >= 0; i--) {
      const l = lines[i]!
      if (isBlank(l)) continue
      if (commentPrefix(l) === null) break
      const bodyText = commentBody(l)
      let tokens = splitCells(bodyText, delimiter)
      if (tokens.length <= 1 && delimiter !== 'whitespace') tokens = splitCells(bodyText, 'whitespace')
      if (tokens.length > columnCount) tokens = mergeUnitTokens(tokens)
      const named = tokens.every(t => isNameLike(t))
      const roles = tokens.map(t => readName(t).role).filter(r => r === 'time' || r === 'rv' || r === 'error').length
      if (named && ((tokens.length === columnCount && roles >= 1) || (tokens.length >= 2 && tokens.length < columnCount && roles >= 2))) {
        headerNames = tokens
        headerFromComment = true
        headerLine = i + 1
        notes.push(`the comment on line ${i + 1} names the columns, so it is read as the header`)
      }
      break
    }
  }
  if (headerNames && headerNames.length > columnCount) {
    notes.push(`the header has ${headerNames.length} names but rows have ${columnCount} fields; extra names ignored`)
  }
  const names: string[] = Array.from({ length: columnCount }, (_, j) => headerNames?.[j]?.trim() || `column ${j + 1}`)
  if (headerNames) headerNames = names.slice()

  // Column statistics over the data rows of the sample.
  const stats: ColumnStats[] = Array.from({ length: columnCount }, () => ({ numeric: 0, missing: 0, text: 0, values: [], distinct: new Map() }))
  for (const row of dataSample) {
    for (let j = 0; j < columnCount; j++) {
      const c = row[j]
      const s = stats[j]!
      if (c === undefined || isMissing(c)) { s.missing++; continue }
      const v = num(c)
      if (Number.isNaN(v)) {
        s.text++
        if (s.distinct.size < 1000) s.distinct.set(c, (s.distinct.get(c) ?? 0) + 1)
      } else { s.numeric++; s.values.push(v) }
    }
  }
  const isNumeric = stats.map(s => s.numeric > 0 && s.numeric >= 0.5 * (s.numeric + s.text))
  if (!isNumeric.some(Boolean)) {
    throw new IngestError('no_numeric_columns', 'No column holds numbers. A velocity table needs numeric time, velocity and error columns (check the delimiter and the decimal separator).')
  }

  // Whitespace-separated with several unnamed text columns at the end: one name with spaces
  // ("HARPS N"), so they are one column (parseTable joins the extra fields of the last column).
  if (delimiter === 'whitespace') {
    let first = columnCount
    while (first > 0 && !isNumeric[first - 1] && stats[first - 1]!.text > 0) first--
    const named = headerNames ? headerNames.filter(n => !/^column \d+$/.test(n)).length : 0
    if (columnCount - first >= 2 && named <= first + 1) {
      notes.push(`columns ${first + 1}–${columnCount} are words of one name (e.g. '${[...stats[first]!.distinct.keys()][0]} …'), read as one column`)
      columnCount = first + 1
      names.length = columnCount
      stats.length = columnCount
      isNumeric.length = columnCount
      unitsText.length = columnCount
      if (headerNames) headerNames = names.slice()
      // Count names as whole: re-read the distinct values of the joined column.
      const joined = stats[first]!
      joined.distinct = new Map()
      joined.text = 0
      for (const row of dataSample) {
        if (row.length <= first) continue
        const c = row.slice(first).join(' ')
        joined.text++
        if (joined.distinct.size < 1000) joined.distinct.set(c, (joined.distinct.get(c) ?? 0) + 1)
      }
    }
  }

  // Roles from names.
  const readings: NameReading[] = names.map(n => (headerNames ? readName(n) : { role: null }))
  const roles: Array<ColumnRole | null> = readings.map(r => r.role)
  const indicatorKeys: Array<string | undefined> = readings.map(r => r.indicator)
  const taken = (role: ColumnRole): number => roles.indexOf(role)
  for (const role of ['time', 'rv', 'error', 'instrument'] as const) {
    let first = -1
    for (let j = 0; j < columnCount; j++) {
      if (roles[j] !== role) continue
      const needsNumbers = role !== 'instrument'
      if (needsNumbers && !isNumeric[j]) {
        notes.push(`'${names[j]}' looks like the ${ROLE_NAMES[role]} column by its name but does not hold numbers; ignored`)
        roles[j] = 'ignore'
      } else if (first >= 0) {
        notes.push(`'${names[j]}' also looks like a ${ROLE_NAMES[role]} column; '${names[first]}' is used, this one kept as an indicator`)
        roles[j] = isNumeric[j] ? 'indicator' : 'ignore'
        indicatorKeys[j] = indicatorKey(names[j]!)
      } else first = j
    }
    if (first >= 0) notes.push(`'${names[first]}' is the ${ROLE_NAMES[role]} column (by its name)`)
  }

  // Hints override names.
  const applyHint = (role: 'time' | 'rv' | 'error' | 'instrument', ref: ColumnRef | null | undefined): void => {
    if (ref === undefined) return
    const old = taken(role)
    if (old >= 0) roles[old] = isNumeric[old] && role !== 'instrument' ? 'indicator' : 'ignore'
    if (old >= 0 && roles[old] === 'indicator') indicatorKeys[old] = indicatorKey(names[old]!)
    if (ref === null) { notes.push(`no ${ROLE_NAMES[role]} column, as given`); return }
    const j = resolveRef(ref, names, role)
    if (role !== 'instrument' && !isNumeric[j]) throw new IngestError('bad_hint', `${ROLE_NAMES[role]} column '${names[j]}' does not hold numbers`, role)
    roles[j] = role
    notes.push(`'${names[j]}' is the ${ROLE_NAMES[role]} column, as given`)
  }
  applyHint('time', hints.time)
  applyHint('rv', hints.rv)
  applyHint('error', hints.error)
  applyHint('instrument', hints.instrument)

  // A column counting rows (whole numbers rising by one) is not data, when enough others remain.
  for (let j = 0; j < columnCount; j++) {
    if (roles[j] !== null || !isNumeric[j]) continue
    const others = roles.filter((r, k) => k !== j && isNumeric[k] && (r === null || r === 'time' || r === 'rv' || r === 'error')).length
    if (others < 3) continue
    const v = stats[j]!.values.slice(0, STAT_HEAD)
    if (v.length >= 3 && v.every((x, k) => Number.isInteger(x) && (k === 0 || x === v[k - 1]! + 1))) {
      roles[j] = 'ignore'
      notes.push(`'${names[j]}' counts rows (1, 2, 3, …), so it is ignored`)
    }
  }

  // Calendar dates as text where a time column should be: say so rather than guess.
  if (taken('time') < 0 && hints.time === undefined && !stats.some((s, j) => roles[j] === null && isNumeric[j] && median(s.values) > 2_300_000)) {
    const j = stats.findIndex((s, k) => !isNumeric[k] && s.text > 0 && [...s.distinct.keys()].every(c => /^\d{4}-\d{2}-\d{2}/.test(c)))
    if (j >= 0) {
      throw new IngestError('no_time_column',
        `Column '${names[j]}' holds calendar dates; Starsway reads times as Julian days (JD, BJD, MJD or reduced JD). Convert the dates to Julian days and upload again.`, 'time')
    }
  }

  // Positional fill: time, velocity, error from the unassigned numeric columns.
  const free = (j: number): boolean => roles[j] === null && isNumeric[j]!
  if (taken('time') < 0 && hints.time === undefined) {
    let j = -1
    for (let k = 0; k < columnCount; k++) if (free(k) && median(stats[k]!.values) > 2_300_000) { j = k; break }
    if (j < 0) for (let k = 0; k < columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) { roles[j] = 'time'; notes.push(`'${names[j]}' is the time column (${headerNames ? 'first numeric column without a known name' : 'by position'})`) }
  }
  if (taken('rv') < 0 && hints.rv === undefined) {
    let j = -1
    for (let k = 0; k < columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) { roles[j] = 'rv'; notes.push(`'${names[j]}' is the velocity column (${headerNames ? 'next numeric column without a known name' : 'by position'})`) }
  }
  if (taken('time') < 0) {
    throw new IngestError('no_time_column', 'No time column was found. Mark the column that holds the observation times.', 'time')
  }
  if (taken('rv') < 0) {
    throw new IngestError('no_velocity_column',
      `Only one numeric column ('${names[taken('time')]}') was found; a velocity table needs time, velocity and error columns. Check the delimiter, or mark the velocity column.`, 'rv')
  }
  if (taken('error') < 0 && hints.error === undefined) {
    let j = -1
    for (let k = taken('rv') + 1; k < columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) {
      const v = stats[j]!.values
      const positive = v.filter(x => x > 0).length
      if (v.length > 0 && positive >= 0.9 * v.length) {
        roles[j] = 'error'
        notes.push(`'${names[j]}' is the error column (${headerNames ? 'the numeric column after the velocity' : 'by position'}; ${positive === v.length ? 'all values positive' : `${v.length - positive} values ≤ 0 are reported as row problems`})`)
      } else notes.push(`'${names[j]}' follows the velocity but has many values ≤ 0, so it is not taken as the error column`)
    }
  }
  if (taken('error') < 0) notes.push('no error column: give one error for all rows (defaultError), or mark the error column')

  // Instrument: a text column whose values repeat.
  if (taken('instrument') < 0 && hints.instrument === undefined) {
    for (let j = 0; j < columnCount; j++) {
      if (roles[j] !== null || isNumeric[j]) continue
      const s = stats[j]!
      if (s.text === 0) continue
      if (s.distinct.size <= Math.max(1, Math.floor(s.text / 2)) && s.distinct.size <= 200) {
        roles[j] = 'instrument'
        notes.push(`'${names[j]}' is the instrument column (text whose values repeat: ${s.distinct.size} distinct)`)
        break
      }
    }
  }
  if (taken('instrument') < 0) notes.push(hints.instrumentName ? `all rows are instrument '${hints.instrumentName}', as given` : 'no instrument column: all rows get one instrument name')

  // Unit.
  const rvJ = taken('rv')
  const errJ = taken('error')
  let unit: VelocityUnit
  const nameUnit = unitFromName(`${names[rvJ]} ${unitsText[rvJ]}`) ?? (errJ >= 0 ? unitFromName(`${names[errJ]} ${unitsText[errJ]}`) : undefined)
  if (hints.unit) { unit = hints.unit; notes.push(`velocities in ${unit}, as given`) }
  else if (nameUnit) { unit = nameUnit; notes.push(`velocities in ${unit} (from the header)`) }
  else {
    const rvValues = stats[rvJ]!.values
    const span = rvValues.length ? Math.max(...rvValues) - Math.min(...rvValues) : 0
    if (errJ >= 0) {
      const medErr = median(stats[errJ]!.values)
      unit = medErr < 0.05 ? 'km/s' : 'm/s'
      notes.push(unit === 'km/s'
        ? `velocities taken as km/s: the median error ${medErr} is below 0.05, too small for m/s`
        : `velocities taken as m/s (no unit in the header; median error ${medErr} is plausible in m/s)`)
    } else {
      unit = rvValues.length >= 3 && span < 0.5 ? 'km/s' : 'm/s'
      notes.push(unit === 'km/s'
        ? `velocities taken as km/s: they span only ${span.toPrecision(3)}, too little for m/s`
        : 'velocities taken as m/s (no unit in the header and no error column to judge by)')
    }
  }

  // Time format.
  const tJ = taken('time')
  let timeFormat: TimeFormat
  const tv = stats[tJ]!.values
  const named = headerNames ? timeFromName(`${names[tJ]} ${unitsText[tJ]}`) : undefined
  if (hints.timeFormat) { timeFormat = hints.timeFormat; notes.push(`times are ${describeTimeFormat(timeFormat)}, as given`) }
  else {
    const r = timeFormatFromValues(tv, named)
    timeFormat = r.format
    notes.push(r.why)
  }

  if (timeFormat !== 'days' && tv.length > 0) {
    const full = median(tv) + TIME_OFFSETS[timeFormat]
    if (full < 2_400_000 || full > 2_500_000) {
      notes.push(`check the time format: read as ${describeTimeFormat(timeFormat)}, the times fall near JD ${Math.round(full)}, outside 1858–2132`)
    }
  }

  // Remaining columns (indicator keys made unique: 'x', 'x_2', …).
  const usedKeys = new Set<string>()
  const uniqueKey = (key: string): string => {
    let k = key
    for (let n = 2; usedKeys.has(k); n++) k = `${key}_${n}`
    usedKeys.add(k)
    return k
  }
  const columns: ColumnMapping[] = names.map((name, j) => {
    let role = roles[j]
    const col: ColumnMapping = { index: j, name, role: 'ignore' }
    if (role === null) role = isNumeric[j] ? 'indicator' : 'ignore'
    col.role = role
    if (role === 'indicator') {
      const key = uniqueKey(indicatorKeys[j] ?? (headerNames ? indicatorKey(name) : `column_${j + 1}`))
      col.indicator = key
      if (/^(?:bisector_span|fwhm)(?:_err)?$/.test(key)) col.unit = unitFromName(`${name} ${unitsText[j]}`) ?? unit
      if (readings[j]?.role !== 'indicator') {
        notes.push(`'${name}' is kept as indicator '${key}'${headerNames ? '' : ' (an unnamed numeric column)'}; mark it 'ignore' to drop it`)
      } else notes.push(`'${name}' is the activity indicator '${key}'${col.unit ? ` (in ${col.unit})` : ''}`)
    }
    return col
  })

  const rowCount = dataIdx.length - firstData
  if (rowCount > MAX_ROWS) {
    throw new IngestError('too_many_rows', `The table has ${rowCount} rows; the limit is ${MAX_ROWS}. Split it into smaller files.`)
  }
  const mapping: TableMapping = { delimiter, hasHeader, columns, unit, timeFormat }
  if (skipRows > 0) mapping.skipRows = skipRows
  if (decimalComma) mapping.decimalComma = true
  if (hints.defaultError !== undefined) mapping.defaultError = hints.defaultError
  if (hints.instrumentName !== undefined) mapping.instrument = hints.instrumentName
  if (hints.splitDates !== undefined) mapping.splitDates = hints.splitDates

  const preview = dataIdx.slice(firstData, firstData + PREVIEW_ROWS).map(i => ({ line: i + 1, cells: splitCells(lines[i]!, delimiter) }))
  return { mapping, headerNames, headerFromComment, headerLine, columnCount, rowCount, commentLines, preview, notes }
}

/**
 * Time format from the magnitude of the times, with the header's word deciding within a class:
 * ≥ 2,300,000 → full JD ('bjd' when the header says BJD, else 'jd');
 * 30,000–90,000 → 'jd-2400000', or 'mjd' only when the header says MJD (they differ by 0.5 d);
 * −2,000–20,000 → 'jd-2450000', or 'days' when the header says days and no JD;
 * anything else → 'days'.
 */
function timeFormatFromValues(values: number[], named: NameReading['time']): { format: TimeFormat; why: string } {
  if (values.length === 0) return { format: 'days', why: 'no time values to judge by; read as plain days' }
  const med = median(values)
  const min = Math.min(...values)
  const max = Math.max(...values)
  if (min >= 2_300_000 && max < 2_600_000) {
    const format = named === 'bjd' ? 'bjd' : 'jd'
    return { format, why: `times are ${describeTimeFormat(format)} (values near ${Math.round(med)}${named === 'bjd' ? ', header says BJD' : named ? '' : '; choose BJD if they are barycentric'})` }
  }
  if (min >= 30_000 && max < 90_000) {
    if (named === 'mjd') return { format: 'mjd', why: `times are ${describeTimeFormat('mjd')} (header says MJD)` }
    return { format: 'jd-2400000', why: `times are JD − 2400000 (values near ${Math.round(med)}); choose MJD instead if the header meant JD − 2400000.5` }
  }
  if (min >= -2_000 && max < 20_000) {
    if (named === 'days') return { format: 'days', why: 'times are plain days (header says days)' }
    return { format: 'jd-2450000', why: `times are JD − 2450000 (values ${Math.round(min)}–${Math.round(max)}); choose plain days if they count from another zero point` }
  }
  return { format: 'days', why: `times (${min}–${max}) match no Julian-date form; read as plain days` }
}
