/**
 * Plain-data types of velocity-table ingest. Everything here is JSON-serialisable, so the same
 * objects travel from the server's preview to the browser's wizard and back to the commit.
 */

/** Field separator of a table. 'whitespace' means runs of spaces and/or tabs. */
export type Delimiter = ',' | '\t' | ';' | 'whitespace'

/** Unit of the velocity and error columns as written in the file. Stored values are always m/s. */
export type VelocityUnit = 'm/s' | 'km/s'

/**
 * How the time column is written. Stored times are full Julian days:
 * 'jd' and 'bjd' as given, 'mjd' + 2400000.5, 'jd-2400000' + 2400000, 'jd-2450000' + 2450000,
 * 'days' as given (a plain day count with no known zero point).
 */
export type TimeFormat = 'jd' | 'bjd' | 'mjd' | 'jd-2400000' | 'jd-2450000' | 'days'

/** What a column holds. Each of 'time', 'rv', 'error', 'instrument' may be used at most once. */
export type ColumnRole = 'time' | 'rv' | 'error' | 'instrument' | 'indicator' | 'ignore'

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
   * For role 'indicator' only: the velocity unit of this column, when it is a velocity-like
   * indicator (bisector span, FWHM). When set, values are stored in m/s; when absent, as given.
   */
  unit?: VelocityUnit
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
  /** One error for every row, in the table's unit; required when no column has role 'error'. */
  defaultError?: number
  /** Instrument name for all rows when no column has role 'instrument' (default DEFAULT_INSTRUMENT). */
  instrument?: string
  splitDates?: DateSplit[]
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
