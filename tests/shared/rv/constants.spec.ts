import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { GM_SUN, GM_JUPITER, GM_EARTH, AU, DAY, G } from '../../../shared/rv/constants.ts'
import { semiAmplitude, semiMajorAxis } from '../../../shared/rv/derived.ts'

describe('constants', () => {
  it('are the IAU 2015 Resolution B3 nominal mass parameters and the IAU 2012 B2 au', () => {
    // Source: IAU 2015 Resolution B3 (nominal solar and planetary conversion constants), IAU 2012 Resolution B2.
    expect(GM_SUN).toBe(1.3271244e20)
    expect(GM_JUPITER).toBe(1.2668653e17)
    expect(GM_EARTH).toBe(3.986004e14)
    expect(AU).toBe(149597870700)
    expect(DAY).toBe(86400)
    // Source: CODATA 2018 recommended value of G.
    expect(G).toBe(6.6743e-11)
  })

  it("give the Sun's reflex velocity due to Jupiter ≈ 12.5 m/s and due to the Earth ≈ 0.09 m/s", () => {
    // Common practice (textbook values). Orbits from memory: Jupiter P = 4332.59 d, e = 0.0489;
    // Earth P = 365.256 d, e = 0.0167. Masses in Jupiter units: Earth = GM⊕/GM♃.
    expectClose(semiAmplitude(4332.59, 1, 0.0489, 1), 12.5, { atol: 0.1 }, 'K(Jupiter)')
    expectClose(semiAmplitude(365.256, GM_EARTH / GM_JUPITER, 0.0167, 1), 0.09, { atol: 0.005 }, 'K(Earth)')
  })

  it("give Mercury's 88-day period a semi-major axis ≈ 0.387 au", () => {
    // Common practice; Mercury's sidereal period 87.969 d and a = 0.387 au, from memory.
    expectClose(semiMajorAxis(87.969, 1), 0.387, { atol: 0.0005 }, 'a(Mercury)')
    // and the Earth's year gives 1 au (Kepler's third law with GM☉; common practice)
    expectClose(semiMajorAxis(365.256, 1, GM_EARTH / GM_SUN), 1, { atol: 1e-4 }, 'a(Earth)')
  })
})
