/**
 * Writes the invented demo stars' velocity tables into fixtures/demo/ (CSV + README), from a fixed
 * seed with the project's own Keplerian model. Run: npx tsx scripts/make-demo-data.ts
 *
 * The stars, instruments and planets are invented for the demo; nothing here is an observation.
 */
import { mkdirSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { createRandom, type Random } from '../shared/math/random.ts'
import { radialVelocity, type Keplerian } from '../shared/rv/model.ts'

const OUT = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'demo')
const T0 = 2458000.5 // start of the first season (BJD)
const DEG = Math.PI / 180

interface InstrumentSpec { name: string; offset: number; jitter: number; errMin: number; errMax: number; from: number; to: number }
interface PlanetSpec { name: string; period: number; K: number; e: number; omegaDeg: number; tp: number }
interface StarSpec {
  name: string; file: string; seed: number; mass: number; luminosity: number; years: number; nightProb: number
  instruments: InstrumentSpec[]; planets: PlanetSpec[]
  activity?: { period: number; amplitude: number; lifetime: number }
  note: string
}

const STARS: StarSpec[] = [
  {
    name: 'Vela Sorrel', file: 'vela-sorrel.csv', seed: 1201, mass: 0.92, luminosity: 0.71, years: 5, nightProb: 0.16,
    instruments: [
      { name: 'Kestrel', offset: -12.4, jitter: 2.0, errMin: 1.0, errMax: 1.8, from: 0, to: 3.2 },
      { name: 'Harrier', offset: 6.8, jitter: 2.2, errMin: 2.0, errMax: 4.0, from: 2.0, to: 5 },
    ],
    planets: [
      { name: 'b', period: 12.4, K: 9.0, e: 0.1, omegaDeg: 40, tp: 2458003.2 },
      { name: 'c', period: 187.0, K: 14.0, e: 0.25, omegaDeg: 210, tp: 2458090.0 },
    ],
    note: 'two planets, two instruments overlapping for about a year',
  },
  {
    name: "Corvin's Lamp", file: 'corvins-lamp.csv', seed: 2203, mass: 1.08, luminosity: 1.35, years: 4.5, nightProb: 0.11,
    instruments: [
      { name: 'Osprey', offset: 21.5, jitter: 1.8, errMin: 1.5, errMax: 3.0, from: 0, to: 4.5 },
      { name: 'Harrier', offset: -4.0, jitter: 2.0, errMin: 2.0, errMax: 4.0, from: 3.0, to: 4.5 },
    ],
    planets: [{ name: 'b', period: 61.0, K: 35.0, e: 0.6, omegaDeg: 115, tp: 2458021.7 }],
    note: 'one eccentric planet',
  },
  {
    name: 'Tarn Meridian', file: 'tarn-meridian.csv', seed: 3307, mass: 0.81, luminosity: 0.38, years: 4, nightProb: 0.14,
    instruments: [
      { name: 'Kestrel', offset: 3.3, jitter: 1.5, errMin: 1.0, errMax: 1.8, from: 0, to: 4 },
      { name: 'Osprey', offset: -8.9, jitter: 1.8, errMin: 1.5, errMax: 3.0, from: 1.0, to: 4 },
    ],
    planets: [],
    activity: { period: 23.0, amplitude: 6.0, lifetime: 45 },
    note: 'no planet: a quasi-periodic rotation signal (spots) that the bisector span and S-index follow',
  },
]

/** Nights of observation: seasons of ~8 months a year, nights on a random subset, at a similar hour. */
function sampleTimes(rng: Random, years: number, nightProb: number): number[] {
  const times: number[] = []
  const days = Math.floor(years * 365.25)
  let run = 0
  for (let d = 0; d < days; d++) {
    const doy = d % 365.25
    if (doy > 240) continue // the star is behind the Sun
    if (run > 0) run--
    else if (rng.next() < nightProb / 3) run = 2 + rng.int(5) // an observing run of a few nights
    if (run === 0 && rng.next() > nightProb / 2) continue
    if (rng.next() < 0.25) continue // weather
    // the star crosses the meridian ~4 minutes earlier each night; observe within ±1.5 h of it
    const hour = 0.25 - (doy / 365.25) + (rng.next() - 0.5) * 0.125
    times.push(T0 + d + ((hour % 1) + 1) % 1 * 0.35)
  }
  return times
}

/** Quasi-periodic activity: a rotation signal whose amplitude and phase wander with the spots' lifetime. */
function activitySeries(rng: Random, t: number[], spec: NonNullable<StarSpec['activity']>): { rv: number[]; flux: number[] } {
  const knotsStep = spec.lifetime / 3
  const t0 = t[0], t1 = t[t.length - 1]
  const nk = Math.ceil((t1 - t0) / knotsStep) + 2
  const a1 = Array.from({ length: nk }, () => 0.7 + 0.5 * rng.next())
  const ph = [0]
  for (let k = 1; k < nk; k++) ph.push(ph[k - 1] + 0.6 * rng.normal())
  const a2 = Array.from({ length: nk }, () => 0.3 * rng.next())
  const interp = (arr: number[], x: number): number => {
    const u = (x - t0) / knotsStep, k = Math.min(Math.floor(u), nk - 2), f = u - k
    return arr[k] * (1 - f) + arr[k + 1] * f
  }
  const rv: number[] = [], flux: number[] = []
  for (const x of t) {
    const phase = 2 * Math.PI * (x - t0) / spec.period + interp(ph, x)
    const A = interp(a1, x), B = interp(a2, x)
    // the RV of a rotating spotted star ∝ the time derivative of the flux dip (common practice)
    flux.push(-(A * Math.cos(phase) + B * Math.cos(2 * phase)))
    rv.push(spec.amplitude * (A * Math.sin(phase) + 2 * B * Math.sin(2 * phase)) / 1.2)
  }
  return { rv, flux }
}

function makeStar(s: StarSpec): { csv: string; rows: number; perInstrument: Record<string, number> } {
  const rng = createRandom(s.seed)
  const nights = sampleTimes(rng, s.years, s.nightProb)
  const rows: Array<{ t: number; inst: InstrumentSpec }> = []
  for (const t of nights) {
    const yr = (t - T0) / 365.25
    const avail = s.instruments.filter((i) => yr >= i.from && yr < i.to)
    if (!avail.length) continue
    const inst = avail[rng.int(avail.length)]
    rows.push({ t, inst })
  }
  const t = Float64Array.from(rows.map((r) => r.t))
  const orbits: Keplerian[] = s.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * DEG, tp: p.tp }))
  const kep = radialVelocity(t, orbits)
  const act = s.activity ? activitySeries(rng, Array.from(t), s.activity) : null
  const lines = ['bjd,rv,rv_err,instrument,bisector_span,fwhm,s_index']
  const per: Record<string, number> = {}
  rows.forEach((r, i) => {
    const err = r.inst.errMin + (r.inst.errMax - r.inst.errMin) * rng.next()
    const a = act ? act.rv[i] : 0
    const f = act ? act.flux[i] : 0
    const rv = r.inst.offset + kep[i] + a + Math.sqrt(err * err + r.inst.jitter * r.inst.jitter) * rng.normal()
    // bisector span anti-correlated with the activity RV; FWHM and S-index follow the spot coverage
    const bis = -0.9 * a + 2.0 * rng.normal()
    const fwhm = 6480 + (act ? 9 * f : 0) + 4 * rng.normal()
    const sidx = 0.182 + (act ? 0.012 * f : 0) + 0.002 * rng.normal()
    lines.push([r.t.toFixed(6), rv.toFixed(3), err.toFixed(2), r.inst.name, bis.toFixed(2), fwhm.toFixed(1), sidx.toFixed(4)].join(','))
    per[r.inst.name] = (per[r.inst.name] ?? 0) + 1
  })
  return { csv: lines.join('\n') + '\n', rows: rows.length, perInstrument: per }
}

function main(): void {
  mkdirSync(OUT, { recursive: true })
  const readme: string[] = [
    '# Demo stars (invented)',
    '',
    'These three stars, their planets and the spectrographs "Kestrel", "Harrier" and "Osprey" are **invented for',
    'the demo**; the tables are simulated, not observed. Generated by `npx tsx scripts/make-demo-data.ts`',
    '(fixed seeds, Starsway\'s own Keplerian model in `shared/rv/model.ts`); regenerate with that command, never by hand.',
    '',
    'Columns: `bjd` (full BJD), `rv` (m/s, each instrument on its own zero point), `rv_err` (m/s, 1–4), `instrument`,',
    '`bisector_span` (m/s), `fwhm` (m/s), `s_index`. The scatter includes a jitter (below) beyond `rv_err`.',
    'Sampling: ~8-month seasons, observing runs of a few nights, weather losses, one visit a night near the',
    'meridian (so the one-day alias is present).',
    '',
  ]
  for (const s of STARS) {
    const { csv, rows, perInstrument } = makeStar(s)
    writeFileSync(join(OUT, s.file), csv)
    readme.push(`## ${s.name} — \`${s.file}\``, '')
    readme.push(`- Stellar mass ${s.mass} M☉, luminosity ${s.luminosity} L☉; ${s.note}.`)
    readme.push(`- ${rows} velocities over ${s.years} years: ${Object.entries(perInstrument).map(([k, v]) => `${k} ${v}`).join(', ')}.`)
    readme.push(`- Instruments: ${s.instruments.map((i) => `${i.name} (offset ${i.offset} m/s, jitter ${i.jitter} m/s, errors ${i.errMin}–${i.errMax} m/s)`).join('; ')}.`)
    if (s.planets.length) {
      readme.push('', '| planet | P [d] | K [m/s] | e | ω [deg] (star) | Tp [BJD] |', '|---|---|---|---|---|---|')
      for (const p of s.planets) readme.push(`| ${s.name} ${p.name} | ${p.period} | ${p.K} | ${p.e} | ${p.omegaDeg} | ${p.tp} |`)
    }
    if (s.activity) {
      readme.push(`- No planet. Activity: rotation period ${s.activity.period} d, RV amplitude ≈ ${s.activity.amplitude} m/s, spot`,
        `  lifetime ≈ ${s.activity.lifetime} d (amplitude and phase wander); bisector span = −0.9 × activity RV + noise;`,
        '  FWHM and S-index follow the spot coverage. A periodogram of the velocities shows a peak near the rotation',
        '  period and its harmonic — it is not a planet.')
    }
    readme.push('')
  }
  writeFileSync(join(OUT, 'README.md'), readme.join('\n'))
  console.log(`wrote ${STARS.length} tables and README.md to ${OUT}`)
}

main()
