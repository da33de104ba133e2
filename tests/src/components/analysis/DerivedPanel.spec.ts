// @vitest-environment happy-dom
// M sin i and a follow the star's mass: a change of mass after the fit recomputes them on screen
// with the core's derivedPlanet (shared/rv/derived.ts), and the panel says so.
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import DerivedPanel from '@/components/analysis/DerivedPanel.vue'
import { derivedPlanet } from '@shared/rv/derived.ts'
import { derivedForStar } from '@/components/analysis/derived-now.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

// a 4.23-day, 56 m/s planet around a 1.05 M☉ star: the stored values as the server made them
const orbit = { period: 4.2308, K: 55.9, e: 0.01 }
const made = derivedPlanet(orbit, 1.05, { starMassErr: 0.03, covariance: [1e-10, 0, 0, 0, 0.25, 0, 0, 0, 1e-4] })
const planet = {
  label: 'b', ...orbit, omegaDeg: 40, tp: 2450001.2, tc: 2450002.1,
  uncertainty: { period: 1e-5, K: 0.5, e: 0.01, omegaDeg: 10, tp: 0.1, tc: 0.002 },
  msiniMjup: made.msiniMjup, msiniMearth: made.msiniMearth, aAu: made.aAu,
  derivedUncertainty: { msiniMjup: made.uncertainty.msiniMjup, msiniMearth: made.uncertainty.msiniMearth, aAu: made.uncertainty.aAu },
  insolationEarth: null,
}
const version = { id: 1, version: 1, status: 'fitted', result: { planets: [planet] } } as never

describe('derived values for the star as it is now', () => {
  it('keeps the stored values for the mass they were made with, and recomputes them for another', () => {
    const same = derivedForStar([planet] as never, 1.05, 0.03, null)[0]!
    expect(same.recomputed).toBe(false)
    expect(same.msiniMjup).toBe(made.msiniMjup)
    const now = derivedForStar([planet] as never, 1.3, 0.05, 1.6)[0]!
    expect(now.recomputed).toBe(true)
    const ref = derivedPlanet(orbit, 1.3)
    expect(now.msiniMjup).toBeCloseTo(ref.msiniMjup, 12)
    expect(now.aAu).toBeCloseTo(ref.aAu, 12)
    // M sin i grows as the star's mass to the 2/3 and a as its 1/3 for a planet much lighter than its star (Kepler's third law)
    expect(now.msiniMjup! / made.msiniMjup).toBeCloseTo((1.3 / 1.05) ** (2 / 3), 3)
    expect(now.aAu! / made.aAu).toBeCloseTo((1.3 / 1.05) ** (1 / 3), 3)
    expect(now.insolationEarth).toBeCloseTo(1.6 / (ref.aAu ** 2 * Math.sqrt(1 - 0.01 ** 2)), 10)
  })

  it('shows new values on screen when the star\'s mass changes, and says why', async () => {
    wrapper = mountWithApp(DerivedPanel, { props: { version, massMsun: 1.05, massErrMsun: 0.03, starName: 'Probe', timeScale: 'BJD_TDB' }, global: { stubs: { ChartFrame: true } } })
    await settle()
    const before = wrapper.find('[data-test="derived-msini-mjup"]').text()
    expect(wrapper.find('[data-test="derived-mass-note"]').text()).not.toMatch(/recomputed/)
    await wrapper.setProps({ massMsun: 1.3, massErrMsun: 0.05 })
    await settle()
    const after = wrapper.find('[data-test="derived-msini-mjup"]').text()
    expect(after).not.toBe(before)
    expect(Number(after.split(' ± ')[0])).toBeCloseTo(derivedPlanet(orbit, 1.3).msiniMjup, 2)
    expect(wrapper.find('[data-test="derived-mass-note"]').text()).toMatch(/1\.300 ± 0\.0500 M☉.*recomputed here for the new mass/)
  })
})
