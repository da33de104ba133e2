/** Largest accepted upload, in bytes (20 MB). */
export const MAX_FILE_BYTES = 20 * 1024 * 1024
/** Largest accepted number of data rows. */
export const MAX_ROWS = 200_000
/** Problems kept in a ParseResult by default (all are counted in problemCount). */
export const MAX_PROBLEMS = 1000
/** Data rows returned in Detection.preview. */
export const PREVIEW_ROWS = 20
/** Instrument name used when a table has no instrument column and none is given. */
export const DEFAULT_INSTRUMENT = 'unnamed'
/** Line prefixes that mark a comment line (after leading spaces). */
export const COMMENT_PREFIXES = ['#', '!', '%'] as const
