/**
 * Instrument centring before a periodogram: the one home for the CLI, the server and the browser.
 *
 * Each instrument's zero point is removed by its weighted mean with the QUOTED errors
 * (w = 1/σ², no jitter), and the quoted errors are kept. These are the maximum-likelihood offsets
 * of a no-planet model at zero jitter; the generalised Lomb–Scargle periodogram (Zechmeister &
 * Kürster 2009, A&A 496, 577, eq. 4–5) then fits its own floating mean on top.
 *
 * Why not the offsets and jitters of a no-planet likelihood fit: a planet's signal counts as noise
 * in that model, so its jitter grows to soak the signal up and the inflated errors then lower the
 * planet's weight and power (e.g. 51 Peg: top power 0.970 centred this way, 0.939 with no-planet
 * jitters). Jitters are fitted only with the orbit (`fitKeplerians`). Fitting the offsets at every
 * trial period is the job of the Keplerian periodogram, not of this pre-step.
 */

/** Velocities minus each instrument's weighted mean (weights 1/dy²); errors unchanged. */
export function centreByInstrument(y: ArrayLike<number>, dy: ArrayLike<number>, instrument: ArrayLike<number>): Float64Array {
  const n = y.length
  if (dy.length !== n || instrument.length !== n) throw new RangeError(`y, dy and instrument must have the same length (${n}, ${dy.length}, ${instrument.length})`)
  let nInst = 0
  for (let i = 0; i < n; i++) {
    const k = instrument[i]
    if (!(Number.isInteger(k) && k >= 0)) throw new RangeError(`instrument[${i}] must be a non-negative integer index, got ${k}`)
    if (!(dy[i] > 0)) throw new RangeError(`dy[${i}] must be > 0, got ${dy[i]}`)
    nInst = Math.max(nInst, k + 1)
  }
  const sw = new Float64Array(nInst), swy = new Float64Array(nInst)
  for (let i = 0; i < n; i++) { const w = 1 / (dy[i] * dy[i]); sw[instrument[i]] += w; swy[instrument[i]] += w * y[i] }
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) out[i] = y[i] - swy[instrument[i]] / sw[instrument[i]]
  return out
}
