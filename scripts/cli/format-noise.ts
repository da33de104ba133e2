// Plain-text and JSON pieces of the GP noise model on the command line (planets + GP, activity candidates).
import type { ActivityCandidate, GpHyperparameters, GpPlanetFit } from '../../shared/rv/index.ts'
import { planetLetter } from '../../shared/rv/index.ts'
import { fmt, table, withError, finiteOrNull, epochUnit } from './format.ts'

/** Units of the noise fields of --json (astropy strings; '' dimensionless). */
export const NOISE_UNITS = Object.freeze({
  rotationPeriod: 'd', decayTime: 'd', shape: '', amplitude: 'm / s', gpJitter: 'm / s', bic: '', activityPeriod: 'd',
})

export interface PlanetOut {
  period: number; K: number; e: number; omegaDeg: number; tc: number; tp: number
  msiniMjup: number | null; aAu: number | null
  uncertainty: { period: number | null; K: number | null; e: number | null; tc: number | null; msiniMjup: number | null; aAu: number | null }
}

export function gpPlanetsOut(planets: GpPlanetFit[], derive: (p: GpPlanetFit) => { msiniMjup: number; aAu: number; uncertainty: { msiniMjup: number; aAu: number } } | null): PlanetOut[] {
  return planets.map((p) => {
    const d = derive(p)
    return {
      period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp,
      msiniMjup: d ? d.msiniMjup : null, aAu: d ? d.aAu : null,
      uncertainty: {
        period: finiteOrNull(p.uncertainty.period), K: finiteOrNull(p.uncertainty.K), e: finiteOrNull(p.uncertainty.e), tc: finiteOrNull(p.uncertainty.tc),
        msiniMjup: d ? finiteOrNull(d.uncertainty.msiniMjup) : null, aAu: d ? finiteOrNull(d.uncertainty.aAu) : null,
      },
    }
  })
}

/** JSON of the hyperparameters: NaN errors become null. */
export function hyperJson(g: GpHyperparameters): Record<string, unknown> {
  const q = (x: { value: number; error: number; unit: string }) => ({ value: x.value, error: finiteOrNull(x.error), unit: x.unit })
  return {
    kernel: g.kernel, rotationPeriod: q(g.rotationPeriod), decayTime: q(g.decayTime), shape: q(g.shape),
    amplitude: g.amplitude.map((a) => ({ instrument: a.instrument, ...q(a) })),
    jitter: g.jitter.map((a) => ({ instrument: a.instrument, ...q(a) })),
    priors: g.priors,
  }
}

export function planetTable(planets: PlanetOut[], timeFormat: string): string {
  return table(planets.map((q, i) => [
    planetLetter(i), withError(q.period, q.uncertainty.period), withError(q.K, q.uncertainty.K), withError(q.e, q.uncertainty.e),
    fmt(q.omegaDeg), withError(q.tc, q.uncertainty.tc), withError(q.msiniMjup, q.uncertainty.msiniMjup), withError(q.aAu, q.uncertainty.aAu),
  ]), ['planet', 'P [d]', 'K [m/s]', 'e', 'ω [deg]', `Tc [${epochUnit(timeFormat)}]`, 'M sin i [M_Jup]', 'a [au]'])
}

/** The GP lines: kernel, hyperparameters with errors and units, the priors. */
export function hyperLines(g: GpHyperparameters): string[] {
  const shapeName = g.kernel === 'rotation' ? 'shape (P/2 share)' : 'Γ'
  const out = [
    `GP noise (${g.kernel} kernel): rotation period ${withError(g.rotationPeriod.value, g.rotationPeriod.error)} d, decay time ${withError(g.decayTime.value, g.decayTime.error)} d, ${shapeName} ${withError(g.shape.value, g.shape.error)}`,
    `  amplitude ${g.amplitude.map((a) => `${a.instrument ? `${a.instrument} ` : ''}${withError(a.value, a.error)} m/s`).join(', ')}; white jitter ${g.jitter.map((j) => `${j.instrument} ${fmt(j.value)} m/s`).join(', ')}`,
    `  priors: ${g.priors.join('; ')}`,
  ]
  return out
}

export function activityLines(activity: ActivityCandidate[]): string[] {
  const out: string[] = []
  for (const a of activity) {
    out.push(`activity candidate at ${fmt(a.period)} d (${a.source === 'velocities' ? 'a velocity signal' : a.source === 'indicator' ? 'seen in an indicator' : 'your rotation period'}):`)
    for (const ev of a.evidence) out.push(`  ${ev}`)
  }
  return out
}

export function headline(nPlanets: number, nActivity: number): string {
  return `${nPlanets} planet${nPlanets === 1 ? '' : 's'} + ${nActivity} activity candidate${nActivity === 1 ? '' : 's'}`
}
