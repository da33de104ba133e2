import type { ReportSnapshot } from '../../shared/api/reports.ts'
import { astropyUnit } from '../../shared/report/units.ts'
import { snapshotTimeSystem } from '../../shared/report/time-label.ts'

/**
 * The whole solution as JSON: the snapshot, a `units` map naming the unit of every numeric field in
 * astropy's vocabulary (`u.Unit(units['result.planets[].K'])` works), and the model equation, so the
 * curve can be rebuilt from this file alone.
 */
export function reportJson(s: ReportSnapshot, reportId: number, version: number): Record<string, unknown> {
  const ts = snapshotTimeSystem(s)
  const sampling = s.sampling && {
    ...s.sampling,
    parameters: s.sampling.parameters.map((p) => ({ ...p, unit: astropyUnit(p.unit) })),
    corner: { ...s.sampling.corner, units: s.sampling.corner.units.map(astropyUnit) },
    ...(s.sampling.samples ? { samples: { ...s.sampling.samples, units: s.sampling.samples.units.map(astropyUnit) } } : {}),
  }
  return {
    reportId, version, ...s, sampling,
    timeSystem: { scale: ts.scale, note: `every time is a full Julian date in ${ts.scale}` },
    units: {
      'star.massMsun': 'solMass', 'star.radiusRsun': 'solRad', 'star.luminosityLsun': 'solLum', 'star.teffK': 'K', 'star.raDeg': 'deg', 'star.decDeg': 'deg',
      'result.planets[].period': 'd', 'result.planets[].K': 'm / s', 'result.planets[].e': '', 'result.planets[].omegaDeg': 'deg',
      'result.planets[].tp': 'd', 'result.planets[].tc': 'd', 'result.planets[].msiniMjup': 'jupiterMass', 'result.planets[].msiniMearth': 'earthMass',
      'result.planets[].aAu': 'AU', 'result.instruments[].offset': 'm / s', 'result.instruments[].jitter': 'm / s', 'result.instruments[].rms': 'm / s',
      'result.trend.slope': 'm / (s d)', 'result.trend.curvature': 'm / (s d2)', 'result.epoch': 'd',
      'data.points[].time': 'd', 'data.points[].rv': 'm / s', 'data.points[].error': 'm / s', 'data.points[].model': 'm / s', 'data.points[].residual': 'm / s',
    },
    modelEquation: {
      text: 'v(t) = offset[instrument] + slope·(t − epoch) + curvature·(t − epoch)² + Σ_planets K·[cos(ν(t) + ω) + e·cos ω]',
      notes: `ν is the true anomaly from M = 2π(t − tp)/period via Kepler's equation; ω (omegaDeg) is the star's argument of periastron; times are full Julian dates in ${ts.scale}, velocities in m / s. epoch = result.epoch; slope and curvature = result.trend (absent: zero).`,
    },
  }
}
