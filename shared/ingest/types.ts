/**
 * Plain-data types of velocity-table ingest. Everything here is JSON-serialisable, so the same
 * objects travel from the server's preview to the browser's wizard and back to the commit.
 */

/**
 * Field separator of a table. 'whitespace' means runs of spaces and/or tabs; 'fixed' means each
 * column sits at fixed character positions (`ColumnMapping.start`/`end`), as archives write them.
 */
export type Delimiter = ',' | '\t' | ';' | 'whitespace' | 'fixed'

/**
 * A velocity unit as written ('m/s', 'km/s', 'cm/s', 'm s-1', 'km.s-1' …): anything the unit
 * parser of `units.ts` reads as a length over a time. Stored values are always m/s.
 */
export type VelocityUnit = string

/** Where a table came from, as far as its layout tells. */
export type TableFormat = 'delimited' | 'fixed-width' | 'ecsv' | 'ipac' | 'mrt' | 'cds' | 'rdb'

/**
 * The time scale (and reference point) of the times: barycentric TDB (`bjd_tdb`), barycentric
 * UTC (`bjd_utc`), heliocentric UTC (`hjd_utc`), or at the observatory in UTC, TT or TDB;
 * `unknown` when neither the file nor the user says.
 */
export type TimeScale = 'bjd_tdb' | 'bjd_utc' | 'hjd_utc' | 'jd_utc' | 'jd_tt' | 'jd_tdb' | 'unknown'

/**
 * Something detection could not decide and the user must answer before a commit (e.g. MJD or
 * JD − 2400000). `field` is the mapping field the answer sets; `choices` the offered values,
 * the detected default first.
 */
export interface Question {
  field: 'timeFormat' | 'timeScale' | 'flag'
  message: string
  choices: Array<{ value: string; label: string }>
}

/**
 * How the time column is written. Stored times are full Julian days:
 * 'jd' and 'bjd' as given ('bjd' is a full JD whose scale is barycentric TDB), 'mjd' + 2400000.5,
 * 'jd-N' + N for any N ≥ 0 written in a header or chosen (JD − 2400000, JD − 2450000,
 * BJD_TDB − 2457000 …), 'days' as given (a plain day count with no known zero point).
 */
export type TimeFormat = 'jd' | 'bjd' | 'mjd' | 'days' | `jd-${number}`

/**
 * What a column holds. Each of 'time', 'rv', 'error', 'instrument' may be used at most once.
 * 'flag' is a quality column (`good`/`cloudy`, `0`/`1`): rows whose value is not in `keep` are
 * stored excluded, the value as the reason; several flag columns may exist.
 */
export type ColumnRole = 'time' | 'rv' | 'error' | 'instrument' | 'indicator' | 'flag' | 'ignore'

/** Canonical names of the activity indicators Starsway knows; other indicator columns keep their own name. */
export type KnownIndicator = 'bisector_span' | 'fwhm' | 's_index' | 'log_rhk' | 'h_alpha'

export interface ColumnMapping {
  /** 0-based position of the column in each row. */
  index: number
  /** Header name as written, or `column N` (1-based) when the table has no header. */
  name: string
  role: ColumnRole
  /** For role 'indicator': the key under which values are stored (a KnownIndicator or a cleaned name). */
  indicator?: string
  /**
   * The velocity unit of this column as written. For 'rv' and 'error' it overrides the table's
   * `unit` (a header `RV[km/s] eRV[m/s]`); for a velocity-like indicator (bisector span, FWHM)
   * values are stored in m/s when it is set, as given when absent.
   */
  unit?: VelocityUnit
  /** For delimiter 'fixed': the 0-based character range [start, end) of the column. */
  start?: number
  end?: number
  /** For role 'flag': the values meaning a good measurement (compared trimmed, case-insensitive). */
  keep?: string[]
}

/**
 * Split rows of one instrument into set-ups at dates (an instrument upgrade). A row whose
 * instrument is `source` (or any row, when `source` is absent) and whose time is earlier than
 * `before` gets the name `instrument`; with several splits the earliest `before` that the row
 * precedes wins. Rows after every boundary keep their name.
 */
export interface DateSplit {
  /** Boundary as a full Julian day (the same scale as stored times). */
  before: number
  /** Name given to the rows earlier than `before`. */
  instrument: string
  /** Only rows currently named this are split; absent = all rows. */
  source?: string
}

export interface TableMapping {
  delimiter: Delimiter
  /** The first non-comment line is a header row (a commented header line needs no flag: comments are always skipped). */
  hasHeader: boolean
  /** Further non-comment rows after the header to skip (e.g. a units row). Default 0. */
  skipRows?: number
  /** Numbers are written with a decimal comma (`12,5`); only with ';', tab or whitespace delimiters. */
  decimalComma?: boolean
  columns: ColumnMapping[]
  unit: VelocityUnit
  timeFormat: TimeFormat
  /** Time scale of the times (default 'unknown'; 'bjd' implies 'bjd_tdb'). */
  timeScale?: TimeScale
  /** 1-based line where the table body starts (archive formats with a free-text preamble); lines before it are never read. */
  firstLine?: number
  /** Open questions (see Question); parseTable refuses a mapping that still has one. */
  questions?: Question[]
  /** One error for every row, in the table's unit; required when no column has role 'error'. */
  defaultError?: number
  /** Instrument name for all rows when no column has role 'instrument' (default DEFAULT_INSTRUMENT). */
  instrument?: string
  splitDates?: DateSplit[]
}

/** One column of a byte-by-byte description (CDS ReadMe, AAS MRT): 1-based inclusive bytes. */
export interface FieldSpec {
  first: number
  last: number
  label: string
  unit?: string
  explanation?: string
}

/** A column chosen by its header name (case-insensitive) or by its 1-based position. */
export type ColumnRef = string | number

/** What a caller (a CLI flag, a wizard correction) already knows; anything absent is detected. */
export interface DetectHints {
  delimiter?: Delimiter
  hasHeader?: boolean
  /** Column refs; `null` for error/instrument means "the table has no such column". */
  time?: ColumnRef
  rv?: ColumnRef
  error?: ColumnRef | null
  instrument?: ColumnRef | null
  unit?: VelocityUnit
  timeFormat?: TimeFormat
  defaultError?: number
  /** Name for all rows when there is no instrument column. */
  instrumentName?: string
  splitDates?: DateSplit[]
  timeScale?: TimeScale
  /** The upload's file name: names the instrument of a table without an instrument column, and refuses spreadsheets and LaTeX by name. */
  fileName?: string
  /** Column positions from a separate description (a CDS ReadMe naming this file). */
  layout?: FieldSpec[]
}

export interface PreviewRow {
  /** 1-based line number in the file. */
  line: number
  /** Raw cells as split by the detected delimiter. */
  cells: string[]
}

export interface Detection {
  mapping: TableMapping
  /** Names from the header row or commented header line, one per column; null when none. */
  headerNames: string[] | null
  headerFromComment: boolean
  /** 1-based line of the header (row or comment), or null. */
  headerLine: number | null
  columnCount: number
  /** Data rows (non-blank, non-comment lines after the header and skipped rows). */
  rowCount: number
  /** Comment lines skipped. */
  commentLines: number
  /** First data rows, raw. */
  preview: PreviewRow[]
  /** One sentence per decision: what was chosen and why. */
  notes: string[]
  /** The layout recognised (delimited text, fixed-width, ECSV, IPAC, AAS MRT, CDS, RDB). */
  format: TableFormat
}

export interface ParsedRow {
  /** 1-based line in the file. */
  line: number
  /** Full Julian day (days as given for 'days'). */
  time: number
  /** m/s. */
  rv: number
  /** m/s, > 0. */
  error: number
  instrument: string
  /** Indicator values by key; a cell left empty or written as NaN/NA/null is absent here. */
  indicators: Record<string, number>
  /** Set when a flag column marks the row (`quality: cloudy`): stored excluded with this reason. */
  excludedReason?: string
}

export interface RowProblem {
  /** 1-based line in the file. */
  line: number
  /** Column name (header name or `column N`), when the problem is in one cell. */
  column?: string
  message: string
}

export interface ParseResult {
  /** Good rows, in file order. Rows with a problem are not here. */
  rows: ParsedRow[]
  /** Problems, at most `maxProblems` of them (see problemCount for the total). */
  problems: RowProblem[]
  problemCount: number
  /** Doubtful rows that are still read (an error larger than the velocity spread), at most `maxProblems`. */
  warnings: RowProblem[]
  warningCount: number
  /** Instruments of the good rows, by first appearance. */
  instruments: Array<{ name: string; count: number }>
  /** Data rows read (good + bad). */
  rowsRead: number
  /** True when `maxRows` stopped the reading before the end of the file. */
  truncated: boolean
}

export interface ParseOptions {
  /** Stop after this many data rows (for previews). Default: all. */
  maxRows?: number
  /** Keep at most this many problems in `problems` (default MAX_PROBLEMS); all are counted. */
  maxProblems?: number
}
