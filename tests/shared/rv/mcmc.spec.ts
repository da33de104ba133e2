import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { samplePosterior, defaultRhatGroups, type SampleResult } from '../../../shared/rv/mcmc.ts'
import { fitKeplerians } from '../../../shared/rv/orbit-fit.ts'
import { derivedPlanet } from '../../../shared/rv/derived.ts'
import { stateToJson, stateFromJson, type SamplerState } from '../../../shared/rv/sampler.ts'
import type { ChainRows } from '../../../shared/rv/chain-store.ts'
import { expectClose } from '../../helpers/expect-close.ts'
import { synth } from './orbit-fit-helpers.ts'

const get = (r: SampleResult, name: string) => {
  const p = r.parameters.find((q) => q.name === name)
  if (!p) throw new Error(`no parameter ${name}`)
  return p
}

describe('posterior of a one-planet, high signal-to-noise system', () => {
  // At high S/N the posterior is close to Gaussian with the inverse Fisher covariance
  // (Bernstein–von Mises; common practice), which is what fitKeplerians reports as errors.
  const { data } = synth({
    seed: 404, n: 100, baseline: 700,
    planets: [{ period: 21.4, K: 40, e: 0.3, omega: 2.0, tp: 2455010 }],
    instruments: [{ name: 'A', offset: 12, jitter: 2, err: [1, 2] }],
  })
  const fit = fitKeplerians(data, { planets: [{ period: 21.4, K: 40, e: 0.3, omegaDeg: 115, tp: 2455010 }] })
  const starMass = { value: 0.9, err: 0.05 }
  const res = samplePosterior(data, fit, { walkers: 32, steps: 2500, burn: 500, seed: 21, starMass, untilConverged: false })

  it('mixes well (split-R̂ < 1.02, healthy acceptance); this short test run is honestly below 50 τ', () => {
    expect(fit.success).toBe(true)
    expect(res.diagnostics.acceptance).toBeGreaterThan(0.2)
    // Vehtari et al. 2021's 1.01 is for runs past 50 τ (checked in the converged run below); at 20–50 τ
    // split-R̂ over four walker groups scatters around 1.01 from seed to seed (3 of 10 seeds above it).
    for (const r of res.diagnostics.rhat) expect(r).toBeLessThan(1.02)
    for (const q of res.diagnostics.nOverTau) expect(q).toBeGreaterThan(20)
    expect(res.diagnostics.warnings.every((w) => /too short/.test(w))).toBe(true)
    expect(res.diagnostics.converged).toBe(res.diagnostics.nOverTau.every((q) => q >= 50))
  })

  it('gives posterior widths within 20 % of the covariance errors of the fit', () => {
    const p = fit.planets[0], s = fit.instruments[0]
    const pairs: Array<[string, number]> = [
      ['P b', p.uncertainty.period], ['K b', p.uncertainty.K], ['e b', p.uncertainty.e], ['ω b', p.uncertainty.omegaDeg],
      ['Tc b', p.uncertainty.tc], ['Tp b', p.uncertainty.tp], ['offset A', s.offsetErr], ['jitter A', s.jitterErr],
    ]
    for (const [name, err] of pairs) {
      const q = get(res, name)
      expectClose(q.sd, err, { rtol: 0.2 }, `sd ${name}`)
      expectClose((q.hi - q.lo) / 2, err, { rtol: 0.2 }, `half 68 % interval ${name}`)
    }
    // medians near the ML values (within 0.3 σ: a Gaussian posterior's median is its mode)
    expectClose(get(res, 'P b').median, p.period, { atol: 0.3 * p.uncertainty.period }, 'P median')
    expectClose(get(res, 'K b').median, p.K, { atol: 0.3 * p.uncertainty.K }, 'K median')
  })

  it('draws M sin i and a with the stellar-mass error (width as derivedPlanet propagates it)', () => {
    const p = fit.planets[0]
    const d = derivedPlanet(p, starMass.value, { starMassErr: starMass.err, covariance: p.covPKe })
    const m = get(res, 'M sin i b'), me = get(res, 'M sin i b (Earth masses)'), a = get(res, 'a b')
    expectClose(m.median, d.msiniMjup, { atol: 0.3 * d.uncertainty.msiniMjup }, 'M sin i median')
    expectClose(m.sd, d.uncertainty.msiniMjup, { rtol: 0.2 }, 'M sin i sd')
    expectClose(me.median / m.median, 317.83, { rtol: 1e-3 }, 'M_Jup/M_Earth (IAU 2015 B3 nominal ratio, 317.83)')
    expectClose(a.sd, d.uncertainty.aAu, { rtol: 0.2 }, 'a sd')
    expect(m.unit).toBe('M_Jup')
    expect(a.unit).toBe('au')
  })

  it('keeps a thinned sample of at most 2000 rows with names, steps and walkers', () => {
    const s = res.sample
    expect(s.names.length).toBe(s.columns.length)
    expect(s.names).toContain('K b')
    expect(s.names).toContain('ln posterior')
    expect(s.columns[0].length).toBeLessThanOrEqual(2000)
    expect(s.columns[0].length).toBeGreaterThan(1000)
    expect(s.step.length).toBe(s.columns[0].length)
    expect(Math.min(...s.step)).toBeGreaterThan(500)
    expect(new Set(s.walker).size).toBe(32)
    expect(res.settings).toMatchObject({ seed: 21, walkers: 32, steps: 2500, burn: 500, thin: 1, stepsDone: 2500, stopped: false, untilConverged: false })
    // the kept copy: 2500 steps in at most 1024 rows → every 4th step
    expect(res.settings).toMatchObject({ keptThin: 4, keptRows: 625, rhatGroups: 4 })
    expect(s.step.every((v) => v % 4 === 0)).toBe(true)
  })
})

describe('posterior against emcee (fixtures/sampler/one-planet-emcee.json)', () => {
  // Reference: scripts/reference/sampler_emcee.py, emcee 3.1.4 / numpy 1.24.2 (versions in the
  // fixture), the same likelihood, parameterisation and priors, 32 walkers × 20 000 steps.
  const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../fixtures/sampler/one-planet-emcee.json', import.meta.url)), 'utf8'))
  const n = ref.data.t.length
  const data = {
    t: Float64Array.from(ref.data.t as number[]), y: Float64Array.from(ref.data.y as number[]), dy: Float64Array.from(ref.data.dy as number[]),
    instrument: new Int32Array(n), instrumentNames: ['A'],
  }
  const tr = ref.provenance.truth
  const fit = fitKeplerians(data, { planets: [{ period: tr.P, K: tr.K, e: tr.e, omegaDeg: tr.omegaDeg, tc: tr.tc }] })
  const walkers = 32, steps = 3000, burn = 600
  const res = samplePosterior(data, fit, { walkers, steps, burn, seed: 5, untilConverged: false })

  it('agrees on medians and 68 % intervals within Monte-Carlo error', () => {
    // Monte-Carlo standard errors of sample quantiles with N_eff = N/τ draws (large-sample
    // theory of order statistics, common practice): median 1.2533 σ/√N_eff, 16th/84th
    // percentiles 1.93 σ/√N_eff for a near-Gaussian marginal. Ours and emcee's are combined in
    // quadrature; the bound is 4 combined standard errors.
    const tauOurs = Math.max(...res.diagnostics.tau)
    const nOurs = (walkers * (steps - burn)) / tauOurs
    const run = ref.provenance.run
    const nRef = run.draws / Math.max(...run.tauSteps)
    const map: Record<string, string> = { P: 'P b', K: 'K b', e: 'e b', omegaDeg: 'ω b', tc: 'Tc b', offset: 'offset A', jitter: 'jitter A' }
    for (const [key, name] of Object.entries(map)) {
      const r = ref.summary[key], q = get(res, name)
      const se = (k: number) => 4 * k * r.sd * Math.sqrt(1 / nOurs + 1 / nRef)
      expectClose(q.median, r.median, { atol: se(1.2533) }, `${name} median`)
      expectClose(q.lo, r.lo, { atol: se(1.93) }, `${name} 16th percentile`)
      expectClose(q.hi, r.hi, { atol: se(1.93) }, `${name} 84th percentile`)
    }
  })
})

describe('fixed parameters are held fixed, against emcee (fixtures/sampler/fixed-e-emcee.json)', () => {
  // Reference: scripts/reference/sampler_emcee.py --fixed, emcee 3.1.4 on the same likelihood with
  // e held fixed: a circular orbit (e = 0: ln P, ln K, Tc, offset, ln s) and e = 0.3 with ω sampled
  // alone (flat on the circle); 32 walkers × 16 000 steps.
  const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../fixtures/sampler/fixed-e-emcee.json', import.meta.url)), 'utf8'))
  for (const c of ref.cases as Array<Record<string, any>>) {
    it(`${c.name}: samples only the free parameters and agrees on medians and 68 % intervals`, () => {
      const n = c.data.t.length
      const data = {
        t: Float64Array.from(c.data.t as number[]), y: Float64Array.from(c.data.y as number[]), dy: Float64Array.from(c.data.dy as number[]),
        instrument: new Int32Array(n), instrumentNames: ['A'],
      }
      const tr = c.truth
      const fit = fitKeplerians(data, { planets: [{ period: tr.P, K: tr.K, e: c.eFixed, omegaDeg: tr.omegaDeg, tc: tr.tc, fix: ['e'] }] })
      const walkers = 32, steps = 3000, burn = 600
      const res = samplePosterior(data, { planets: [{ period: fit.planets[0].period, K: fit.planets[0].K, e: c.eFixed, omegaDeg: fit.planets[0].omegaDeg, tc: fit.planets[0].tc, fix: ['e'] }] }, { walkers, steps, burn, seed: 12, untilConverged: false })
      const names = res.diagnostics.names
      expect(names.length).toBe(c.eFixed === 0 ? 5 : 6)
      expect(names.some((q) => /√e/.test(q))).toBe(false)
      expect(res.settings.fixed).toEqual(c.eFixed === 0 ? [['e', 'omegaDeg']] : [['e']])
      const e = get(res, 'e b')
      expect(e).toMatchObject({ median: c.eFixed, lo: c.eFixed, hi: c.eFixed, sd: 0, fixed: true })
      const eCol = res.sample.columns[res.sample.names.indexOf('e b')]
      expect(eCol.every((v) => v === c.eFixed)).toBe(true) // a circular model's posterior has e exactly 0
      if (c.eFixed === 0) expect(res.parameters.some((p) => p.name === 'ω b' || p.name === 'Tp b')).toBe(false)
      // Monte-Carlo error of quantiles as in the test above (4 combined standard errors)
      const tauOurs = Math.max(...res.diagnostics.tau)
      const nOurs = (walkers * (steps - burn)) / tauOurs
      const nRef = c.run.draws / Math.max(...c.run.tauSteps)
      const map: Record<string, string> = { P: 'P b', K: 'K b', omegaDeg: 'ω b', tc: 'Tc b', offset: 'offset A', jitter: 'jitter A' }
      const col = (name: string) => res.sample.columns[res.sample.names.indexOf(name)]
      const quantile = (v: number[], p: number) => { const x = [...v].sort((a, b) => a - b); const h = (x.length - 1) * p, i = Math.floor(h); return x[i] + (h - i) * (x[Math.min(i + 1, x.length - 1)] - x[i]) }
      for (const key of Object.keys(c.summary)) {
        const r = c.summary[key]
        let q = get(res, map[key]), nQ = nOurs
        if (key === 'tc') {
          // our Tc is the conjunction nearest the data's mean time, emcee's the one nearest its start: the same
          // orbit whole periods apart, so each draw is moved by its own P (from the plot sample, ≤ 2000 draws)
          const tcs = col('Tc b'), Ps = col('P b')
          const N = Math.round((q.median - r.median) / get(res, 'P b').median)
          const v = tcs.map((t, i) => t - N * Ps[i])
          const m = v.reduce((a, b) => a + b, 0) / v.length
          q = { ...q, median: quantile(v, 0.5), lo: quantile(v, 0.16), hi: quantile(v, 0.84), sd: Math.sqrt(v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1)) }
          nQ = Math.min(nOurs, v.length)
        }
        const se = (k: number) => 4 * k * r.sd * Math.sqrt(1 / nQ + 1 / nRef)
        expectClose(q.median, r.median, { atol: se(1.2533) }, `${map[key]} median`)
        expectClose(q.lo, r.lo, { atol: se(1.93) }, `${map[key]} 16th percentile`)
        expectClose(q.hi, r.hi, { atol: se(1.93) }, `${map[key]} 84th percentile`)
        // sd of a sample of N_eff draws: relative standard error 1/√(2 N_eff) (normal theory, common practice); 4 of them
        expectClose(q.sd, r.sd, { rtol: 4 * Math.sqrt(1 / (2 * nQ) + 1 / (2 * nRef)) }, `${map[key]} sd`)
      }
    })
  }

  it('reads the fixed parameters of a bare fit from its zero errors (P and Tp held)', () => {
    const { data } = synth({ seed: 12, n: 50, baseline: 400, planets: [{ period: 15, K: 20, e: 0.2, omega: 1.0, tp: 2455004 }] })
    const fit = fitKeplerians(data, { planets: [{ period: 15, K: 18, e: 0.2, omegaDeg: 57, tp: 2455004, fix: ['period', 'tp'] }] })
    const res = samplePosterior(data, fit, { walkers: 12, steps: 200, seed: 2, untilConverged: false })
    expect(res.settings.fixed).toEqual([['period', 'tp']])
    expect(res.diagnostics.names).toEqual(['ln K b', '√e cos ω b', '√e sin ω b', 'offset A', 'ln jitter A'])
    expect(get(res, 'P b')).toMatchObject({ median: 15, sd: 0, fixed: true })
    expect(get(res, 'Tp b').fixed).toBe(true)
    expect(get(res, 'Tp b').median).toBeCloseTo(fit.planets[0].tp, 6)
    expect(get(res, 'Tc b').sd).toBeGreaterThan(0) // Tc moves with e and ω when Tp is held
  })
})

describe('sampling runs: reproducibility, stopping, warnings, misuse', () => {
  const { data } = synth({ seed: 9, n: 40, baseline: 300, planets: [{ period: 8.2, K: 20, e: 0.1, omega: 0.5, tp: 2455001 }] })
  const spec = { planets: [{ period: 8.2, K: 20, e: 0.1, omegaDeg: 30, tp: 2455001 }], jitter: [0] }
  const fixed = { untilConverged: false }

  it('gives identical results for the same seed (from fit options, fixed jitter)', () => {
    const a = samplePosterior(data, spec, { walkers: 12, steps: 200, burn: 50, seed: 8, ...fixed })
    const b = samplePosterior(data, spec, { walkers: 12, steps: 200, burn: 50, seed: 8, ...fixed })
    const c = samplePosterior(data, spec, { walkers: 12, steps: 200, burn: 50, seed: 9, ...fixed })
    expect(a.parameters).toEqual(b.parameters)
    expect(a.sample).toEqual(b.sample)
    expect(a.parameters).not.toEqual(c.parameters)
    expect(a.diagnostics.names).not.toContain('ln jitter A')
  })

  it('runs until converged by default and stops there, with no warnings', () => {
    const r = samplePosterior(data, spec, { walkers: 24, seed: 2 })
    expect(r.diagnostics.warnings).toEqual([])
    expect(r.diagnostics.converged).toBe(true)
    expect(r.settings).toMatchObject({ untilConverged: true, steps: 100_000, stopped: false })
    // it stopped at a check step (an eighth of the kept rows' span), long before the budget
    expect(r.settings.stepsDone).toBeLessThan(20_000)
    expect(r.settings.stepsDone % (r.settings.keptThin * 128)).toBe(0)
    expect(r.settings.burn).toBe(Math.floor(r.settings.stepsDone / 4))
    for (const q of r.diagnostics.nOverTau) expect(q).toBeGreaterThan(50) // Foreman-Mackey et al. 2013 rule
    for (const q of r.diagnostics.rhat) expect(q).toBeLessThan(1.01) // Vehtari et al. 2021
  })

  it('says in plain words that a run whose budget ran out has not converged, and how many steps would do', () => {
    const r = samplePosterior(data, spec, { walkers: 12, steps: 400, seed: 1 })
    expect(r.diagnostics.converged).toBe(false)
    expect(r.settings.stepsDone).toBe(400)
    expect(r.diagnostics.warnings.join(' ')).toMatch(/too short.*About \d+ steps would do; the budget of 400 steps ran out: raise it/)
    const f = samplePosterior(data, spec, { walkers: 12, steps: 100, seed: 1, ...fixed })
    expect(f.diagnostics.converged).toBe(false)
    expect(f.diagnostics.warnings.join(' ')).toMatch(/too short/)
  })

  it('stops when the progress callback asks and reports it', () => {
    const seen: number[] = []
    const r = samplePosterior(data, spec, {
      walkers: 12, steps: 1000, seed: 1, progressEvery: 50,
      onProgress: (p) => { seen.push(p.step); return p.step >= 150 ? 'stop' : undefined },
    })
    expect(seen).toEqual([50, 100, 150])
    expect(r.settings.stopped).toBe(true)
    expect(r.settings.stepsDone).toBe(150)
    expect(r.diagnostics.converged).toBe(false)
    expect(r.diagnostics.warnings[0]).toMatch(/stopped after 150 of 1000 steps/)
  })

  it('resumes a stopped fixed-length run (state and the rows of its checkpoints) to the same result', () => {
    const opts = { walkers: 12, steps: 300, burn: 60, seed: 4, thin: 2, progressEvery: 40, ...fixed }
    const whole = samplePosterior(data, spec, opts)
    let saved: { state: Record<string, unknown>; rows: { steps: number[]; chain: number[]; lnProb: number[] } } | null = null
    samplePosterior(data, spec, {
      ...opts,
      onProgress: (p) => {
        if (p.step < 120) return undefined
        const rows = p.store.takePending()
        saved = JSON.parse(JSON.stringify({ state: stateToJson(p.state), rows: { steps: Array.from(rows.steps), chain: Array.from(rows.chain), lnProb: Array.from(rows.lnProb) } }))
        return 'stop'
      },
    })
    expect(saved).not.toBeNull()
    const s = saved as unknown as { state: Record<string, unknown>; rows: { steps: number[]; chain: number[]; lnProb: number[] } }
    const rows: ChainRows = { steps: Int32Array.from(s.rows.steps), chain: Float64Array.from(s.rows.chain), lnProb: Float64Array.from(s.rows.lnProb) }
    const resumed = samplePosterior(data, spec, { ...opts, resume: { state: stateFromJson(s.state), rows } })
    expect(resumed.parameters).toEqual(whole.parameters)
    expect(resumed.diagnostics).toEqual(whole.diagnostics)
    expect(resumed.settings).toEqual(whole.settings)
  })

  it('resumes a run until convergence from append-only checkpoints (the kept copy thinned twice on the way) to the same result', () => {
    const opts = { walkers: 12, seed: 6, steps: 3000, keptRows: 32, progressEvery: 20 }
    const whole = samplePosterior(data, spec, opts)
    expect(whole.settings.keptThin).toBeGreaterThanOrEqual(4)
    const chunks: ChainRows[] = []
    let state: SamplerState | null = null
    samplePosterior(data, spec, {
      ...opts,
      onProgress: (p) => {
        if (p.step % 60 === 0) chunks.push(p.store.takePending()) // a checkpoint: the rows since the last one
        if (p.step < 240) return undefined
        state = stateFromJson(JSON.parse(JSON.stringify(stateToJson(p.state))))
        chunks.push(p.store.takePending())
        return 'stop'
      },
    })
    const cat = <T extends Int32Array | Float64Array>(make: (n: number) => T, parts: T[]): T => {
      const out = make(parts.reduce((n, a) => n + a.length, 0)); let o = 0
      for (const a of parts) { out.set(a, o); o += a.length }
      return out
    }
    const rows: ChainRows = {
      steps: cat((n) => new Int32Array(n), chunks.map((c) => c.steps)),
      chain: cat((n) => new Float64Array(n), chunks.map((c) => c.chain)),
      lnProb: cat((n) => new Float64Array(n), chunks.map((c) => c.lnProb)),
    }
    const resumed = samplePosterior(data, spec, { ...opts, resume: { state: state!, rows } })
    expect(resumed.settings).toEqual(whole.settings)
    expect(resumed.parameters).toEqual(whole.parameters)
    expect(resumed.diagnostics).toEqual(whole.diagnostics)
  })

  it('works with any even walker count: split-R̂ over walker groups that divide it', () => {
    expect([34, 36, 30, 32, 38, 2 * 17].map(defaultRhatGroups)).toEqual([2, 4, 5, 4, 2, 2])
    // 51 Peg's default: 17 parameters → 34 walkers (the case that used to fail)
    const r = samplePosterior(data, spec, { walkers: 34, steps: 300, seed: 3, ...fixed })
    expect(r.settings.rhatGroups).toBe(2)
    expect(r.diagnostics.rhat.every(Number.isFinite)).toBe(true)
    expect(samplePosterior(data, spec, { walkers: 34, steps: 300, seed: 3, rhatGroups: 17, ...fixed }).settings.rhatGroups).toBe(17)
  })

  it('throws on misuse, naming the option', () => {
    expect(() => samplePosterior(data, spec, { walkers: 6 })).toThrow(/walkers/)
    expect(() => samplePosterior(data, spec, { steps: 100, burn: 100 })).toThrow(/burn/)
    expect(() => samplePosterior(data, spec, { thin: 0 })).toThrow(/thin/)
    expect(() => samplePosterior(data, spec, { starMass: { value: -1, err: 0 } })).toThrow(/starMass/)
    expect(() => samplePosterior(data, spec, { walkers: 12, rhatGroups: 5 })).toThrow(/rhatGroups/)
    expect(() => samplePosterior(data, spec, { walkers: 12, keptRows: 7 })).toThrow(/keptRows/)
  })
})
