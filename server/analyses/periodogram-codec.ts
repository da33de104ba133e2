// Binary form of stored periodogram curves (table periodogram_curves, migration 0012): a few named
// curves, each n powers as Float32 and its abscissa either regenerated from a regular frequency
// grid (f0, df: 16 bytes), stored as Float64 periods when the grid is irregular, or as Float32
// periods for plot copies (7 digits: 0.0004 d at 7000 d, far below a pixel). Little-endian.
//
//   'SWPC' u8 version=1 u8 curves u16 0
//   per curve: u8 nameLength, name (UTF-8), u8 mode (0 grid, 1 f64 periods, 2 f32 periods), u32 n,
//              mode 0: f64 f0, f64 df | mode 1: f64 period × n | mode 2: f32 period × n;  then f32 power × n
//
// Curves are kept in increasing period (decreasing frequency), the order the API serves.
// Float32 keeps 7 significant digits of a power in 0…1 (plenty for drawing; the peak list keeps full
// precision in the run's JSON). Kept free of other imports so migration 0012 can use it as is.

export interface PeriodCurve { period: number[]; power: number[] }
export type StoredCurve =
  | { name: string; grid: { f0: number; df: number }; power: ArrayLike<number> }
  | { name: string; period: Float64Array | Float32Array; power: ArrayLike<number> }

const MAGIC = 0x43505753 // 'SWPC' read as a little-endian u32
const VERSION = 1

/** A curve on a regular frequency grid: `power[k]` at f0 + k·df (increasing frequency), stored by grid. */
export function gridCurve(name: string, f0: number, df: number, powerByFrequency: ArrayLike<number>): StoredCurve {
  const n = powerByFrequency.length
  const power = new Float32Array(n)
  for (let i = 0; i < n; i++) power[i] = powerByFrequency[n - 1 - i]!
  return { name, grid: { f0, df }, power }
}

/**
 * A curve given by its frequencies (increasing): stored by grid when they are regular to 1e-9 of a
 * step, else with its periods as Float64.
 */
export function frequencyCurve(name: string, frequency: ArrayLike<number>, powerByFrequency: ArrayLike<number>): StoredCurve {
  const n = frequency.length
  const df = n > 1 ? (frequency[n - 1]! - frequency[0]!) / (n - 1) : 0
  let regular = n > 1 && df > 0
  for (let k = 0; regular && k < n; k++) if (Math.abs(frequency[k]! - (frequency[0]! + k * df)) > 1e-9 * df) regular = false
  if (regular) return gridCurve(name, frequency[0]!, df, powerByFrequency)
  const period = new Float64Array(n), power = new Float32Array(n)
  for (let i = 0; i < n; i++) { period[i] = 1 / frequency[n - 1 - i]!; power[i] = powerByFrequency[n - 1 - i]! }
  return { name, period, power }
}

/** A plot copy already in increasing period: periods and powers kept as Float32. */
export function periodCurve(name: string, c: PeriodCurve): StoredCurve {
  return { name, period: Float32Array.from(c.period), power: Float32Array.from(c.power) }
}

export function encodeCurves(curves: StoredCurve[]): Buffer {
  const names = curves.map((c) => Buffer.from(c.name, 'utf8'))
  let size = 8
  curves.forEach((c, i) => { size += 1 + names[i]!.length + 1 + 4 + ('grid' in c ? 16 : c.period.BYTES_PER_ELEMENT * c.power.length) + 4 * c.power.length })
  const buf = Buffer.alloc(size)
  const v = new DataView(buf.buffer, buf.byteOffset, buf.byteLength)
  v.setUint32(0, MAGIC, true); v.setUint8(4, VERSION); v.setUint8(5, curves.length)
  let o = 8
  curves.forEach((c, i) => {
    const name = names[i]!
    v.setUint8(o, name.length); o += 1
    name.copy(buf, o); o += name.length
    const n = c.power.length
    const f32 = !('grid' in c) && c.period instanceof Float32Array
    v.setUint8(o, 'grid' in c ? 0 : f32 ? 2 : 1); o += 1
    v.setUint32(o, n, true); o += 4
    if ('grid' in c) { v.setFloat64(o, c.grid.f0, true); v.setFloat64(o + 8, c.grid.df, true); o += 16 }
    else if (f32) for (let k = 0; k < n; k++, o += 4) v.setFloat32(o, c.period[k]!, true)
    else for (let k = 0; k < n; k++, o += 8) v.setFloat64(o, c.period[k]!, true)
    for (let k = 0; k < n; k++, o += 4) v.setFloat32(o, c.power[k]!, true)
  })
  return buf
}

/** The curves of a buffer written by {@link encodeCurves}, by name, as plain arrays in increasing period. */
export function decodeCurves(buf: Uint8Array): Map<string, PeriodCurve> {
  const v = new DataView(buf.buffer, buf.byteOffset, buf.byteLength)
  if (buf.byteLength < 8 || v.getUint32(0, true) !== MAGIC) throw new Error('not a stored periodogram curve (bad magic)')
  if (v.getUint8(4) !== VERSION) throw new Error(`stored periodogram curve version ${v.getUint8(4)} is not known`)
  const out = new Map<string, PeriodCurve>()
  let o = 8
  for (let c = v.getUint8(5); c > 0; c--) {
    const len = v.getUint8(o); o += 1
    const name = Buffer.from(buf.buffer, buf.byteOffset + o, len).toString('utf8'); o += len
    const mode = v.getUint8(o); o += 1
    const n = v.getUint32(o, true); o += 4
    const period = new Array<number>(n), power = new Array<number>(n)
    if (mode === 0) {
      const f0 = v.getFloat64(o, true), df = v.getFloat64(o + 8, true); o += 16
      for (let i = 0; i < n; i++) period[i] = 1 / (f0 + (n - 1 - i) * df)
    } else if (mode === 2) for (let i = 0; i < n; i++, o += 4) period[i] = v.getFloat32(o, true)
    else if (mode === 1) for (let i = 0; i < n; i++, o += 8) period[i] = v.getFloat64(o, true)
    else throw new Error(`stored periodogram curve mode ${mode} is not known`)
    for (let i = 0; i < n; i++, o += 4) power[i] = v.getFloat32(o, true)
    out.set(name, { period, power })
  }
  return out
}
