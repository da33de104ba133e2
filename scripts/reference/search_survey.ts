/**
 * Writes the synthetic search survey (tests/shared/rv/planet-search/survey.ts, seeded) to
 * fixtures/search/survey-<name>.json for the independent reference fit
 * (scripts/reference/search_reference.py). Run: npx tsx scripts/reference/search_survey.ts
 */
import { writeFileSync, mkdirSync } from 'node:fs'
import { SURVEY, makeCase } from '../../tests/shared/rv/planet-search/survey.ts'

const dir = new URL('../../fixtures/search/', import.meta.url)
mkdirSync(dir, { recursive: true })
for (const c of SURVEY) {
  const d = makeCase(c)
  const doc = {
    provenance: 'Invented data: tests/shared/rv/planet-search/survey.ts (seeded, shared/math/random.ts), written by `npx tsx scripts/reference/search_survey.ts`.',
    case: { ...c, planets: c.planets.map((p) => ({ ...p })) },
    t: Array.from(d.t), y: Array.from(d.y), dy: Array.from(d.dy), instrument: Array.from(d.instrument), instrumentNames: d.instrumentNames,
  }
  writeFileSync(new URL(`survey-${c.name}.json`, dir), JSON.stringify(doc) + '\n')
  console.log(c.name, d.t.length)
}
