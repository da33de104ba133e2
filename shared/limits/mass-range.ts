/**
 * Default mass range of the grid, from the data's noise: a circular orbit is found about when
 * λ = N K²/(2σ²) reaches ~35 (the Δχ² a 1e-3 false-alarm level asks of ~10⁴ independent
 * frequencies; Cumming 2004, MNRAS 354, 1165), i.e. K₀ ≈ σ √(70/N), σ the residuals' rms. The grid
 * runs from the mass giving K₀/4 at the shortest period to the mass giving 30 K₀ at the longest,
 * so the 50 % and 90 % contours fall inside it for most data.
 */
import { minimumMass } from '../rv/index.ts'
import type { LimitsData } from './recovery.ts'

export function defaultMassRange(data: LimitsData, starMass: number, minPeriod: number, maxPeriod: number): { minMassEarth: number; maxMassEarth: number } {
  const n = data.residuals.length
  let mean = 0
  for (const r of data.residuals) mean += r
  mean /= n
  let ss = 0, sd = 0
  for (let i = 0; i < n; i++) { ss += (data.residuals[i] - mean) ** 2; sd += data.dy[i] ** 2 }
  // the larger of the residuals' scatter and the quoted errors
  const sigma = Math.max(Math.sqrt(ss / n), Math.sqrt(sd / n))
  const kStar = sigma * Math.sqrt(70 / n)
  return {
    minMassEarth: minimumMass(minPeriod, kStar / 4, 0, starMass).msiniMearth,
    maxMassEarth: minimumMass(maxPeriod, 30 * kStar, 0, starMass).msiniMearth,
  }
}
