import { describe, it } from 'vitest'
import { checkFixtures, describeSurvey } from './survey-check.ts'

// The synthetic survey of issue 9, first half (the checks and their references: ./survey-check.ts).
describe('synthetic survey: the search finds each class from the data alone (reference: scipy DE + least_squares)', () => {
  it('the fixtures are the generator\'s output (same seeds, same numbers)', checkFixtures)
  describeSurvey(['long-eccentric', 'periastron', 'usp', 'daily-alias'])
})
