// Views reach the API through stores: the account (password reset, invitation) and report-sources
// stores keep each call's outcome and error for the screen instead of swallowing it.
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'

vi.mock('@/api/auth.ts', () => ({
  requestReset: vi.fn(async () => undefined),
  resetPassword: vi.fn(async () => { throw new Error('The link has expired: ask for a new one.') }),
}))
vi.mock('@/api/teams.ts', () => ({
  fetchInvitation: vi.fn(async () => ({ teamId: 3, teamName: 'Lanternfield', email: 'a@b.test', role: 'reviewer', expiresAt: '2026-12-09T00:00:00Z' })),
  acceptInvitation: vi.fn(async () => ({ teamId: 3 })),
  fetchTeam: vi.fn(async () => { throw new Error('Service unavailable: try again in a minute.') }),
}))
vi.mock('@/api/analyses.ts', () => ({ listModels: vi.fn(async () => [{ id: 1, name: 'One planet', status: 'fitted', currentVersion: 2 }]) }))
vi.mock('@/api/limits.ts', () => ({ listLimits: vi.fn(async () => { throw new Error('Forbidden') }) }))

import { useAccountStore } from '@/stores/account.ts'
import { useReportSourcesStore } from '@/stores/report-sources.ts'

beforeEach(() => setActivePinia(createPinia()))

describe('stores between views and the API', () => {
  it('account: a sent reset link, a refused new password with its message, an invitation read and accepted', async () => {
    const a = useAccountStore()
    expect(await a.askReset('a@b.test')).toBe(true)
    expect(await a.chooseNewPassword('tok', 'a long new password')).toBe(false)
    expect(a.reset.error).toMatch(/expired/)
    await a.loadInvitation('tok')
    expect(a.invitation.data?.teamId).toBe(3)
    expect((await a.accept('tok'))?.teamId).toBe(3)
  })

  it('report sources: models read, a failed limit list and team read kept as errors', async () => {
    const r = useReportSourcesStore()
    await r.load(7)
    expect(r.models.data?.map((m) => m.id)).toEqual([1])
    expect(r.limitRuns.error).toBe('Forbidden')
    expect(await r.loadTeam(3)).toBeNull()
    expect(r.team.error).toMatch(/unavailable/)
  })
})
