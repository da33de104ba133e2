// Pinned instrument jitters of a model: the form's rows (one per instrument, "fitted" or a pinned
// value as typed) to and from the model spec's `instrumentTerms: [{ instrument, jitter }]`, checked
// by the API's own schema (shared/api/analyses.ts instrumentTermSchema: limits and messages).
import { instrumentTermSchema, type InstrumentTermSpec } from '@shared/api/analyses.ts'

export interface InstrumentTermRow { instrument: string; pinned: boolean; jitter: string }

/** One row per instrument of the model, pinned where the spec pins it. */
export function termsToRows(instruments: string[], terms: InstrumentTermSpec[] | undefined): InstrumentTermRow[] {
  return instruments.map((instrument) => {
    const t = terms?.find((x) => x.instrument === instrument)
    return t && t.jitter !== undefined ? { instrument, pinned: true, jitter: String(t.jitter) } : { instrument, pinned: false, jitter: '' }
  })
}

/** The spec's terms (pinned rows only; absent when none) and the message per instrument that cannot be saved. */
export function rowsToTerms(rows: InstrumentTermRow[]): { terms: InstrumentTermSpec[] | undefined; errors: Record<string, string> } {
  const terms: InstrumentTermSpec[] = []
  const errors: Record<string, string> = {}
  for (const r of rows) {
    if (!r.pinned) continue
    const text = r.jitter.trim()
    const value = text === '' ? NaN : Number(text)
    if (!Number.isFinite(value)) { errors[r.instrument] = 'Jitter must be a number in m/s (0 for none)'; continue }
    const parsed = instrumentTermSchema.safeParse({ instrument: r.instrument, jitter: value })
    if (!parsed.success) { errors[r.instrument] = `Jitter ${parsed.error.issues[0]?.message ?? 'is not valid'}`; continue }
    terms.push(parsed.data)
  }
  return { terms: terms.length ? terms : undefined, errors }
}
