/**
 * The plain-data form of a velocity series that the fitter and search take.
 */

/** Velocities of one star: times (days, any zero point), velocities and errors (m/s), instrument index per row. */
export interface RvData {
  t: Float64Array
  y: Float64Array
  dy: Float64Array
  /** Index into `instrumentNames` per row. */
  instrument: Int32Array
  instrumentNames: string[]
}

export interface RvRowsInput {
  time: ArrayLike<number>
  rv: ArrayLike<number>
  error: ArrayLike<number>
  /** Instrument name per row; omitted → one instrument called "default". */
  instrument?: ArrayLike<string>
}

/**
 * Builds `RvData` from columns. Bad rows get documented behaviour: a row whose time, velocity or
 * error is not finite, or whose error is not positive, is dropped and counted in `dropped`.
 * Instruments keep their order of first appearance. Throws if the columns differ in length.
 */
export function toRvData(input: RvRowsInput): { data: RvData; dropped: number } {
  const n = input.time.length
  if (input.rv.length !== n) throw new RangeError(`rv has ${input.rv.length} rows, time has ${n}`)
  if (input.error.length !== n) throw new RangeError(`error has ${input.error.length} rows, time has ${n}`)
  if (input.instrument && input.instrument.length !== n) {
    throw new RangeError(`instrument has ${input.instrument.length} rows, time has ${n}`)
  }
  const names: string[] = []
  const index = new Map<string, number>()
  const keep: number[] = []
  const inst: number[] = []
  for (let i = 0; i < n; i++) {
    const t = input.time[i], v = input.rv[i], e = input.error[i]
    if (!Number.isFinite(t) || !Number.isFinite(v) || !Number.isFinite(e) || !(e > 0)) continue
    const name = input.instrument ? String(input.instrument[i]) : 'default'
    let k = index.get(name)
    if (k === undefined) { k = names.length; names.push(name); index.set(name, k) }
    keep.push(i); inst.push(k)
  }
  const m = keep.length
  const data: RvData = {
    t: new Float64Array(m), y: new Float64Array(m), dy: new Float64Array(m),
    instrument: Int32Array.from(inst), instrumentNames: names,
  }
  keep.forEach((i, j) => { data.t[j] = input.time[i]; data.y[j] = input.rv[i]; data.dy[j] = input.error[i] })
  return { data, dropped: n - m }
}

/** Checks an `RvData` for consistency; throws naming the offending field. */
export function checkRvData(d: RvData): void {
  const n = d.t.length
  if (d.y.length !== n) throw new RangeError(`data.y has ${d.y.length} rows, data.t has ${n}`)
  if (d.dy.length !== n) throw new RangeError(`data.dy has ${d.dy.length} rows, data.t has ${n}`)
  if (d.instrument.length !== n) throw new RangeError(`data.instrument has ${d.instrument.length} rows, data.t has ${n}`)
  for (let i = 0; i < n; i++) {
    if (!(d.dy[i] > 0)) throw new RangeError(`data.dy[${i}] must be > 0, got ${d.dy[i]}`)
    const k = d.instrument[i]
    if (!(k >= 0 && k < d.instrumentNames.length)) throw new RangeError(`data.instrument[${i}] = ${k} has no name`)
  }
}

/** Baseline (last − first time), days. */
export function baseline(t: Float64Array): number {
  let lo = Infinity, hi = -Infinity
  for (let i = 0; i < t.length; i++) { if (t[i] < lo) lo = t[i]; if (t[i] > hi) hi = t[i] }
  return t.length ? hi - lo : 0
}
