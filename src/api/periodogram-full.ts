import { request } from './http.ts'
import type { PeriodogramRun } from '@shared/api/analyses.ts'

/** A saved run with every computed power (409 when its full curve was dropped under the team's storage bound). */
export const fetchPeriodogramFull = (periodogramId: number) => request<PeriodogramRun>(`/periodograms/${periodogramId}?full=1`)
