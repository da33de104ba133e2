import { IngestError } from '../errors.ts'

const SPREADSHEETS: Record<string, string> = {
  xlsx: 'an Excel workbook', xlsm: 'an Excel workbook', xls: 'an old Excel workbook', ods: 'an OpenDocument spreadsheet',
  numbers: 'a Numbers spreadsheet', gsheet: 'a Google Sheets link',
}

/** Refuse spreadsheets and LaTeX by their file name, saying how to export the table. */
export function refuseByName(fileName: string | undefined): void {
  if (!fileName) return
  const ext = /\.([A-Za-z]+)$/.exec(fileName)?.[1]?.toLowerCase()
  if (ext && SPREADSHEETS[ext]) {
    throw new IngestError('unsupported_format', `${fileName} is ${SPREADSHEETS[ext]}. Save the sheet as CSV (File → Save as / Download → .csv) and upload that file.`)
  }
  if (ext === 'tex' || ext === 'latex') {
    throw new IngestError('unsupported_format', `${fileName} is a LaTeX file. Upload the table's data as plain text (CSV, tab- or space-separated), not the typeset table.`)
  }
}

/** Refuse a LaTeX table by its content (`\begin{tabular}`, or rows of `&` cells ending in `\\`). */
export function refuseLatex(lines: string[]): void {
  let rows = 0
  for (const l of lines.slice(0, 200)) {
    if (/\\begin\{(?:deluxe)?tabular|\\begin\{table|\\hline|\\startdata/.test(l)) rows += 5
    else if (/&.*\\\\\s*$/.test(l)) rows++
    if (rows >= 3) {
      throw new IngestError('unsupported_format',
        'This is a LaTeX table. Upload the data as plain text: one row per measurement, columns separated by commas, tabs or spaces (no &, \\\\ or \\hline).')
    }
  }
}
