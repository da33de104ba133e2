// A small hand-made sampling result (invented numbers) in the shape of shared/api/sampling.ts.
import type { SamplingResult } from '@shared/api/sampling.ts'

export function makeResult(converged: boolean, warnings: string[] = []): SamplingResult {
  const rows = 8
  const names = ['P b', 'K b', 'e b', 'ω b', 'Tc b', 'Tp b', 'M sin i b', 'M sin i b (Earth masses)', 'a b', 'offset Harrier', 'jitter Harrier', 'ln posterior']
  const units = ['d', 'm/s', '', 'deg', 'd', 'd', 'M_Jup', 'M_Earth', 'au', 'm/s', 'm/s', '']
  const base = [12.4, 9.8, 0.1, 40, 2459000.5, 2458999.1, 0.092, 29.3, 0.105, -3.2, 2.1, -120]
  return {
    parameters: [
      { name: 'P b', unit: 'd', median: 12.40213, lo: 12.40101, hi: 12.40336, mean: 12.4022, sd: 0.0012 },
      { name: 'K b', unit: 'm/s', median: 9.8412, lo: 9.5512, hi: 10.1534, mean: 9.85, sd: 0.3 },
      { name: 'e b', unit: '', median: 0.0712, lo: 0.0251, hi: 0.1305, mean: 0.075, sd: 0.05 },
      { name: 'ω b', unit: 'deg', median: 41.3, lo: 12.2, hi: 80.9, mean: 43, sd: 30 },
      { name: 'M sin i b', unit: 'M_Jup', median: 0.09213, lo: 0.08841, hi: 0.09602, mean: 0.0922, sd: 0.004 },
      { name: 'M sin i b (Earth masses)', unit: 'M_Earth', median: 29.28, lo: 28.1, hi: 30.52, mean: 29.3, sd: 1.2 },
      { name: 'a b', unit: 'au', median: 0.10512, lo: 0.10301, hi: 0.10722, mean: 0.105, sd: 0.002 },
      { name: 'jitter Harrier', unit: 'm/s', median: 2.13, lo: 1.81, hi: 2.52, mean: 2.15, sd: 0.35 },
    ],
    sample: {
      names, units,
      step: Array.from({ length: rows }, (_, i) => 100 + 10 * Math.floor(i / 2)),
      walker: Array.from({ length: rows }, (_, i) => i % 2),
      columns: base.map((b, j) => Array.from({ length: rows }, (_, i) => b * (1 + 0.01 * ((i * (j + 3)) % 5 - 2)))),
    },
    diagnostics: {
      names: ['ln P b', 'ln K b', '√e cos ω b', '√e sin ω b', 'Tc b', 'offset Harrier', 'ln jitter Harrier'],
      tau: [30, 31, 40, 42, 29, 20, 25], nOverTau: converged ? [120, 115, 90, 88, 124, 180, 144] : [12, 11, 9, 8, 12, 18, 14],
      rhat: converged ? [1.001, 1.002, 1.004, 1.003, 1.001, 1.0, 1.002] : [1.04, 1.05, 1.1, 1.09, 1.03, 1.01, 1.02],
      acceptance: 0.38, acceptanceMin: 0.3, acceptanceMax: 0.45, converged, warnings,
    },
    settings: { seed: 7, walkers: 32, steps: 3600, burn: 900, thin: 1, stepsDone: 3600, stopped: false },
    start: { lnPosterior: -119.5, fitStatus: 'converged' },
  }
}
