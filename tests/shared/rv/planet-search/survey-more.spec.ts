import { describe } from 'vitest'
import { describeSurvey } from './survey-check.ts'

// The synthetic survey of issue 9, second half (the checks and their references: ./survey-check.ts).
describe('synthetic survey: several planets, no planet, trend only (reference: scipy DE + least_squares)', () => {
  describeSurvey(['resonant-pair', 'weak-third', 'noise-underestimated', 'trend-only'])
})
