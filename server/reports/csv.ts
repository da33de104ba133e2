import type { ReportSnapshot } from '../../shared/api/reports.ts'
import { modelVelocity } from '../../shared/report/curve.ts'

function cell(x: string | number | boolean | null): string {
  if (x === null) return ''
  const s = String(x)
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

/**
 * The data of a frozen report, one row per measurement of the fitted instruments: the value, the
 * model velocity (instrument offset and trend included) and the residual, the instrument, whether
 * it was excluded and why. Excluded points get the model evaluated at their time from the snapshot.
 */
export function reportCsv(s: ReportSnapshot): string {
  const reasons = new Map(s.data.exclusions.map((x) => [x.id, x.reason]))
  const missing = s.data.points.filter((p) => p.model === null)
  const computed = new Map<number, number>()
  if (missing.length) {
    const v = modelVelocity(s.result, missing.map((p) => p.time), missing.map((p) => p.instrument))
    missing.forEach((p, i) => computed.set(p.id, v[i]!))
  }
  const lines = [
    `# ${s.title} — report data (frozen ${s.frozenAt}; data hash ${s.data.hash}); velocities and errors in m/s, time in JD`,
    'measurement_id,instrument,time,rv,error,model,residual,excluded,exclusion_reason',
  ]
  for (const p of s.data.points) {
    const model = p.model ?? computed.get(p.id) ?? null
    const residual = p.residual ?? (model !== null ? p.rv - model : null)
    lines.push([p.id, p.instrument, p.time, p.rv, p.error, model, residual, !p.included, reasons.has(p.id) ? reasons.get(p.id) ?? '' : null].map(cell).join(','))
  }
  return lines.join('\n') + '\n'
}

/** The whole solution as JSON: the snapshot, plus the model equation so the curve can be rebuilt from it alone. */
export function reportJson(s: ReportSnapshot, reportId: number, version: number): Record<string, unknown> {
  return {
    reportId, version, ...s,
    modelEquation: {
      text: 'v(t) = offset[instrument] + slope·(t − epoch) + curvature·(t − epoch)² + Σ_planets K·[cos(ν(t) + ω) + e·cos ω]',
      notes: 'ν is the true anomaly from M = 2π(t − tp)/period via Kepler\'s equation; ω (omegaDeg) is the star\'s argument of periastron; times in JD, velocities in m/s. epoch = result.epoch; slope and curvature = result.trend (absent: zero).',
    },
  }
}
