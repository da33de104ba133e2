/**
 * The methods paragraph of a report, written from what was actually done (which periodograms were
 * run, the model fitted, whether it was sampled), with the references of exactly those methods.
 */
import { formatPlain } from './round.ts'
import type { FitNoise } from '../api/analyses.ts'

export interface MethodsInput {
  nPoints: number
  instruments: string[]
  nExcluded: number
  periodogram: { minPeriod: number; maxPeriod: number; oversample: number } | null
  residualPeriodogram: boolean
  planets: number
  trend: 'none' | 'linear' | 'quadratic'
  /** Model comparison by BIC against other models of the same data. */
  compared: boolean
  /** Derived M sin i and a (needs the stellar mass). */
  derived: boolean
  sampling: { walkers: number; steps: number; burn: number; thin: number; seed: number } | null
  /** The fitted noise model (absent: white noise with fitted jitters). */
  noise?: FitNoise | null
}

export const REFERENCES = {
  ZK09: 'Zechmeister, M., & Kürster, M. 2009, A&A, 496, 577',
  Baluev08: 'Baluev, R. V. 2008, MNRAS, 385, 1279',
  Ford06: 'Ford, E. B. 2006, ApJ, 642, 505',
  Schwarz78: 'Schwarz, G. 1978, Annals of Statistics, 6, 461',
  KR95: 'Kass, R. E., & Raftery, A. E. 1995, JASA, 90, 773',
  IAU15: 'IAU 2015 Resolution B3 on recommended nominal conversion constants (Prša, A., et al. 2016, AJ, 152, 41); IAU 2012 Resolution B2 (astronomical unit)',
  GW10: 'Goodman, J., & Weare, J. 2010, CAMCoS, 5, 65',
  FM13: 'Foreman-Mackey, D., Hogg, D. W., Lang, D., & Goodman, J. 2013, PASP, 125, 306',
  FM17: 'Foreman-Mackey, D., Agol, E., Ambikasaran, S., & Angus, R. 2017, AJ, 154, 220',
  Haywood14: 'Haywood, R. D., et al. 2014, MNRAS, 443, 2517',
  RW06: 'Rasmussen, C. E., & Williams, C. K. I. 2006, Gaussian Processes for Machine Learning (MIT Press)',
} as const
export type ReferenceKey = keyof typeof REFERENCES

const CITE: Record<ReferenceKey, string> = {
  ZK09: 'Zechmeister & Kürster 2009', Baluev08: 'Baluev 2008', Ford06: 'Ford 2006', Schwarz78: 'Schwarz 1978',
  KR95: 'Kass & Raftery 1995', IAU15: 'IAU 2015 Resolution B3', GW10: 'Goodman & Weare 2010', FM13: 'Foreman-Mackey et al. 2013',
  FM17: 'Foreman-Mackey et al. 2017', Haywood14: 'Haywood et al. 2014', RW06: 'Rasmussen & Williams 2006',
}

function list(items: string[]): string {
  if (items.length <= 1) return items.join('')
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`
}

export function methodsParagraph(m: MethodsInput): { text: string; references: Array<{ key: ReferenceKey; citation: string }> } {
  const used: ReferenceKey[] = []
  const cite = (...keys: ReferenceKey[]) => { for (const k of keys) if (!used.includes(k)) used.push(k); return `(${keys.map((k) => CITE[k]).join('; ')})` }
  const textual = (k: ReferenceKey) => { cite(k); return CITE[k].replace(/ (\d{4})$/, ' ($1)') }
  const s: string[] = []
  s.push(`We analysed ${m.nPoints} radial velocities from ${m.instruments.length === 1 ? 'one instrument' : `${m.instruments.length} instruments`} (${list(m.instruments)})` +
    (m.nExcluded ? `; ${m.nExcluded} measurement${m.nExcluded === 1 ? ' was' : 's were'} excluded, each with a recorded reason.` : '.'))
  if (m.periodogram) {
    s.push(`Periodic signals were searched for with the generalised Lomb–Scargle periodogram with a floating mean and weights ${cite('ZK09')}, ` +
      `on a grid from ${formatPlain(m.periodogram.minPeriod, 4)} to ${formatPlain(m.periodogram.maxPeriod, 4)} d oversampled ${formatPlain(m.periodogram.oversample, 3)} times; ` +
      `false-alarm probabilities are those of ${textual('Baluev08')}.`)
  }
  if (m.residualPeriodogram) s.push('The residuals of the fit were searched in the same way for further signals.')
  const trend = m.trend === 'none' ? '' : m.trend === 'linear' ? ', a linear trend' : ', a quadratic trend'
  const orbits = m.planets === 0 ? 'no planet' : m.planets === 1 ? 'one Keplerian orbit' : `${m.planets} Keplerian orbits`
  const pinned = m.noise?.pinnedJitters.length ? ` (pinned for ${list(m.noise.pinnedJitters.map((p) => `${p.instrument} at ${formatPlain(p.jitter, 3)} m/s`))})` : ''
  if (m.noise?.kind === 'gp') {
    const kernel = m.noise.kernel === 'rotation'
      ? `a rotation kernel (two stochastically driven damped oscillators at the rotation period and its first harmonic) evaluated with the O(N) semiseparable solver ${cite('FM17')}`
      : `the quasi-periodic kernel ${cite('Haywood14')}, evaluated by Cholesky factorisation`
    s.push(`The velocities were modelled with ${orbits}${trend}, an offset for each instrument, a jitter term per instrument${pinned} added in quadrature to the measurement errors ${cite('Ford06')}, ` +
      `and correlated stellar activity as a Gaussian process ${cite('RW06')} with ${kernel}. ` +
      `Its hyperparameters were ${list(m.noise.hyperparameters.map((h) => `${h.name} ${h.symbol} = ${formatPlain(h.value, 4)}${h.fixed ? ' (fixed)' : h.error !== null ? ` ± ${formatPlain(h.error, 2)}` : ''}${h.unit ? ` ${h.unit}` : ''}`))}, ` +
      `with priors: ${m.noise.priors.join('; ')}. Offsets and trend were profiled out by generalised least squares; the other parameters are at the maximum of the posterior, with uncertainties from its curvature there (Laplace approximation).`)
  } else {
    s.push(`The velocities were modelled with ${orbits}${trend}, ` +
      `an offset for each instrument and a jitter term per instrument${pinned} added in quadrature to the measurement errors in the likelihood ${cite('Ford06')}; ` +
      'the parameters were fitted by maximising the likelihood, with uncertainties from the covariance matrix at the maximum.')
  }
  if (m.compared) s.push(`Models were compared with the Bayesian information criterion ${cite('Schwarz78')}, differences read on the scale of ${textual('KR95')}.`)
  if (m.derived) s.push(`Minimum masses M sin i and semi-major axes follow from the mass function and Kepler's third law with the IAU nominal constants ${cite('IAU15')}, the stellar-mass uncertainty propagated.`)
  if (m.sampling) {
    const sm = m.sampling
    s.push(`The posterior was sampled with the affine-invariant ensemble sampler ${cite('GW10')} using ${sm.walkers} walkers for ${sm.steps} steps ` +
      `(the first ${sm.burn} discarded, thinned by ${sm.thin}, seed ${sm.seed}); convergence was judged from the integrated autocorrelation time ${cite('FM13')}. ` +
      'Reported intervals are the 16th–84th percentiles of the marginal posteriors about the median.')
  }
  return { text: s.join(' '), references: used.map((key) => ({ key, citation: REFERENCES[key] })) }
}
