import { expect } from 'vitest'

export interface Tolerance { rtol?: number; atol?: number }

/** Asserts |actual − expected| ≤ atol + rtol·|expected|, element by element for arrays. */
export function expectClose(
  actual: number | ArrayLike<number>,
  expected: number | ArrayLike<number>,
  { rtol = 1e-7, atol = 0 }: Tolerance = {},
  label = 'value',
): void {
  if (typeof actual === 'number' || typeof expected === 'number') {
    const a = Number(actual), e = Number(expected)
    const ok = Math.abs(a - e) <= atol + rtol * Math.abs(e)
    if (!ok) expect.fail(`${label}: ${a} is not within atol=${atol}, rtol=${rtol} of ${e} (diff ${a - e})`)
    return
  }
  expect(actual.length, `${label}: length`).toBe(expected.length)
  let worst = -1, worstExcess = 0
  for (let i = 0; i < expected.length; i++) {
    const excess = Math.abs(actual[i] - expected[i]) - (atol + rtol * Math.abs(expected[i]))
    if (!(excess <= 0) && (worst < 0 || excess > worstExcess || Number.isNaN(excess))) { worst = i; worstExcess = excess }
  }
  if (worst >= 0) {
    expect.fail(`${label}[${worst}]: ${actual[worst]} is not within atol=${atol}, rtol=${rtol} of ${expected[worst]}`)
  }
}
