import { describe, expect, it } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import { timeOffset, detectTable, parseTable, type TimeFormat, type VelocityUnit } from '../../../shared/ingest/index.ts'
import { expectClose } from '../../helpers/expect-close.ts'

type HeaderStyle = 'row' | 'comment' | 'none'

/** Names a writer would put in a header for each time format (time column). */
const TIME_NAMES: Record<string, string> = {
  jd: 'jd', bjd: 'bjd', mjd: 'mjd', 'jd-2400000': 'rjd', 'jd-2450000': 'bjd-2450000', days: 'days',
}

interface Written { text: string; time: number[]; rv: number[]; error: number[]; inst: string[] }

/** Write an invented table (times near JD 2450000–2460000, velocities tens of m/s) in one style. */
function write(seed: number, sep: string, header: HeaderStyle, unit: VelocityUnit, format: TimeFormat, withInstrument: boolean): Written {
  const r = createRandom(seed)
  const n = 5 + r.int(40)
  const out: Written = { text: '', time: [], rv: [], error: [], inst: [] }
  const lines: string[] = []
  const names = [TIME_NAMES[format], unit === 'km/s' ? 'rv_kms' : 'rv_ms', unit === 'km/s' ? 'err_kms' : 'err_ms', ...(withInstrument ? ['inst'] : [])]
  if (header === 'row') lines.push(names.join(sep))
  if (header === 'comment') lines.push('# invented star', `# ${names.join(sep)}`)
  const f = unit === 'km/s' ? 1000 : 1
  let t = 2450000 + r.next() * 9000
  for (let i = 0; i < n; i++) {
    t += 0.5 + r.next() * 20
    const written = (t - timeOffset(format)).toFixed(5)
    const rv = (-20 + 40 * r.next() + (r.next() < 0.3 ? -33000 : 0)) / f
    const err = (0.5 + 4 * r.next()) / f
    const rvText = rv.toFixed(unit === 'km/s' ? 6 : 3)
    const errText = err.toFixed(unit === 'km/s' ? 6 : 3)
    const inst = ['SpecA', 'SpecB'][r.int(2)]!
    lines.push([written, rvText, errText, ...(withInstrument ? [inst] : [])].join(sep))
    out.time.push(Number(written) + timeOffset(format))
    out.rv.push(Number(rvText) * f)
    out.error.push(Number(errText) * f)
    out.inst.push(withInstrument ? inst : 'unnamed')
  }
  out.text = lines.join('\n') + '\n'
  return out
}

describe('tables written in many styles read back to the same values', () => {
  const seps: Array<[string, string]> = [[',', ','], ['\t', '\t'], [';', ';'], [' ', 'whitespace']]
  const headers: HeaderStyle[] = ['row', 'comment', 'none']
  const units: VelocityUnit[] = ['m/s', 'km/s']
  const formats: TimeFormat[] = ['jd', 'bjd', 'mjd', 'jd-2400000', 'jd-2450000']
  let seed = 1
  for (const [sep, delimiter] of seps) for (const header of headers) for (const unit of units) for (const format of formats) {
    // Without a header, only the magnitude speaks: BJD reads as JD; reduced dates come with a
    // question (MJD or JD − 2400000; which zero point), its default preselected.
    const expected: TimeFormat = header === 'none' ? (format === 'bjd' ? 'jd' : format === 'mjd' ? 'jd-2400000' : format) : format
    const asked = header === 'none' && format !== 'jd' && format !== 'bjd'
    const s = seed++
    it(`${JSON.stringify(sep)} delimiter, header ${header}, ${unit}, ${format}`, () => {
      const w = write(s, sep, header, unit, format, s % 2 === 0)
      const d = detectTable(w.text)
      expect(d.mapping.delimiter).toBe(delimiter)
      expect(d.mapping.unit).toBe(unit)
      expect(d.mapping.timeFormat).toBe(expected)
      expect(d.mapping.questions?.length ?? 0).toBe(asked ? 1 : 0)
      if (asked) {
        expect(d.mapping.questions![0]!.choices.map(c => c.value)).toContain(format)
        expect(() => parseTable(w.text, d.mapping)).toThrow(/Choose one of/)
      }
      // the user's answer: the format the table was written in
      const { questions: _asked, ...answered } = { ...d.mapping, timeFormat: format === 'bjd' && header === 'none' ? 'jd' as const : format }
      const r = parseTable(w.text, answered)
      expect(r.problems).toEqual([])
      expectClose(r.rows.map(x => x.time), w.time, { atol: 1e-6 }, 'time')
      expectClose(r.rows.map(x => x.rv), w.rv, { rtol: 1e-12, atol: 1e-9 }, 'rv')
      expectClose(r.rows.map(x => x.error), w.error, { rtol: 1e-12, atol: 1e-9 }, 'error')
      expect(r.rows.map(x => x.instrument)).toEqual(w.inst)
    })
  }
})
