import type { ReportSnapshot } from '../../shared/api/reports.ts'
import { reportDataTable, toCsv, toEcsv } from '../../shared/report/data-table.ts'

/** The data of a frozen report as CSV: one header row whose names carry units and the time system. */
export function reportCsv(s: ReportSnapshot): string {
  return toCsv(reportDataTable(s))
}

/** The same table as ECSV 1.0 (units, descriptions and provenance in the YAML header). */
export function reportEcsv(s: ReportSnapshot): string {
  return toEcsv(reportDataTable(s))
}
