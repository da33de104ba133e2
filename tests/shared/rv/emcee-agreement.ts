// The agreement rule of the posterior-vs-emcee tests: for each parameter of the emcee reference,
// our median within 4 and our 16/84 % points within 5 combined Monte-Carlo errors
// (√(ref error² + (our sd / √N_eff)²), N_eff = kept steps × walkers / τ max), with its unit.
import { expect } from 'vitest'
import type { samplePosterior } from '../../../shared/rv/index.ts'

export interface RefParam { median: number; lo: number; hi: number; mcError: number }

export const GP_UNITS: Record<string, string> = { 'GP amplitude': 'm/s', 'GP decay time': 'd', 'rotation period': 'd', 'GP shape': '' }

export function expectAgreesWithEmcee(r: ReturnType<typeof samplePosterior>, reference: Record<string, RefParam>, check?: (name: string, ours: ReturnType<typeof samplePosterior>['parameters'][number]) => void): void {
  const tauMax = Math.max(...r.diagnostics.tau)
  const nEff = ((r.settings.stepsDone - r.settings.burn) * r.settings.walkers) / tauMax
  for (const [name, q] of Object.entries(reference)) {
    const ours = r.parameters.find((p) => p.name === name)
    expect(ours, name).toBeDefined()
    check?.(name, ours!)
    if (name in GP_UNITS) expect(ours!.unit).toBe(GP_UNITS[name])
    const mc = Math.hypot(q.mcError, ours!.sd / Math.sqrt(nEff))
    expect(Math.abs(ours!.median - q.median), `${name} median ${ours!.median} vs ${q.median} (MC ${mc})`).toBeLessThan(4 * mc)
    expect(Math.abs(ours!.lo - q.lo), `${name} 16 % ${ours!.lo} vs ${q.lo} (MC ${mc})`).toBeLessThan(5 * mc)
    expect(Math.abs(ours!.hi - q.hi), `${name} 84 % ${ours!.hi} vs ${q.hi} (MC ${mc})`).toBeLessThan(5 * mc)
  }
}
